import { COLOUR_MODES, EXPORT_DPI, EXPORT_FORMATS, EXPORT_LIMITS, PRESS_CONDITION_IDS, SECTION_PLANES, rasterProblem, type ColourMode, type DeliveryProfile, type ExportFormat, type PressConditionId, type Recipe, type RenderParams, type ExportParams as ExportJobParams, type SectionPlane } from '@psiform/contracts';
import { exportPixelSize } from '@psiform/print';

/** Colour of a print file: from the request, else the publication's delivery profile (filled in by the service). */
export interface PrintColour {
  colour: ColourMode;
  pressCondition: PressConditionId;
}

/** What a render (png, tiff) or export job is asked to do: the job contract's params (libs/contracts jobs.ts). */
export type ExportParams = RenderParams | ExportJobParams;

export type ExportParse = { ok: true; params: ExportParams } | { ok: false; messages: string[] };

const ALLOWED: Record<ExportFormat, readonly string[]> = {
  png: ['format', 'widthMm', 'heightMm', 'dpi', 'transparent'],
  tiff: ['format', 'widthMm', 'heightMm', 'dpi', 'transparent', 'alpha', 'colour', 'pressCondition'],
  svg: ['format', 'kind', 'plane', 'offset', 'levels', 'widthMm', 'heightMm'],
  pdf: ['format', 'kind', 'plane', 'offset', 'levels', 'widthMm', 'heightMm', 'colour', 'pressCondition'],
  glb: ['format'],
  stl: ['format'],
  bundle: ['format'],
};

const show = (v: unknown) => (typeof v === 'string' ? JSON.stringify(v) : v === undefined ? 'nothing' : JSON.stringify(v) ?? String(v));

function mm(body: Record<string, unknown>, field: string, problems: string[], fallback?: number): number {
  const v = body[field] ?? fallback;
  if (typeof v !== 'number' || !Number.isFinite(v) || v < EXPORT_LIMITS.mmMin || v > EXPORT_LIMITS.mmMax) {
    problems.push(`${field}: must be a number of millimetres from ${EXPORT_LIMITS.mmMin} to ${EXPORT_LIMITS.mmMax} (got ${show(body[field])})`);
    return NaN;
  }
  return v;
}

/**
 * Checks an export request body (one of the ExportRequest shapes of @psiform/contracts). Every problem names its
 * field, unknown fields included (as the ValidationPipe does for the other routes). Sizes the SVG request leaves
 * out come from the recipe's canvas.
 */
export function parseExportRequest(body: unknown, recipe: Pick<Recipe, 'canvas' | 'source'>): ExportParse {
  if (body === null || typeof body !== 'object' || Array.isArray(body)) return { ok: false, messages: ['body: must be a JSON object with a format'] };
  const b = body as Record<string, unknown>;
  const format = b.format;
  if (typeof format !== 'string' || !(EXPORT_FORMATS as readonly string[]).includes(format)) {
    return { ok: false, messages: [`format: must be one of ${EXPORT_FORMATS.join(', ')} (got ${show(format)})`] };
  }
  const f = format as ExportFormat;
  const problems: string[] = [];
  for (const k of Object.keys(b)) if (!ALLOWED[f].includes(k)) problems.push(`${k}: is not a field of a ${f} export`);

  const colour = (): Partial<PrintColour> => {
    const out: Partial<PrintColour> = {};
    if (b.colour !== undefined) {
      if (typeof b.colour !== 'string' || !(COLOUR_MODES as readonly string[]).includes(b.colour)) problems.push(`colour: must be one of ${COLOUR_MODES.join(', ')} (got ${show(b.colour)})`);
      else out.colour = b.colour as ColourMode;
    }
    if (b.pressCondition !== undefined) {
      if (typeof b.pressCondition !== 'string' || !(PRESS_CONDITION_IDS as readonly string[]).includes(b.pressCondition)) problems.push(`pressCondition: must be one of ${PRESS_CONDITION_IDS.join(', ')} (got ${show(b.pressCondition)})`);
      else out.pressCondition = b.pressCondition as PressConditionId;
    }
    return out;
  };

  if (f === 'png' || f === 'tiff') {
    const widthMm = mm(b, 'widthMm', problems);
    const heightMm = mm(b, 'heightMm', problems);
    const dpi = b.dpi;
    if (typeof dpi !== 'number' || !(EXPORT_DPI as readonly number[]).includes(dpi)) problems.push(`dpi: must be one of ${EXPORT_DPI.join(', ')} (got ${show(dpi)})`);
    if (b.transparent !== undefined && typeof b.transparent !== 'boolean') problems.push(`transparent: must be true or false (got ${show(b.transparent)})`);
    if (b.alpha !== undefined && typeof b.alpha !== 'boolean') problems.push(`alpha: must be true or false (got ${show(b.alpha)})`);
    const col = f === 'tiff' ? colour() : {};
    if (f === 'tiff' && b.alpha === true && col.colour === 'cmyk') problems.push('alpha: a CMYK TIFF is always flattened (alpha is for RGB only)');
    if (problems.length) return { ok: false, messages: problems };
    const { width, height } = exportPixelSize({ widthMm, heightMm, dpi: dpi as number });
    const raster = rasterProblem(widthMm, heightMm, dpi as number);
    if (raster) return { ok: false, messages: [`dpi: ${raster}`] };
    const base = { widthMm, heightMm, dpi: dpi as number, widthPx: width, heightPx: height, transparent: (b.transparent as boolean | undefined) ?? null };
    if (f === 'tiff') return { ok: true, params: { format: 'tiff', ...base, alpha: b.alpha === true, ...col } };
    return { ok: true, params: { format: 'png', ...base } };
  }

  if (f === 'svg' || f === 'pdf') {
    const kind = b.kind;
    if (kind !== 'radial' && kind !== 'section') problems.push(`kind: must be radial or section (got ${show(kind)})`);
    const plane = b.plane ?? 'xz';
    if (typeof plane !== 'string' || !(SECTION_PLANES as readonly string[]).includes(plane)) problems.push(`plane: must be one of ${SECTION_PLANES.join(', ')} (got ${show(b.plane)})`);
    const offset = b.offset ?? 0;
    if (typeof offset !== 'number' || !Number.isFinite(offset) || Math.abs(offset) > 2000) problems.push(`offset: must be a number of Bohr radii from -2000 to 2000 (got ${show(b.offset)})`);
    const levels = b.levels ?? EXPORT_LIMITS.sectionLevelsDefault;
    if (typeof levels !== 'number' || !Number.isInteger(levels) || levels < EXPORT_LIMITS.sectionLevelsMin || levels > EXPORT_LIMITS.sectionLevelsMax) {
      problems.push(`levels: must be an integer from ${EXPORT_LIMITS.sectionLevelsMin} to ${EXPORT_LIMITS.sectionLevelsMax} (got ${show(b.levels)})`);
    }
    const widthMm = mm(b, 'widthMm', problems, recipe.canvas.widthMm);
    const heightMm = mm(b, 'heightMm', problems, recipe.canvas.heightMm);
    if (!problems.length && recipe.source?.kind === 'upload') {
      problems.push('kind: radial plots and section maps need the analytic state; this figure is an uploaded cube (export png, glb, stl or a bundle)');
    }
    const col = f === 'pdf' ? colour() : {};
    if (problems.length) return { ok: false, messages: problems };
    const plot = { kind: kind as 'radial' | 'section', plane: plane as SectionPlane, offset: offset as number, levels: levels as number, widthMm, heightMm };
    if (f === 'pdf') return { ok: true, params: { format: 'pdf', ...plot, ...col } };
    return { ok: true, params: { format: 'svg', ...plot } };
  }

  if (problems.length) return { ok: false, messages: problems };
  return { ok: true, params: f === 'bundle' ? { format: 'bundle' } : { format: f } };
}
