import { IsBoolean, IsDefined, IsOptional, IsUUID } from 'class-validator';
import { OptionalNotNull } from '../common/validation';

/** Colours and names are checked by swatchbook-input.ts (messages name colors.<swatch>). */
export class CreateSwatchbookBody {
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
export class ImportSwatchbookBody {
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
