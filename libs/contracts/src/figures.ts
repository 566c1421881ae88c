import type { FigureStatus, JobState, AssetKind } from './states';
import type { Recipe } from './recipe';

/** Figure and pipeline shapes exchanged over HTTP (issue: figures become jobs). */
export interface FigureVersionDto {
  id: string;
  figureId: string;
  number: number;
  recipe: Recipe;
  engineVersion: string;
  authorId: string;
  /** True once submitted for review: the version is then a proof and never changes. */
  locked: boolean;
  createdAt: string;
}

/** What a figure is, in the list and on its own page alike. */
export interface FigureHeadDto {
  id: string;
  publicationId: string;
  title: string;
  ownerId: string;
  ownerName?: string;
  status: FigureStatus;
  thumbnailAssetId?: string | null;
  updatedAt: string;
}

export interface FigureDto extends FigureHeadDto {
  currentVersion: FigureVersionDto;
  /** Assets of the current version (latest mesh outputs, renders, exports). */
  assets: AssetDto[];
  createdAt: string;
}

/** Sortable columns of GET /api/figures (query parameter `sort`): the one list the server accepts and the library offers. */
export const FIGURE_SORT_KEYS = ['updatedAt', 'createdAt', 'title', 'status', 'versionNumber'] as const;
export type FigureSortKey = (typeof FIGURE_SORT_KEYS)[number];

export interface FigureSummaryDto extends FigureHeadDto {
  versionNumber: number;
  label?: string;
  /** Short-lived presigned GET link to the 320 × 240 PNG thumbnail (about 5 minutes); null when there is none. */
  thumbnailUrl?: string | null;
}

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

export interface CreateFigureRequest {
  publicationId: string;
  title: string;
  recipe: unknown;
}

export interface UpdateFigureRequest {
  title?: string;
  recipe?: unknown;
}

export interface MeshStatsDto {
  phase: '+' | '-' | 'complex';
  vertices: number;
  triangles: number;
  area: number;
  volume: number;
  components: number;
  euler: number;
  /** Closed and consistently oriented; false where the box cuts the surface open. */
  watertight: boolean;
  /** Edges used by one triangle only (where the box cuts the surface); 0 for a closed surface. */
  boundaryEdges?: number;
}

/**
 * What a figure cannot show truthfully, said wherever it goes (job result, Studio, metadata sheet, caption, CLI).
 * Codes: 'box-cuts-surface' (suggestedExtent: the half-width that holds the whole surface), 'feature-unresolved'
 * (feature + suggestedN), 'topology-mismatch', 'topology-unverified', 'measured-in-cube'.
 */
export interface SurfaceWarningDto {
  code: string;
  message: string;
  suggestedExtent?: number;
  suggestedN?: number;
  feature?: { kind: string; size: number; description: string };
}

/** The mesh summary on mesh assets (@psiform/meshing summariseSurfaces); every length in a0. */
export interface MeshSummaryDto {
  isovalue?: number;
  /** Probability inside the surface over all space (computed states) or inside the cube (uploads). */
  enclosed?: number;
  enclosedError?: number;
  /** The part drawn inside the box (equal to `enclosed` unless the box cuts the surface). */
  enclosedInBox?: number;
  grid?: { n: number; extent: number; mode?: 'auto' | 'fixed'; spacing?: number };
  surfaces?: MeshStatsDto[];
  warnings?: SurfaceWarningDto[];
  units?: Record<string, string>;
  conventions?: string;
  [k: string]: unknown;
}

export interface AssetDto {
  id: string;
  kind: AssetKind;
  bytes: number;
  sha256: string;
  stats?: MeshSummaryDto | null;
  createdAt: string;
}

export interface JobDto {
  id: string;
  type: 'mesh' | 'render' | 'export' | 'upload_mesh';
  state: JobState;
  progress: number;
  stage: string;
  error?: string | null;
  figureId?: string | null;
  assets: AssetDto[];
  /** What the job's files cannot show truthfully: every distinct warning on its assets' mesh summaries. */
  warnings?: SurfaceWarningDto[];
  timings?: Record<string, number> | null;
  createdAt: string;
  updatedAt: string;
}

/** Progress stages of a mesh job, in order. */
export const MESH_STAGES = ['queued', 'sampling', 'threshold', 'extracting', 'encoding', 'storing', 'done'] as const;

/** POST /api/figures/:id/meshes answer. */
export interface CreateJobResponse {
  jobId: string;
}

/** GET /api/assets/:id/link answer: a short-lived presigned GET URL. */
export interface AssetLinkDto {
  url: string;
  expiresAt: string;
  /** The name the file downloads under (the storage answers the link as an attachment with this name). */
  fileName: string;
}

/**
 * POST /api/uploads (multipart/form-data, parts in this order): publicationId, title, format ('nrrd' | 'raw'),
 * optional quantity ('psi' | 'density', NRRD only; raw takes it from the sidecar) and fraction (enclosed
 * fraction, default 0.9), for raw a `sidecar` JSON file (UploadSidecar), then the `cube` file.
 */
export const UPLOAD_FORMATS = ['nrrd', 'raw'] as const;
export type UploadFormat = (typeof UPLOAD_FORMATS)[number];

export interface UploadSidecar {
  sizes: [number, number, number];
  /** Grid spacing in a0: one number for all axes, or [dx, dy, dz]. */
  spacing: number | [number, number, number];
  /** Position of the first sample in a0; default: the cube centred on the origin. */
  origin?: [number, number, number];
  quantity: 'psi' | 'density';
}

export interface UploadResponse {
  figureId: string;
  assetId: string;
}

/** Default upload size limit (UPLOAD_MAX_BYTES): 512 MiB. */
export const DEFAULT_UPLOAD_MAX_BYTES = 536870912;
