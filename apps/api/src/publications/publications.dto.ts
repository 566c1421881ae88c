import { Transform, Type } from 'class-transformer';
import { IsIn, IsInt, IsNotEmpty, IsOptional, IsString, IsUUID, Max, MaxLength, Min } from 'class-validator';
import {
  ADMIN_PAGE_SIZE,
  LENGTH_UNITS,
  PUBLICATION_KINDS,
  PUBLICATION_SORT_KEYS,
  ROLES,
  type AddMemberWithRoleRequest,
  type CreatePublicationRequest,
  type LengthUnit,
  type LengthUnitRequest,
  type PublicationKind,
  type PublicationSortKey,
  type Role,
  type UpdatePublicationRequest,
} from '@psiform/contracts';
import { OptionalNotNull } from '../common/validation';

const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);
const KIND_MESSAGE = `kind must be one of: ${PUBLICATION_KINDS.join(', ')}`;
const UNIT_MESSAGE = `lengthUnit must be one of: ${LENGTH_UNITS.join(', ')}`;
const ROLE_MESSAGE = `role must be one of: ${ROLES.join(', ')}`;

export class CreatePublicationBody implements CreatePublicationRequest {
  @Transform(trim)
  @IsNotEmpty({ message: 'title must not be empty' })
  @MaxLength(300, { message: 'title must be at most 300 characters' })
  @IsString({ message: 'title must be a string' })
  title: string;

  @Transform(trim)
  @IsNotEmpty({ message: 'publisher must not be empty' })
  @MaxLength(200, { message: 'publisher must be at most 200 characters' })
  @IsString({ message: 'publisher must be a string' })
  publisher: string;

  @IsIn(PUBLICATION_KINDS as readonly string[], { message: KIND_MESSAGE })
  kind: PublicationKind;

  @OptionalNotNull()
  @MaxLength(5000, { message: 'description must be at most 5000 characters' })
  @IsString({ message: 'description must be a string' })
  description?: string;

  @OptionalNotNull()
  @IsIn(LENGTH_UNITS as readonly string[], { message: UNIT_MESSAGE })
  lengthUnit?: LengthUnit;
}

export class UpdatePublicationBody implements UpdatePublicationRequest {
  @OptionalNotNull()
  @Transform(trim)
  @IsString({ message: 'title must be a string' })
  @IsNotEmpty({ message: 'title must not be empty' })
  @MaxLength(300, { message: 'title must be at most 300 characters' })
  title?: string;

  @OptionalNotNull()
  @Transform(trim)
  @IsString({ message: 'publisher must be a string' })
  @IsNotEmpty({ message: 'publisher must not be empty' })
  @MaxLength(200, { message: 'publisher must be at most 200 characters' })
  publisher?: string;

  @OptionalNotNull()
  @IsIn(PUBLICATION_KINDS as readonly string[], { message: KIND_MESSAGE })
  kind?: PublicationKind;

  @OptionalNotNull()
  @IsString({ message: 'description must be a string' })
  @MaxLength(5000, { message: 'description must be at most 5000 characters' })
  description?: string;

  @OptionalNotNull()
  @IsIn(LENGTH_UNITS as readonly string[], { message: UNIT_MESSAGE })
  lengthUnit?: LengthUnit;
}

export class AddMemberBody implements AddMemberWithRoleRequest {
  @IsUUID('all', { message: 'userId must be a UUID' })
  userId: string;

  @OptionalNotNull()
  @IsIn(ROLES as readonly string[], { message: ROLE_MESSAGE })
  role?: Role;
}

export class SetMemberRoleBody {
  @IsIn(ROLES as readonly string[], { message: ROLE_MESSAGE })
  role: Role;
}

export class ListPublicationsQuery {
  @IsOptional()
  @Type(() => Number)
  @IsInt({ message: 'page must be an integer' })
  @Min(1, { message: 'page must be 1..100000' })
  @Max(100_000, { message: 'page must be 1..100000' })
  page?: number;

  @IsOptional()
  @Type(() => Number)
  @IsInt({ message: 'pageSize must be an integer' })
  @Min(1, { message: `pageSize must be 1..${ADMIN_PAGE_SIZE.max}` })
  @Max(ADMIN_PAGE_SIZE.max, { message: `pageSize must be 1..${ADMIN_PAGE_SIZE.max}` })
  pageSize?: number;

  @IsOptional()
  @Transform(trim)
  @IsString({ message: 'q must be a string' })
  @MaxLength(200, { message: 'q must be at most 200 characters' })
  q?: string;

  @IsOptional()
  @IsIn(PUBLICATION_KINDS as readonly string[], { message: KIND_MESSAGE })
  kind?: PublicationKind;

  @IsOptional()
  @IsIn(PUBLICATION_SORT_KEYS as readonly string[], { message: `sort must be one of: ${PUBLICATION_SORT_KEYS.join(', ')}` })
  sort?: PublicationSortKey;

  @IsOptional()
  @IsIn(['asc', 'desc'], { message: 'order must be asc or desc' })
  order?: 'asc' | 'desc';
}

export class LengthUnitBody implements LengthUnitRequest {
  @IsIn(LENGTH_UNITS as readonly string[], { message: `lengthUnit must be one of: ${LENGTH_UNITS.join(', ')}` })
  lengthUnit: LengthUnit;
}
