import { IsBoolean, IsDefined, IsIn, IsObject, IsOptional, IsString, IsUUID, MaxLength } from 'class-validator';
import { HOUSE_STYLE_IMPACT_FOR, type HouseStyleImpactFor } from '@psiform/contracts';
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

/** The exported file: {format, formatVersion, name, colors, exportedAt?}; name, colors and the scope as for a new one. */
export class ImportSwatchbookBody extends CreateSwatchbookBody {
  @IsDefined({ message: 'format is required' })
  format: unknown;

  @IsDefined({ message: 'formatVersion is required' })
  formatVersion: unknown;

  @IsOptional() // informative only; the service ignores it
  exportedAt?: unknown;

}

export class ListSwatchbooksQuery {
  @OptionalNotNull()
  @IsUUID('all', { message: 'publicationId must be a UUID' })
  publicationId?: string;
}


/** A written reason to go past failing colour checks ({ reason }; its length is checked by the gate, gates/gate.ts). */
class GateOverrideField {
  @OptionalNotNull()
  @IsObject({ message: 'override must be an object { reason }' })
  override?: unknown;
}

/** PUT /api/publications/:id/house-style */
export class HouseStyleBody extends GateOverrideField {
  @IsUUID('all', { message: 'swatchbookId must be a UUID' })
  swatchbookId: string;

  @OptionalNotNull()
  @IsBoolean({ message: 'requireColourSignOff must be true or false' })
  requireColourSignOff?: boolean;

  @OptionalNotNull()
  @IsBoolean({ message: 'allowOverride must be true or false' })
  allowOverride?: boolean;
}

/** POST /api/publications/:id/rerender: the optional written reason to go past failing colour checks. */
export class RerenderBody extends GateOverrideField {}

/** GET /api/publications/:id/house-style/impact */
export class HouseStyleImpactQuery {
  @IsIn(HOUSE_STYLE_IMPACT_FOR, { message: `for must be one of ${HOUSE_STYLE_IMPACT_FOR.join(', ')}` })
  for: HouseStyleImpactFor;

  /** The swatchbook to pin (for=pin); the pinned one when left out. */
  @OptionalNotNull()
  @IsUUID('all', { message: 'swatchbookId must be a UUID' })
  swatchbookId?: string;
}
