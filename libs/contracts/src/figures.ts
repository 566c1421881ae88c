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

export interface FigureDto {
  id: string;
  publicationId: string;
  title: string;
  ownerId: string;
  ownerName?: string;
  status: FigureStatus;
  currentVersion: FigureVersionDto;
  /** Assets of the current version (latest mesh outputs, renders, exports). */
  assets: AssetDto[];
  thumbnailAssetId?: string | null;
  createdAt: string;
  updatedAt: string;
}

export interface FigureSummaryDto {
  id: string;
  publicationId: string;
  title: string;
  ownerId: string;
  ownerName?: string;
  status: FigureStatus;
  versionNumber: number;
  label?: string;
  thumbnailAssetId?: string | null;
  updatedAt: string;
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
  watertight: boolean;
}

export interface AssetDto {
  id: string;
  kind: AssetKind;
  bytes: number;
  sha256: string;
  stats?: { isovalue?: number; enclosed?: number; grid?: { n: number; extent: number }; surfaces?: MeshStatsDto[]; [k: string]: unknown } | null;
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
  timings?: Record<string, number> | null;
  createdAt: string;
  updatedAt: string;
}

/** Progress stages of a mesh job, in order. */
export const MESH_STAGES = ['queued', 'sampling', 'threshold', 'extracting', 'encoding', 'storing', 'done'] as const;
