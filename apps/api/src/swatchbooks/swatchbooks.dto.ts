import { IsBoolean, IsDefined, IsOptional, IsString, IsUUID, MaxLength } from 'class-validator';
import { OptionalNotNull } from '../common/validation';

/** Where a new swatchbook belongs (create and import): one publication, or `publisher` for all of its publications. */
class SwatchbookScopeFields {
  /** The publication it belongs to; or `publisher` instead, for every publication of that publisher. */
  @OptionalNotNull()
  @IsUUID('all', { message: 'publicationId must be a UUID' })
  publicationId?: string;

  @OptionalNotNull()
  @MaxLength(200, { message: 'publisher must be at most 200 characters' })
  @IsString({ message: 'publisher must be a string' })
  publisher?: string;
}

/** Colours and names are checked by swatchbook-input.ts (messages name colors.<swatch>). */
export class CreateSwatchbookBody extends SwatchbookScopeFields {
  @IsDefined({ message: 'name is required' })
  name: unknown;

  @IsDefined({ message: 'colors is required' })
  colors: unknown;

}

export class UpdateSwatchbookBody {
  @OptionalNotNull()
  name?: unknown;

  @OptionalNotNull()
  colors?: unknown;
}

/** The exported file: {format, formatVersion, name, colors, exportedAt?}. */
export class ImportSwatchbookBody extends SwatchbookScopeFields {
  @IsDefined({ message: 'format is required' })
  format: unknown;

  @IsDefined({ message: 'formatVersion is required' })
  formatVersion: unknown;

  @IsDefined({ message: 'name is required' })
  name: unknown;

  @IsDefined({ message: 'colors is required' })
  colors: unknown;

  @IsOptional() // informative only; the service ignores it
  exportedAt?: unknown;

}

export class ListSwatchbooksQuery {
  @OptionalNotNull()
  @IsUUID('all', { message: 'publicationId must be a UUID' })
  publicationId?: string;
}

export class HouseStyleBody {
  @IsUUID('all', { message: 'swatchbookId must be a UUID' })
  swatchbookId: string;

  @OptionalNotNull()
  @IsBoolean({ message: 'requireColourSignOff must be true or false' })
  requireColourSignOff?: boolean;

  @OptionalNotNull()
  @IsBoolean({ message: 'allowOverride must be true or false' })
  allowOverride?: boolean;
}
