import { IsBoolean, IsDefined, IsOptional, IsUUID } from 'class-validator';

/** Colours and names are checked by swatchbook-input.ts (messages name colors.<swatch>). */
export class CreateSwatchbookBody {
  @IsDefined({ message: 'name is required' })
  name: unknown;

  @IsDefined({ message: 'colors is required' })
  colors: unknown;
}

export class UpdateSwatchbookBody {
  @IsOptional()
  name?: unknown;

  @IsOptional()
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

  @IsOptional()
  exportedAt?: unknown;
}

export class HouseStyleBody {
  @IsUUID('all', { message: 'swatchbookId must be a UUID' })
  swatchbookId: string;

  @IsOptional()
  @IsBoolean({ message: 'requireColourSignOff must be true or false' })
  requireColourSignOff?: boolean;

  @IsOptional()
  @IsBoolean({ message: 'allowOverride must be true or false' })
  allowOverride?: boolean;
}
