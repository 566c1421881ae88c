/**
 * Print production (issue "Print production"): named press conditions (ICC profiles in assets/icc), a
 * publication's delivery profile, preflight reports, and the reusable "override with a written reason" gate.
 */
import { z } from 'zod';

/**
 * The press conditions Psiform can separate to. Each has a CMYK profile built from Debian's icc-profiles-free
 * measurements (assets/icc/PROVENANCE.md). Total ink limits as the profiles were built (from memory: the usual
 * limits for each condition).
 */
export const PRESS_CONDITIONS = [
  { id: 'fogra39', name: 'FOGRA39 (ISO 12647-2 coated)', iccFile: 'psiform-fogra39.icc', tacPercent: 330, region: 'Europe' },
  { id: 'gracol', name: 'GRACoL coated #1 (CGATS TR 006)', iccFile: 'psiform-gracol-tr006.icc', tacPercent: 320, region: 'North America' },
  { id: 'swop', name: 'SWOP coated #3 (CGATS TR 003)', iccFile: 'psiform-swop-tr003.icc', tacPercent: 300, region: 'North America' },
] as const;
export type PressConditionId = (typeof PRESS_CONDITIONS)[number]['id'];
export const PRESS_CONDITION_IDS = PRESS_CONDITIONS.map((c) => c.id) as [PressConditionId, ...PressConditionId[]];
export function pressCondition(id: string): (typeof PRESS_CONDITIONS)[number] | undefined {
  return PRESS_CONDITIONS.find((c) => c.id === id);
}

export const COLOUR_MODES = ['rgb', 'cmyk'] as const;
export type ColourMode = (typeof COLOUR_MODES)[number];
export const RASTER_FORMATS = ['tiff', 'png'] as const;
export type RasterFormat = (typeof RASTER_FORMATS)[number];
export const VECTOR_FORMATS = ['pdf', 'svg'] as const;
export type VectorFormat = (typeof VECTOR_FORMATS)[number];

/**
 * Artwork types and the minimum dpi publishers' artwork guides usually ask for (facts of the trade: combination
 * art, an image with labels such as an orbital figure, 500–900 dpi; line art 1000–1200; halftones 300).
 */
export const ARTWORK_TYPES = [
  { id: 'combination', name: 'Combination art (image with labels)', minDpi: 600 },
  { id: 'line', name: 'Line art', minDpi: 1200 },
  { id: 'halftone', name: 'Halftone (photograph-like)', minDpi: 300 },
] as const;
export type ArtworkType = (typeof ARTWORK_TYPES)[number]['id'];

/** Words a file-name template may use (each as {word}); the extension is appended. */
export const FILE_NAME_TOKENS = ['publication', 'figure', 'label', 'version', 'kind', 'widthMm', 'heightMm', 'dpi', 'colour'] as const;

export const DELIVERY_LIMITS = {
  columnsMin: 1,
  columnsMax: 6,
  columnMmMin: 20,
  columnMmMax: 400,
  dpiMin: 72,
  dpiMax: 2400,
  fontPtMin: 3,
  fontPtMax: 14,
  linePtMin: 0.05,
  linePtMax: 3,
  altMaxMin: 40,
  altMaxMax: 1000,
  templateMax: 120,
  reasonMin: 10,
  reasonMax: 2000,
} as const;

const L = DELIVERY_LIMITS;
const tokenList = FILE_NAME_TOKENS.map((t) => `{${t}}`).join(', ');

export const deliveryProfileSchema = z
  .object({
    columnWidthsMm: z
      .array(
        z.object({
          name: z.string().trim().min(1, 'a column needs a name').max(40, 'at most 40 characters'),
          widthMm: z.number().min(L.columnMmMin, `at least ${L.columnMmMin} mm`).max(L.columnMmMax, `at most ${L.columnMmMax} mm`),
        }).strict(),
      )
      .min(L.columnsMin, 'at least one column width')
      .max(L.columnsMax, `at most ${L.columnsMax} column widths`),
    artworkType: z.enum(ARTWORK_TYPES.map((a) => a.id) as [ArtworkType, ...ArtworkType[]]),
    minDpi: z.number().int('a whole number').min(L.dpiMin, `at least ${L.dpiMin}`).max(L.dpiMax, `at most ${L.dpiMax}`),
    minFontPt: z.number().min(L.fontPtMin, `at least ${L.fontPtMin} pt`).max(L.fontPtMax, `at most ${L.fontPtMax} pt`),
    minLineWeightPt: z.number().min(L.linePtMin, `at least ${L.linePtMin} pt`).max(L.linePtMax, `at most ${L.linePtMax} pt`),
    colourMode: z.enum(COLOUR_MODES),
    pressCondition: z.enum(PRESS_CONDITION_IDS),
    rasterFormats: z.array(z.enum(RASTER_FORMATS)).min(1, 'at least one raster format').refine((a) => new Set(a).size === a.length, 'each format once'),
    vectorFormats: z.array(z.enum(VECTOR_FORMATS)).min(1, 'at least one vector format').refine((a) => new Set(a).size === a.length, 'each format once'),
    fileNameTemplate: z
      .string()
      .trim()
      .min(1, 'a template is needed')
      .max(L.templateMax, `at most ${L.templateMax} characters`)
      .refine((t) => !/[/\\\0]/.test(t), 'no slashes')
      .refine((t) => [...t.matchAll(/\{([^}]*)\}/g)].every((m) => (FILE_NAME_TOKENS as readonly string[]).includes(m[1])), `only the words ${tokenList}`),
    altText: z
      .object({
        required: z.boolean(),
        maxLength: z.number().int('a whole number').min(L.altMaxMin, `at least ${L.altMaxMin}`).max(L.altMaxMax, `at most ${L.altMaxMax}`),
        longDescriptionRequired: z.boolean(),
      })
      .strict(),
  })
  .strict();

export type DeliveryProfile = z.infer<typeof deliveryProfileSchema>;

/**
 * The profile a publication has until its art director sets one: common journal practice (single / 1.5 / double
 * column 88 / 130 / 178 mm, the studio's column presets, which libs/print derives from here; combination art at 600 dpi, text at least 6 pt and lines 0.25 pt after scaling, CMYK to
 * FOGRA39, TIFF and PDF first, alt text at most 125 characters plus a long description).
 */
export const DEFAULT_DELIVERY_PROFILE: DeliveryProfile = {
  columnWidthsMm: [
    { name: 'single', widthMm: 88 },
    { name: 'one and a half', widthMm: 130 },
    { name: 'double', widthMm: 178 },
  ],
  artworkType: 'combination',
  minDpi: 600,
  minFontPt: 6,
  minLineWeightPt: 0.25,
  colourMode: 'cmyk',
  pressCondition: 'fogra39',
  rasterFormats: ['tiff', 'png'],
  vectorFormats: ['pdf', 'svg'],
  fileNameTemplate: '{publication}_{figure}_{label}_{widthMm}x{heightMm}mm_{dpi}dpi',
  altText: { required: true, maxLength: 125, longDescriptionRequired: true },
};

/** Parses a delivery profile; errors are "field.path: reason" lines (the API answers 400 with them). */
export function parseDeliveryProfile(input: unknown): { ok: true; value: DeliveryProfile } | { ok: false; errors: string[] } {
  const r = deliveryProfileSchema.safeParse(input);
  if (r.success) return { ok: true, value: r.data };
  return { ok: false, errors: r.error.issues.map((i) => `${i.path.length ? i.path.join('.') : 'body'}: ${i.message}`) };
}

export interface DeliveryProfileDto extends DeliveryProfile {
  publicationId: string;
  /** True while the publication has not set its own (the defaults above apply). */
  isDefault: boolean;
  updatedAt: string | null;
  updatedBy: string | null;
}

/** The checks of a preflight report, in the order reports list them. */
export const PREFLIGHT_RULES = [
  { id: 'format', name: 'File format accepted' },
  { id: 'size', name: 'Size: pixels for the stated mm at the dpi (raster), page size (vector)' },
  { id: 'resolution', name: 'Resolution at least the minimum dpi' },
  { id: 'column_width', name: 'Fits a column width' },
  { id: 'font_size', name: 'Effective font sizes after scaling (subscripts included)' },
  { id: 'line_weight', name: 'Line weights after scaling' },
  { id: 'colour_mode', name: 'Colour mode' },
  { id: 'icc_profile', name: 'ICC profile / press condition' },
  { id: 'fonts_embedded', name: 'Fonts embedded' },
  { id: 'alt_text', name: 'Alt text present and within length' },
] as const;
export type PreflightRuleId = (typeof PREFLIGHT_RULES)[number]['id'];

export interface PreflightResult {
  rule: PreflightRuleId;
  status: 'pass' | 'fail';
  /** What the profile asks, and what the file has, in words and numbers. */
  expected: string;
  actual: string;
}

export interface PreflightFileReport {
  file: string;
  format: string;
  passed: boolean;
  results: PreflightResult[];
}

export interface PreflightReport {
  /** The profile the files were checked against (a copy: the report stays true if the profile changes later). */
  profile: DeliveryProfile;
  checkedAt: string;
  passed: boolean;
  files: PreflightFileReport[];
}

/** GET /api/figures/:id/preflight: the current version's reports and whether they block approval. */
export interface FigurePreflightDto {
  figureId: string;
  versionNumber: number;
  /** The newest report of each asset kind of the current version (a newer export replaces an older one). */
  reports: { assetId: string; kind: string; createdAt: string; report: PreflightReport }[];
  failures: string[];
  /** True when approval would be blocked (failures and no override). */
  blocksApproval: boolean;
}

/** A written reason to go past a failed gate (preflight now; swatchbook pinning and batch re-renders later). */
export const gateOverrideSchema = z
  .object({
    reason: z.string().trim().min(L.reasonMin, `at least ${L.reasonMin} characters: say why the failures are acceptable`).max(L.reasonMax, `at most ${L.reasonMax} characters`),
  })
  .strict();
export type GateOverride = z.infer<typeof gateOverrideSchema>;

/** Answer (409) of an action a gate blocked: what failed, and that an override with a reason is possible. */
export interface GateBlockedDto {
  statusCode: 409;
  error: 'Conflict';
  gate: string;
  message: string;
  failures: string[];
  overridable: boolean;
}
