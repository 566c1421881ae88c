import { CANVAS_LIMITS, RASTER_LIMITS } from './limits';

/**
 * Exports of a figure (issue "The studio"): POST /api/figures/:id/exports with one of these bodies answers
 * 201 CreateJobResponse; the job (GET /api/jobs/:id) completes with the produced asset(s).
 */
export const EXPORT_FORMATS = ['png', 'tiff', 'svg', 'pdf', 'glb', 'stl', 'bundle'] as const;
export type ExportFormat = (typeof EXPORT_FORMATS)[number];

export const EXPORT_DPI = [300, 600, 1200] as const;
export type ExportDpi = (typeof EXPORT_DPI)[number];

export const SECTION_PLANES = ['xy', 'xz', 'yz'] as const;
export type SectionPlane = (typeof SECTION_PLANES)[number];

/**
 * Limits of an export. Sizes as the recipe canvas (10..1000 mm). Raster exports are also capped in pixels:
 * the render page takes at most 20000 px a side, and 64 megapixels keep the RGBA image (256 MB) and its PNG
 * well inside one worker's memory.
 */
export const EXPORT_LIMITS = {
  mmMin: CANVAS_LIMITS.mmMin,
  mmMax: CANVAS_LIMITS.mmMax,
  pxMax: RASTER_LIMITS.pxMax,
  megapixelsMax: RASTER_LIMITS.megapixelsMax,
  sectionLevelsMin: 1,
  sectionLevelsMax: 12,
  sectionLevelsDefault: 4,
} as const;

export interface PngExportRequest {
  format: 'png';
  widthMm: number;
  heightMm: number;
  dpi: ExportDpi;
  /** Default: the recipe's stage.background.transparent. */
  transparent?: boolean;
}

export interface SvgExportRequest {
  format: 'svg';
  /** radial: P(r) of the dominant term (largest |c|²; the first of equals). section: contour map of ψ in a plane. */
  kind: 'radial' | 'section';
  /** Section plane (default 'xz'). */
  plane?: SectionPlane;
  /** Position of the plane along its normal, a0 (default 0). */
  offset?: number;
  /** Contour levels per sign (section; default 4). */
  levels?: number;
  /** Default: the recipe canvas. */
  widthMm?: number;
  heightMm?: number;
}

/**
 * TIFF (issue "Print production"): the PNG's pixels, LZW, resolution in inches, flattened unless `alpha`; RGB with
 * sRGB embedded or CMYK separated through a press condition's profile. `colour` and `pressCondition` default to the
 * publication's delivery profile.
 */
export interface TiffExportRequest {
  format: 'tiff';
  widthMm: number;
  heightMm: number;
  dpi: ExportDpi;
  transparent?: boolean;
  /** Keep an alpha channel (RGB only; most journals refuse it). */
  alpha?: boolean;
  colour?: 'rgb' | 'cmyk';
  pressCondition?: 'fogra39' | 'gracol' | 'swop';
}

/** PDF companion: the radial plot or section map as vector paths, fonts embedded, output intent, tagged. */
export interface PdfExportRequest extends Omit<SvgExportRequest, 'format'> {
  format: 'pdf';
  colour?: 'rgb' | 'cmyk';
  pressCondition?: 'fogra39' | 'gracol' | 'swop';
}

export interface MeshExportRequest {
  format: 'glb' | 'stl';
}

export interface BundleExportRequest {
  format: 'bundle';
}

export type ExportRequest = PngExportRequest | TiffExportRequest | SvgExportRequest | PdfExportRequest | MeshExportRequest | BundleExportRequest;

/** Progress stages of render and export jobs, in order ("meshing" only when the version had no mesh yet). */
export const EXPORT_STAGES = ['queued', 'meshing', 'rendering', 'encoding', 'storing', 'done'] as const;
export type ExportStage = (typeof EXPORT_STAGES)[number];

/** Thumbnail size (px) rendered after every mesh job; the pHYs says 96 dpi (a screen image). */
export const THUMBNAIL = { widthPx: 320, heightPx: 240, dpi: 96 } as const;

/** Figure sets: several figures laid out as panels of one image. */
export interface CreateFigureSetRequest {
  publicationId: string;
  title: string;
  figureIds: string[];
  columns: number;
  /** Printed under the panels (at most TEXT_LIMITS.captionMax characters); the panels are lettered a, b, c … */
  caption?: string;
}

export interface FigureSetDto {
  id: string;
  publicationId: string;
  title: string;
  figureIds: string[];
  columns: number;
  caption: string | null;
  /** The set's latest exported PNG (asset id), null before the first export. */
  pngAssetId: string | null;
  createdBy: string | null;
  createdAt: string;
}

export const FIGURE_SET_LIMITS = { figuresMin: 1, figuresMax: 12, columnsMin: 1, columnsMax: 6 } as const;
