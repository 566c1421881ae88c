import type { FigureStatus } from './states';
import type { RecipeChangeDto } from './proofs';

/**
 * Colour checks that gate: a swatchbook whose checks fail at error level cannot be pinned as a house style or used for
 * a batch re-render unless an art director overrides with a written reason (the one gate, apps/api/src/gates/gate.ts;
 * body `override: { reason }`, 409 GateBlockedDto without it). The reason is audited ('colour_override') on the house
 * style and on every affected figure, whose proof page shows it.
 */
export const COLOUR_GATE = 'colour checks';

/** The audit action of an override of the colour checks (house style and figures). */
export const COLOUR_OVERRIDE_ACTION = 'colour_override';

/** What a pin or a batch re-render does to one figure of the publication. */
export type HouseStyleEffect = 'rerender' | 'next_save' | 'kept';

export interface HouseStyleImpactFigureDto {
  figureId: string;
  title: string;
  status: FigureStatus;
  versionNumber: number;
  /** The figure's current recipe already names this swatchbook. */
  usesSwatchbook: boolean;
  /** Its colours now → the swatchbook's ("positive phase colour #c8553d → #aa3300"). */
  changes: RecipeChangeDto[];
  effect: HouseStyleEffect;
  /** Why, in words ("Draft: takes these colours at its next save or batch re-render"). */
  reason: string;
  /** Its colours change or it uses the swatchbook: an override is recorded on it. */
  affected: boolean;
}

export const HOUSE_STYLE_IMPACT_FOR = ['pin', 'rerender'] as const;
export type HouseStyleImpactFor = (typeof HOUSE_STYLE_IMPACT_FOR)[number];

/** GET /api/publications/:id/house-style/impact?for=pin|rerender&swatchbookId= */
export interface HouseStyleImpactDto {
  publicationId: string;
  for: HouseStyleImpactFor;
  swatchbook: { id: string; name: string; version: number };
  /** The checks' error-level failures (they block without a reason) and warnings (they do not). */
  gate: { name: string; failures: string[]; warnings: string[]; blocks: boolean };
  figures: HouseStyleImpactFigureDto[];
}

/** A house style pinned past failing colour checks (shown with the house style and on every affected proof). */
export interface ColourOverrideDto {
  reason: string;
  byName: string | null;
  at: string;
  failures: string[];
  swatchbookVersion: number;
}
