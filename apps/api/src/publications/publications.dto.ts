import { Transform } from 'class-transformer';
import { IsIn, IsNotEmpty, IsString, IsUUID, MaxLength } from 'class-validator';
import { OptionalNotNull } from '../common/validation';
import { LENGTH_UNITS, PUBLICATION_KINDS, type AddMemberRequest, type CreatePublicationRequest, type LengthUnit, type LengthUnitRequest, type PublicationKind } from '@psiform/contracts';

const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class CreatePublicationBody implements CreatePublicationRequest {
  @Transform(trim)
  @IsNotEmpty({ message: 'title must not be empty' })
  @MaxLength(300)
  @IsString()
  title: string;

  @Transform(trim)
  @IsNotEmpty({ message: 'publisher must not be empty' })
  @MaxLength(200)
  @IsString()
  publisher: string;

  @IsIn(PUBLICATION_KINDS as readonly string[], { message: `kind must be one of: ${PUBLICATION_KINDS.join(', ')}` })
  kind: PublicationKind;

  @OptionalNotNull()
  @MaxLength(5000)
  @IsString()
  description?: string;
}

export class AddMemberBody implements AddMemberRequest {
  @IsUUID('all', { message: 'userId must be a UUID' })
  userId: string;
}

export class LengthUnitBody implements LengthUnitRequest {
  @IsIn(LENGTH_UNITS as readonly string[], { message: `lengthUnit must be one of: ${LENGTH_UNITS.join(', ')}` })
  lengthUnit: LengthUnit;
}
