import type { FigureStatus } from './states';

/** Review that compares: a figure's versions with their print images, and what changed between two of them. */

/** The print image of a version as the proof page shows it, with the facts a production editor checks. */
export interface ProofImageDto {
  assetId: string;
  kind: 'png';
  widthPx: number;
  heightPx: number;
  dpi: number;
  widthMm: number;
  heightMm: number;
  /** e.g. "RGB, sRGB (IEC 61966-2-1)": what the file's colour chunks say. */
  colourMode: string;
  createdAt: string;
}

export interface FigureVersionSummaryDto {
  id: string;
  number: number;
  /** The version the figure is at now. */
  current: boolean;
  /** Submitted for review at least once: a proof that never changes. */
  locked: boolean;
  label: string | null;
  recipeHash: string;
  authorName: string | null;
  createdAt: string;
  /** The newest print image (PNG) of this version; null until one is rendered. */
  image: ProofImageDto | null;
}

/** One changed field between two versions, in words ("key light", "2.2", "2.7"). */
export interface RecipeChangeDto {
  path: string;
  what: string;
  from: string;
  to: string;
}

/** GET /api/figures/:id/compare?from=&to= */
export interface VersionComparisonDto {
  figureId: string;
  from: FigureVersionSummaryDto;
  to: FigureVersionSummaryDto;
  changes: RecipeChangeDto[];
  /** "key light 2.2 → 2.7; surface 90% → 95%" */
  summary: string;
}

/** Review desk filters (GET /api/review-desk?publicationId=&state=&minAgeHours=). */
export const DESK_STATES = ['in_review', 'changes_requested', 'approved'] as const satisfies readonly FigureStatus[];
export type DeskState = (typeof DESK_STATES)[number];
