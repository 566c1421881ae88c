import type { Recipe, RecipeTerm } from '@psiform/contracts';
import { prettyLabel } from '@psiform/orbitals';

const { abs } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/**
 * What changed between two versions of a figure, in words an editor reads ("key light 2.2 → 2.7; surface 90% →
 * 95%"). Both recipes are the parsed documents (defaults filled), so a field left out and its default compare equal.
 * Every changed leaf of the recipe is reported: the known ones with our words and units, any other by its path.
 */
export interface RecipeChange {
  /** Dotted path of the field (or group, e.g. "canvas.size"). */
  path: string;
  /** What it is, in words: "key light", "surface". */
  what: string;
  from: string;
  to: string;
}

const num = (v: number) => String(Number(v.toFixed(3)));
const pct = (v: number) => `${Number((v * 100).toFixed(2))}%`;
const deg = (v: number) => `${num(v)}°`;
const onOff = (v: unknown) => (v ? 'on' : 'off');
const shown = (v: unknown) => (v ? 'shown' : 'hidden');
const VIEWS: Record<string, string> = { axis_x: 'along x', axis_y: 'along y', axis_z: 'along z', three_quarter: 'three-quarter', free: 'free' };
const UNITS: Record<string, string> = { angstrom: 'Å', bohr: 'a₀' };
const LIGHTS = { key: 'key light', fill: 'fill light', rim: 'rim light' } as const;

type Fmt = (v: unknown) => string;
const F = { num: (v: unknown) => num(v as number), deg: (v: unknown) => deg(v as number), text: (v: unknown) => (v === undefined || v === null || v === '' ? '—' : String(v)) } satisfies Record<string, Fmt>;

/** Words and formats of the recipe's leaves (paths with defaults filled, see libs/contracts recipe.ts). */
const WORDS: Record<string, [string, Fmt]> = {
  label: ['label', F.text],
  'content.Z': ['Z', F.num],
  'grid.n': ['grid', (v) => `${v}³`],
  'grid.extent': ['box half-width', (v) => (v === 'auto' ? 'auto' : `${num(v as number)} a₀`)],
  'phase.mode': ['phase colouring', F.text],
  'palette.swatchbookId': ['swatchbook', (v) => (v ? 'a swatchbook' : 'none')],
  'palette.positive': ['positive phase colour', F.text],
  'palette.negative': ['negative phase colour', F.text],
  'stage.lights.ambient': ['ambient light', F.num],
  'stage.material.gloss': ['gloss', F.num],
  'stage.material.opacity': ['opacity', (v) => pct(v as number)],
  'stage.material.nodalOutline': ['nodal outline', onOff],
  'stage.background.color': ['background', F.text],
  'stage.background.transparent': ['transparent background', onOff],
  'stage.camera.view': ['view', (v) => VIEWS[v as string] ?? String(v)],
  'stage.camera.projection': ['projection', F.text],
  'stage.camera.fovDeg': ['field of view', F.deg],
  'stage.camera.zoom': ['zoom', F.num],
  'annotations.axes': ['axes', shown],
  'annotations.nucleus': ['nucleus', shown],
  'annotations.scaleBar.show': ['scale bar', shown],
  'annotations.scaleBar.unit': ['scale-bar unit', (v) => UNITS[v as string] ?? String(v)],
  'annotations.scaleBar.length': ['scale-bar length', (v) => (v === undefined ? 'automatic' : num(v as number))],
  'annotations.label.show': ['label on the figure', shown],
  'annotations.label.text': ['label text', F.text],
  'annotations.caption': ['caption', (v) => (v ? `“${String(v).length > 40 ? `${String(v).slice(0, 39)}…` : v}”` : '—')],
  'canvas.dpi': ['resolution', (v) => `${v} dpi`],
};
for (const [k, name] of Object.entries(LIGHTS)) {
  WORDS[`stage.lights.${k}.intensity`] = [name, F.num];
  WORDS[`stage.lights.${k}.color`] = [`${name} colour`, F.text];
  WORDS[`stage.lights.${k}.azimuthDeg`] = [`${name} azimuth`, F.deg];
  WORDS[`stage.lights.${k}.elevationDeg`] = [`${name} elevation`, F.deg];
}

/** Paths compared as one value (their parts are reported together). */
const GROUPS = ['content.terms', 'surface', 'source', 'stage.camera.position', 'stage.camera.target'];

/** The state by its label when the recipe has one (3d_z², sp³ #2), else from its terms. */
function stateWords(r: Recipe): string {
  try {
    return r.label ? prettyLabel(r.label) : prettyLabel({ Z: r.content.Z, terms: r.content.terms });
  } catch {
    return r.label ?? r.content.terms.map(termWords).join(' + ');
  }
}

function termWords(t: RecipeTerm): string {
  try {
    return prettyLabel({ n: t.n, l: t.l, m: t.m, basis: t.basis, re: 1, im: 0 });
  } catch {
    return `(${t.n}, ${t.l}, ${t.m})`;
  }
}

function coeffWords(t: RecipeTerm): string {
  return t.im === 0 ? num(t.re) : `${num(t.re)}${t.im < 0 ? '−' : '+'}${num(abs(t.im))}i`;
}

function surfaceWords(s: Recipe['surface']): string {
  return s.rule === 'enclosed' ? pct(s.fraction) : `|ψ| = ${num(s.value)} a₀⁻³ᐟ²`;
}

const vec = (v: unknown) => (Array.isArray(v) ? `(${v.map((x) => num(x as number)).join(', ')}) a₀` : 'automatic');

function leaves(value: unknown, prefix: string, out: Map<string, unknown>): void {
  if (GROUPS.includes(prefix) || value === null || typeof value !== 'object' || Array.isArray(value)) {
    out.set(prefix, value);
    return;
  }
  for (const [k, v] of Object.entries(value as Record<string, unknown>)) leaves(v, prefix ? `${prefix}.${k}` : k, out);
}

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

export function recipeChanges(a: Recipe, b: Recipe): RecipeChange[] {
  const la = new Map<string, unknown>();
  const lb = new Map<string, unknown>();
  leaves(a, '', la);
  leaves(b, '', lb);
  const paths = [...new Set([...la.keys(), ...lb.keys()])].filter((p) => p !== 'version' && !same(la.get(p), lb.get(p)));
  const out: RecipeChange[] = [];
  const push = (path: string, what: string, from: string, to: string) => out.push({ path, what, from, to });

  for (const p of paths) {
    // A new label comes with new terms; the state line already names both.
    if (p === 'label' && paths.includes('content.terms')) continue;
    const va = la.get(p);
    const vb = lb.get(p);
    if (p === 'content.terms') {
      const ta = a.content.terms;
      const tb = b.content.terms;
      const sameStates = ta.length === tb.length && ta.every((t, i) => t.n === tb[i].n && t.l === tb[i].l && t.m === tb[i].m && t.basis === tb[i].basis);
      if (sameStates) {
        ta.forEach((t, i) => {
          if (t.re !== tb[i].re || t.im !== tb[i].im) push(`content.terms.${i}`, `coefficient of ${termWords(t)}`, coeffWords(t), coeffWords(tb[i]));
        });
      } else {
        push('content.terms', 'state', stateWords(a), stateWords(b));
      }
    } else if (p === 'surface') {
      push('surface', 'surface', surfaceWords(a.surface), surfaceWords(b.surface));
    } else if (p === 'source') {
      push('source', 'source', a.source?.kind ?? 'computed', b.source?.kind ?? 'computed');
    } else if (p === 'stage.camera.position' || p === 'stage.camera.target') {
      push(p, p.endsWith('position') ? 'camera position' : 'camera target', vec(va), vec(vb));
    } else if (p === 'canvas.widthMm' || p === 'canvas.heightMm') {
      if (!out.some((c) => c.path === 'canvas.size')) push('canvas.size', 'print size', `${num(a.canvas.widthMm)} × ${num(a.canvas.heightMm)} mm`, `${num(b.canvas.widthMm)} × ${num(b.canvas.heightMm)} mm`);
    } else if (WORDS[p]) {
      const [what, fmt] = WORDS[p];
      push(p, what, fmt(va), fmt(vb));
    } else {
      push(p, p, JSON.stringify(va) ?? '—', JSON.stringify(vb) ?? '—');
    }
  }
  // The figure's content first, then its look, then the page: the order an editor checks them in.
  const rank = (c: RecipeChange) => ['label', 'content', 'source', 'surface', 'grid', 'phase', 'palette', 'stage.lights', 'stage.material', 'stage.background', 'stage.camera', 'annotations', 'canvas'].findIndex((k) => c.path.startsWith(k));
  return out.map((c, i) => ({ c, i, r: rank(c) < 0 ? 99 : rank(c) })).sort((x, y) => x.r - y.r || x.i - y.i).map(({ c }) => c);
}

/** One line: "key light 2.2 → 2.7; surface 90% → 95%" (or "no change to the recipe"). */
export function describeRecipeChanges(changes: RecipeChange[]): string {
  if (changes.length === 0) return 'no change to the recipe';
  return changes.map((c) => `${c.what} ${c.from} → ${c.to}`).join('; ');
}
