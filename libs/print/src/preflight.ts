// Preflight: each delivered file checked against its publication's delivery profile (libs/contracts print.ts).
// Pure rules on facts the caller measured from the file it wrote (pixel size and dpi read back, page size,
// colour space and embedded profile, fonts, text sizes and line weights); the report lists every rule with
// pass or fail, and says what was expected and what the file has.
import {
  PREFLIGHT_RULES,
  pressCondition,
  type DeliveryProfile,
  type PreflightFileReport,
  type PreflightReport,
  type PreflightResult,
  type PreflightRuleId,
} from '@psiform/contracts';
import { MM_PER_INCH, pixelsFor } from './size';

const { abs, round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export const PT_PER_MM = 72 / MM_PER_INCH;
export const mmToPt = (mm: number): number => mm * PT_PER_MM;

export type PreflightFormat = 'tiff' | 'png' | 'pdf' | 'svg';

export interface PreflightSubject {
  /** File name as delivered (inside a bundle: its name there). */
  file: string;
  format: PreflightFormat;
  /** The physical size the file was made for. */
  widthMm: number;
  heightMm: number;
  /** Raster files: what the file says (read back), and the dpi asked for. */
  raster?: { widthPx: number; heightPx: number; dpi: number; dpiTagged: number };
  /** Vector files: the page (PDF MediaBox, SVG width/height) in mm, read back. */
  pageMm?: { width: number; height: number };
  colourSpace: 'rgb' | 'cmyk' | 'gray';
  /**
   * The embedded ICC profile (its description) and what it is: 'srgb', a press condition id, or 'other'. For SVG,
   * colours are sRGB by definition (SVG 1.1 §11.2 / CSS colour), so the caller passes { condition: 'srgb' }.
   */
  icc: { description: string; condition: string } | null;
  /** Every text size at the file's own size, subscripts at their own size (the typesetter's). */
  texts: { what: string; sizePt: number }[];
  lines: { what: string; weightPt: number }[];
  /** Fonts the file depends on; 'rasterised' when text is pixels (nothing to embed). */
  fonts: 'rasterised' | { name: string; embedded: boolean; subset: boolean }[];
  /**
   * Vector files: characters the text draws that no embedded font has a glyph for. A reader draws them as empty
   * boxes (.notdef), so an embedded font that lacks them is not "the text embedded". Omitted = not checked.
   */
  unglyphed?: string[];
  altText: { short?: string; long?: string };
}

/**
 * Where the file will sit: at its own width when that fits the widest column, else reduced to the widest
 * column (text and lines shrink with it). `scale` multiplies every length of the file.
 */
export function placement(widthMm: number, profile: DeliveryProfile): { scale: number; columnMm: number; column: string } {
  const cols = [...profile.columnWidthsMm].sort((a, b) => a.widthMm - b.widthMm);
  const fit = cols.find((c) => widthMm <= c.widthMm + 0.5);
  if (fit) return { scale: 1, columnMm: fit.widthMm, column: fit.name };
  const widest = cols[cols.length - 1];
  return { scale: widest.widthMm / widthMm, columnMm: widest.widthMm, column: widest.name };
}

const n1 = (x: number) => (round(x * 10) / 10).toString();
const n2 = (x: number) => (round(x * 100) / 100).toString();

export function preflightFile(s: PreflightSubject, profile: DeliveryProfile): PreflightFileReport {
  const out = new Map<PreflightRuleId, PreflightResult>();
  const put = (rule: PreflightRuleId, pass: boolean, expected: string, actual: string) => out.set(rule, { rule, status: pass ? 'pass' : 'fail', expected, actual });
  const raster = s.format === 'tiff' || s.format === 'png';
  const allowed: string[] = raster ? profile.rasterFormats : profile.vectorFormats;
  put('format', allowed.includes(s.format), `${raster ? 'raster' : 'vector'} as ${allowed.join(' or ')}`, s.format);

  if (raster) {
    const r = s.raster;
    if (!r) put('size', false, `pixels for ${n1(s.widthMm)} × ${n1(s.heightMm)} mm`, 'no pixel size read from the file');
    else {
      const w = pixelsFor(s.widthMm, r.dpi);
      const h = pixelsFor(s.heightMm, r.dpi);
      const tagOk = abs(r.dpiTagged - r.dpi) < 0.5;
      put('size', r.widthPx === w && r.heightPx === h && tagOk, `${w} × ${h} px tagged ${r.dpi} dpi (${n1(s.widthMm)} × ${n1(s.heightMm)} mm)`, `${r.widthPx} × ${r.heightPx} px tagged ${n2(r.dpiTagged)} dpi`);
    }
    const dpi = r?.dpi ?? 0;
    put('resolution', dpi >= profile.minDpi, `at least ${profile.minDpi} dpi (${profile.artworkType} art)`, `${dpi} dpi`);
  } else {
    const p = s.pageMm;
    const ok = !!p && abs(p.width - s.widthMm) <= 0.1 && abs(p.height - s.heightMm) <= 0.1;
    put('size', ok, `page ${n1(s.widthMm)} × ${n1(s.heightMm)} mm (±0.1)`, p ? `page ${n2(p.width)} × ${n2(p.height)} mm` : 'no page size read from the file');
    put('resolution', true, `at least ${profile.minDpi} dpi for raster content`, 'vector paths and text only: no raster content');
  }

  const place = placement(s.widthMm, profile);
  const cols = profile.columnWidthsMm.map((c) => `${c.name} ${c.widthMm} mm`).join(', ');
  put(
    'column_width',
    place.scale === 1,
    `width within a column (${cols})`,
    place.scale === 1 ? `${n1(s.widthMm)} mm fits ${place.column} (${place.columnMm} mm)` : `${n1(s.widthMm)} mm is wider than every column: it would be reduced to ${place.columnMm} mm (${round(place.scale * 100)}%)`,
  );

  if (!s.texts.length) put('font_size', true, `text at least ${profile.minFontPt} pt`, 'no text');
  else {
    const small = s.texts.reduce((a, b) => (b.sizePt < a.sizePt ? b : a));
    const eff = small.sizePt * place.scale;
    put('font_size', eff >= profile.minFontPt - 1e-6, `text at least ${profile.minFontPt} pt after scaling`, `smallest: ${small.what} ${n2(eff)} pt${place.scale !== 1 ? ` (${n2(small.sizePt)} pt × ${n2(place.scale)})` : ''}`);
  }
  if (!s.lines.length) put('line_weight', true, `lines at least ${profile.minLineWeightPt} pt`, 'no lines');
  else {
    const thin = s.lines.reduce((a, b) => (b.weightPt < a.weightPt ? b : a));
    const eff = thin.weightPt * place.scale;
    put('line_weight', eff >= profile.minLineWeightPt - 1e-6, `lines at least ${profile.minLineWeightPt} pt after scaling`, `thinnest: ${thin.what} ${n2(eff)} pt`);
  }

  const cond = pressCondition(profile.pressCondition);
  put('colour_mode', s.colourSpace === profile.colourMode, profile.colourMode.toUpperCase(), s.colourSpace.toUpperCase());
  const wantIcc = profile.colourMode === 'cmyk' ? profile.pressCondition : 'srgb';
  const wantName = profile.colourMode === 'cmyk' ? `${cond?.name ?? profile.pressCondition} profile` : 'sRGB profile';
  put('icc_profile', !!s.icc && s.icc.condition === wantIcc, `${wantName} embedded`, s.icc ? `${s.icc.description}` : 'no profile embedded');

  if (s.fonts === 'rasterised') put('fonts_embedded', true, 'every font embedded', 'text is rasterised into the pixels: no fonts needed');
  else {
    const missing = s.fonts.filter((f) => !f.embedded);
    const boxes = s.unglyphed ?? [];
    const has = s.fonts.length === 0 ? 'no fonts used' : missing.length ? `not embedded: ${missing.map((f) => f.name).join(', ')}` : s.fonts.map((f) => `${f.name} (embedded${f.subset ? ', subset' : ''})`).join(', ');
    put('fonts_embedded', missing.length === 0 && boxes.length === 0, 'every font embedded, with a glyph for every character', boxes.length ? `${has}; no glyph for ${boxes.map((c) => `"${c}" (U+${c.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0')})`).join(', ')}` : has);
  }

  const a = profile.altText;
  const short = s.altText.short?.trim() ?? '';
  const long = s.altText.long?.trim() ?? '';
  const problems: string[] = [];
  if (a.required && !short) problems.push('no alt text');
  if (short.length > a.maxLength) problems.push(`alt text is ${short.length} characters`);
  if (a.longDescriptionRequired && !long) problems.push('no long description');
  put(
    'alt_text',
    problems.length === 0,
    `${a.required ? 'alt text' : 'alt text optional'}, at most ${a.maxLength} characters${a.longDescriptionRequired ? ', plus a long description' : ''}`,
    problems.length ? problems.join('; ') : `${short.length} characters${long ? ` + long description (${long.length})` : ''}`,
  );

  const results = PREFLIGHT_RULES.map((r) => out.get(r.id)!);
  return { file: s.file, format: s.format, passed: results.every((r) => r.status === 'pass'), results };
}

export function preflightReport(subjects: PreflightSubject[], profile: DeliveryProfile, checkedAt: string): PreflightReport {
  const files = subjects.map((s) => preflightFile(s, profile));
  return { profile, checkedAt, passed: files.every((f) => f.passed), files };
}

/** One line per failure ("figure.tif: font_size: smallest: …"), for gate messages and logs. */
export function preflightFailures(report: PreflightReport): string[] {
  return report.files.flatMap((f) => f.results.filter((r) => r.status === 'fail').map((r) => `${f.file}: ${r.rule}: expected ${r.expected}; has ${r.actual}`));
}

/** The report as text for README/metadata sheets: one line per rule and file. */
export function preflightText(report: PreflightReport): string {
  const lines = [`Preflight ${report.passed ? 'PASSED' : 'FAILED'} (${report.checkedAt})`];
  for (const f of report.files) {
    lines.push(`${f.file} (${f.format}): ${f.passed ? 'pass' : 'FAIL'}`);
    for (const r of f.results) lines.push(`  ${r.status === 'pass' ? 'pass' : 'FAIL'}  ${r.rule.padEnd(15)} expected ${r.expected}; has ${r.actual}`);
  }
  return lines.join('\n') + '\n';
}

/**
 * Text sizes and line weights read back from one of our SVGs (user unit = 1 mm): font sizes from the <style>
 * class rules and inline font-size attributes, tspans at a percentage of their text (subscripts), stroke widths.
 * Only for the SVGs this library writes; an unknown structure gives a size of 0, which fails, never passes.
 */
export function svgPrintFacts(svg: string): { texts: { what: string; sizePt: number }[]; lines: { what: string; weightPt: number }[] } {
  const classSize = new Map<string, number>();
  const classStroke = new Map<string, number>();
  let baseText = 0;
  for (const m of svg.matchAll(/([.a-zA-Z][\w.\s,-]*)\{([^}]*)\}/g)) {
    const sel = m[1].trim();
    const fs = /font-size:\s*([\d.]+)(px)?/.exec(m[2]);
    const sw = /stroke-width:\s*([\d.]+)/.exec(m[2]);
    for (const one of sel.split(',').map((x) => x.trim())) {
      if (fs && one === 'text') baseText = Number(fs[1]);
      else if (fs && one.startsWith('.')) classSize.set(one.slice(1), Number(fs[1]));
      if (sw && one.startsWith('.')) classStroke.set(one.slice(1), Number(sw[1]));
    }
  }
  const texts: { what: string; sizePt: number }[] = [];
  for (const m of svg.matchAll(/<text\b([^>]*)>([\s\S]*?)<\/text>/g)) {
    const attrs = m[1];
    const inline = /font-size="([\d.]+)"/.exec(attrs);
    const cls = /class="([^"]*)"/.exec(attrs)?.[1].split(/\s+/) ?? [];
    const fromClass = cls.map((c) => classSize.get(c)).find((v) => v !== undefined);
    const size = inline ? Number(inline[1]) : fromClass ?? baseText;
    const what = `text "${m[2].replace(/<[^>]+>/g, '').slice(0, 24)}"`;
    texts.push({ what, sizePt: mmToPt(size) });
    for (const t of m[2].matchAll(/<tspan\b[^>]*font-size="([\d.]+)(%?)"[^>]*>([^<]*)/g)) {
      const sub = t[2] === '%' ? (size * Number(t[1])) / 100 : Number(t[1]);
      texts.push({ what: `${what} sub/superscript "${t[3]}"`, sizePt: mmToPt(sub) });
    }
  }
  const lines: { what: string; weightPt: number }[] = [];
  for (const m of svg.matchAll(/<(path|line|polyline|rect|circle)\b([^>]*)>/g)) {
    const attrs = m[2];
    const sw = /stroke-width="([\d.]+)"/.exec(attrs);
    const cls = /class="([^"]*)"/.exec(attrs)?.[1].split(/\s+/) ?? [];
    const stroke = /stroke="([^"]*)"/.exec(attrs)?.[1];
    const w = sw ? Number(sw[1]) : cls.map((c) => classStroke.get(c)).find((v) => v !== undefined);
    if (w === undefined || stroke === 'none') continue;
    lines.push({ what: `${m[1]}${cls.length ? `.${cls[0]}` : ''}`, weightPt: mmToPt(w) });
  }
  return { texts, lines };
}
