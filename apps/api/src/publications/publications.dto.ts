import { IsOptional, IsString, IsUUID, MaxLength } from 'class-validator';
import {
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
import { AdminListQuery, OneOf, OptionalNotNull, SortOrder, TrimmedText } from '../common/validation';


export class CreatePublicationBody implements CreatePublicationRequest {
  @TrimmedText(300)
  title: string;

  @TrimmedText(200)
  publisher: string;

  @OneOf(PUBLICATION_KINDS)
  kind: PublicationKind;

  @OptionalNotNull()
  @MaxLength(5000, { message: 'description must be at most 5000 characters' })
  @IsString({ message: 'description must be a string' })
  description?: string;

  @OptionalNotNull()
  @OneOf(LENGTH_UNITS)
  lengthUnit?: LengthUnit;
}

export class UpdatePublicationBody implements UpdatePublicationRequest {
  @OptionalNotNull()
  @TrimmedText(300)
  title?: string;

  @OptionalNotNull()
  @TrimmedText(200)
  publisher?: string;

  @OptionalNotNull()
  @OneOf(PUBLICATION_KINDS)
  kind?: PublicationKind;

  @OptionalNotNull()
  @IsString({ message: 'description must be a string' })
  @MaxLength(5000, { message: 'description must be at most 5000 characters' })
  description?: string;

  @OptionalNotNull()
  @OneOf(LENGTH_UNITS)
  lengthUnit?: LengthUnit;
}

export class AddMemberBody implements AddMemberWithRoleRequest {
  @IsUUID('all', { message: 'userId must be a UUID' })
  userId: string;

  @OptionalNotNull()
  @OneOf(ROLES)
  role?: Role;
}

export class SetMemberRoleBody {
  @OneOf(ROLES)
  role: Role;
}

export class ListPublicationsQuery extends AdminListQuery {
  @IsOptional()
  @OneOf(PUBLICATION_KINDS)
  kind?: PublicationKind;

  @IsOptional()
  @OneOf(PUBLICATION_SORT_KEYS)
  sort?: PublicationSortKey;

  @SortOrder()
  order?: 'asc' | 'desc';
}

export class LengthUnitBody implements LengthUnitRequest {
  @OneOf(LENGTH_UNITS)
  lengthUnit: LengthUnit;
}
