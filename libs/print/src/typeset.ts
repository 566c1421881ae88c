// Typesetting of orbital names, units and exponents: ONE parser (`typeset`) turns the plain strings the
// engine writes ('3d_z²', '2p(m=+1)', 'sp³ #2', '0.707·2p_x + 0.707·2p_y', 'a0^−3/2', 'Li²⁺') into runs of
// base, subscript and superscript text. Every surface that shows such text renders those runs: SVG `tspan`s
// (runsToSvg), Canvas 2D for the figure overlay and the render page (drawRuns / measureRuns), the React UI
// (apps/web components/Typeset) and plain text for alt text, file names and README sheets (plainText).
// The names themselves belong to @psiform/orbitals (prettyLabel); this file only decides how they are set.

const { round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export type Script = 'base' | 'sub' | 'sup';

export interface TextRun {
  text: string;
  script: Script;
}

/**
 * Size and shift of scripts relative to the base font size (common practice in print: scripts at about
 * 68 % of the body size, subscripts dropped by about a fifth of an em, superscripts raised by about a third).
 */
export const SCRIPT_METRICS = { size: 0.68, subShift: 0.22, supShift: 0.38 } as const;

/** Markup for the length units a figure may use, and for ψ's unit (a0^-3/2). */
export const UNIT_TEXT = { angstrom: 'Å', bohr: 'a0' } as const;
export type FigureUnit = keyof typeof UNIT_TEXT;
export const PSI_UNIT_TEXT = 'a0^−3/2';
export const DENSITY_UNIT_TEXT = 'a0^−3';

/** Unicode superscript characters -> plain (they become real superscript runs at base level). */
const SUPERSCRIPT_CHARS: Record<string, string> = {
  '⁰': '0', '¹': '1', '²': '2', '³': '3', '⁴': '4', '⁵': '5', '⁶': '6', '⁷': '7', '⁸': '8', '⁹': '9', '⁺': '+', '⁻': '−',
};
const SUBSCRIPT_CHARS: Record<string, string> = {
  '₀': '0', '₁': '1', '₂': '2', '₃': '3', '₄': '4', '₅': '5', '₆': '6', '₇': '7', '₈': '8', '₉': '9', '₊': '+', '₋': '−',
};
/** Characters a bare subscript (without braces) may hold: '3d_x²−y²', '4f_z(x²−y²)', 'f_xyz'. */
const SUB_CHAR = /[A-Za-z0-9²³¹⁰⁴⁵⁶⁷⁸⁹−()]/;
/** Characters a bare exponent may hold: 'a0^−3/2', 'Å^-1', 'r^2'. */
const SUP_CHAR = /[0-9−\-+/.]/;

function push(runs: TextRun[], text: string, script: Script): void {
  if (!text) return;
  const last = runs[runs.length - 1];
  if (last && last.script === script) last.text += text;
  else runs.push({ text, script });
}

function minus(s: string): string {
  return s.replace(/-/g, '−');
}

/** Reads a braced or parenthesised group starting at `open`; returns [content, index after it] or null. */
function group(s: string, open: number): [string, number] | null {
  const o = s[open];
  const c = o === '{' ? '}' : o === '(' ? ')' : null;
  if (!c) return null;
  let depth = 0;
  for (let j = open; j < s.length; j++) {
    if (s[j] === o) depth++;
    else if (s[j] === c && --depth === 0) return [s.slice(open + 1, j), j + 1];
  }
  return null;
}

/**
 * Runs of a plain string:
 * - `_x`, `_xy`, `_x²−y²`, `_z(x²−y²)`, `_{…}`: subscript (a bare one runs while the characters are
 *   letters, digits, ², −, + or a balanced parenthesis);
 * - `^−3/2`, `^2`, `^{…}`, `^(…)`: superscript;
 * - `a0` / `a₀` as a unit (not inside a word or number): a with subscript 0;
 * - a complex form `2p(m=+1)`: 2p with subscript +1 (the m value);
 * - Unicode superscripts at base level: ¹ ² ³ alone stay the font's own superscript figures (sp³, 96³);
 *   a run holding any other (Li²⁺, Zn²⁹⁺) becomes one superscript run of plain digits and signs;
 *   inside a subscript (z², x²−y²) they stay glyphs.
 * Hyphen-minus in exponents and m values becomes the minus sign U+2212.
 */
export function typeset(text: string): TextRun[] {
  const runs: TextRun[] = [];
  if (typeof text !== 'string' || text === '') return runs;
  const s = text;
  let i = 0;
  let base = '';
  const flush = () => {
    push(runs, base, 'base');
    base = '';
  };
  while (i < s.length) {
    const ch = s[i];
    // Complex form written by the engine: 2p(m=+1), 4f(m=-3).
    if (ch === '(' && /[0-9][spdfghik]$/.test(base)) {
      const m = /^\(m=([+\-−]?\d+)\)/.exec(s.slice(i));
      if (m) {
        flush();
        push(runs, minus(m[1]), 'sub');
        i += m[0].length;
        continue;
      }
    }
    if (ch === '_' && i + 1 < s.length) {
      const g = s[i + 1] === '{' ? group(s, i + 1) : null;
      if (g) {
        flush();
        push(runs, g[0], 'sub');
        i = g[1];
        continue;
      }
      let j = i + 1;
      let depth = 0;
      while (j < s.length && (SUB_CHAR.test(s[j]) || (depth > 0 && s[j] !== ' '))) {
        if (s[j] === '(') depth++;
        if (s[j] === ')') {
          if (depth === 0) break;
          depth--;
        }
        j++;
      }
      if (j > i + 1) {
        flush();
        push(runs, s.slice(i + 1, j), 'sub');
        i = j;
        continue;
      }
    }
    if (ch === '^' && i + 1 < s.length) {
      const g = s[i + 1] === '{' || s[i + 1] === '(' ? group(s, i + 1) : null;
      if (g) {
        flush();
        push(runs, minus(g[0]), 'sup');
        i = g[1];
        continue;
      }
      let j = i + 1;
      while (j < s.length && SUP_CHAR.test(s[j])) j++;
      // A trailing '.' or '/' ends a sentence, not an exponent.
      while (j > i + 1 && /[./]/.test(s[j - 1])) j--;
      if (j > i + 1) {
        flush();
        push(runs, minus(s.slice(i + 1, j)), 'sup');
        i = j;
        continue;
      }
    }
    // The Bohr radius a0 / a₀ as a unit: not part of a word, a hex colour or a number.
    if (ch === 'a' && (s[i + 1] === '0' || s[i + 1] === '₀') && !/[A-Za-z0-9_#.]/.test(s[i - 1] ?? ' ') && !/[A-Za-z0-9.]/.test(s[i + 2] ?? ' ')) {
      base += 'a';
      flush();
      push(runs, '0', 'sub');
      i += 2;
      continue;
    }
    if (SUPERSCRIPT_CHARS[ch] !== undefined) {
      // A run of Unicode superscripts: ¹ ² ³ alone are the font's own superscript figures (Lato has them);
      // a run with any other (⁴…⁹, ⁰, ⁺, ⁻) becomes one superscript run, so Li²⁺ is set evenly.
      let j = i;
      while (j < s.length && SUPERSCRIPT_CHARS[s[j]] !== undefined) j++;
      const chars = s.slice(i, j);
      if (/^[¹²³]+$/.test(chars)) base += chars;
      else {
        flush();
        push(runs, [...chars].map((c) => SUPERSCRIPT_CHARS[c]).join(''), 'sup');
      }
      i = j;
      continue;
    }
    if (SUBSCRIPT_CHARS[ch] !== undefined) {
      flush();
      push(runs, SUBSCRIPT_CHARS[ch], 'sub');
      i++;
      continue;
    }
    base += ch;
    i++;
  }
  flush();
  return runs;
}

/**
 * Runs as plain text for places without markup (alt text, README, metadata.json, file names): scripts of
 * digits and signs use Unicode's script characters ('He⁺', 'a₀', '2p₊₁'); others are written inline
 * ('3dz²', 'a₀^(−3/2)').
 */
export function plainText(runs: TextRun[]): string {
  const SUP: Record<string, string> = { '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹', '+': '⁺', '−': '⁻', '-': '⁻' };
  const SUB: Record<string, string> = { '0': '₀', '1': '₁', '2': '₂', '3': '₃', '4': '₄', '5': '₅', '6': '₆', '7': '₇', '8': '₈', '9': '₉', '+': '₊', '−': '₋', '-': '₋' };
  let out = '';
  for (const r of runs) {
    if (r.script === 'base') out += r.text;
    else {
      const map = r.script === 'sup' ? SUP : SUB;
      const all = [...r.text].every((c) => map[c] !== undefined);
      // Unicode has script forms for digits and signs only; otherwise the run is written inline
      // (a subscript of letters reads naturally as '3dxy'; an exponent keeps a caret and parentheses).
      if (all) out += [...r.text].map((c) => map[c]).join('');
      else out += r.script === 'sub' ? r.text : `^(${r.text})`;
    }
  }
  return out;
}

/** Plain text of a typeset string (shorthand for plainText(typeset(text))). */
export function plainLabel(text: string): string {
  return plainText(typeset(text));
}

function escXml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

function num(x: number): string {
  const v = round(x * 1000) / 1000;
  return Object.is(v, -0) ? '0' : String(v);
}

/**
 * SVG markup for the runs inside a <text> element whose font size is `fontSize` (user units). Scripts are
 * `tspan`s with an explicit font size and a `dy` shift that the next run takes back: dy and font-size are
 * honoured by every SVG renderer, unlike baseline-shift (not implemented by some viewers).
 */
export function runsToSvg(runs: TextRun[], fontSize: number): string {
  let out = '';
  let shift = 0; // current baseline offset, +down
  for (const r of runs) {
    const target = r.script === 'sub' ? SCRIPT_METRICS.subShift * fontSize : r.script === 'sup' ? -SCRIPT_METRICS.supShift * fontSize : 0;
    const dy = target - shift;
    shift = target;
    const text = escXml(r.text);
    const attrs = [dy !== 0 ? `dy="${num(dy)}"` : '', r.script !== 'base' ? `font-size="${num(fontSize * SCRIPT_METRICS.size)}"` : '', r.script !== 'base' ? `class="${r.script}"` : '']
      .filter(Boolean)
      .join(' ');
    out += attrs ? `<tspan ${attrs}>${text}</tspan>` : text;
  }
  return out;
}

/** svg text markup of a plain string: runsToSvg(typeset(text), fontSize). */
export function svgText(text: string, fontSize: number): string {
  return runsToSvg(typeset(text), fontSize);
}

/** The part of CanvasRenderingContext2D the overlay needs (libs stay free of DOM types). */
export interface TextCanvas {
  font: string;
  measureText(text: string): { width: number };
  fillText(text: string, x: number, y: number): void;
}

function canvasFont(px: number, family: string, weight: number): string {
  return `${weight} ${px.toFixed(2)}px ${family}`;
}

/** Width of the runs set at `px` in `family`. */
export function measureRuns(ctx: TextCanvas, runs: TextRun[], px: number, family: string, weight = 400): number {
  let w = 0;
  for (const r of runs) {
    ctx.font = canvasFont(r.script === 'base' ? px : px * SCRIPT_METRICS.size, family, weight);
    w += ctx.measureText(r.text).width;
  }
  return w;
}

/** Draws the runs with the baseline at y (Canvas 2D, textAlign left); returns the width drawn. */
export function drawRuns(ctx: TextCanvas, runs: TextRun[], x: number, y: number, px: number, family: string, weight = 400): number {
  let cx = x;
  for (const r of runs) {
    const size = r.script === 'base' ? px : px * SCRIPT_METRICS.size;
    ctx.font = canvasFont(size, family, weight);
    const dy = r.script === 'sub' ? SCRIPT_METRICS.subShift * px : r.script === 'sup' ? -SCRIPT_METRICS.supShift * px : 0;
    ctx.fillText(r.text, cx, y + dy);
    cx += ctx.measureText(r.text).width;
  }
  return cx - x;
}
