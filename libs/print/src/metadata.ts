// The figure's metadata sheet: what was computed, how, and the words that go with it (caption, alt text).

import { BOHR_RADIUS_ANGSTROM, L_LETTERS, isRealState, parseOrbitalLabel, prettyLabel, type OrbitalState, type Term } from '@psiform/orbitals';
import type { BundleFileEntry } from './bundle';
import { PSI_UNIT_TEXT, plainLabel } from './typeset';

/** ψ's unit written for plain text (the typeset form is PSI_UNIT_TEXT). */
const PSI_UNIT_PLAIN = plainLabel(PSI_UNIT_TEXT);
import { CONVENTIONS_NOTE } from '@psiform/meshing';

const { abs, round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export const MODEL_NOTE = 'Shapes are those of the one-electron hydrogen-like model; orbitals of many-electron atoms differ.';

/** Used when a summary does not carry the conventions (older mesh assets); the text of @psiform/meshing CONVENTIONS_NOTE. */
const CONVENTIONS = CONVENTIONS_NOTE;

/** The recipe fields the sheet reads (structurally the @psiform/contracts Recipe; extra fields are kept). */
export interface RecipeLike {
  version: number;
  label?: string;
  content: { Z: number; terms: Term[] };
  grid: { n: number | 'auto'; extent?: 'auto' | number };
  surface: { rule: 'enclosed'; fraction: number } | { rule: 'psi'; value: number };
  phase?: { mode: 'auto' | 'sign' | 'argument' };
  canvas?: { widthMm: number; heightMm: number; dpi: number };
  [key: string]: unknown;
}

type SurfaceStatsLike = { vertices: number; triangles: number; area: number; volume?: number; components?: number; euler?: number; watertight?: boolean };

/** A figure warning (@psiform/meshing SurfaceWarning): what the figure cannot show truthfully. */
export interface WarningLike {
  code: string;
  message: string;
  suggestedExtent?: number;
}

/**
 * The mesh summary (@psiform/meshing summariseSurfaces, the mesh job's JSON). Surfaces may carry their statistics
 * flat (the summary) or under `stats`.
 */
export interface MeshResultLike {
  isovalue: number;
  /** Probability inside the surface over all space (or inside an uploaded cube; see enclosedOver). */
  enclosed: number;
  enclosedError?: number;
  /** The part of `enclosed` inside the box, i.e. what the figure draws. */
  enclosedInBox?: number;
  enclosedOver?: string;
  grid: { n: number; extent: number; mode?: 'auto' | 'fixed'; spacing?: number; regions?: { n: number; extent: number }[] };
  surfaces: ({ phase: '+' | '-' | 'complex'; stats?: SurfaceStatsLike | null } & Partial<SurfaceStatsLike>)[];
  warnings?: WarningLike[];
  conventions?: string;
  /** How close the mesh is to the exact surface (@psiform/meshing SurfaceRefinement); absent for uploads. */
  refinement?: { tolerance: number; toleranceFrom: string; maxDeviation: number } | null;
}

export interface FigureMetadataInput {
  recipe: RecipeLike;
  result: MeshResultLike;
  engineVersion: string;
  palette: { positive: string; negative: string; background?: string; swatchbookId?: string | null; [key: string]: unknown };
  /** ISO 8601 time; passed in so the same inputs give the same sheet. */
  generatedAt: string;
}

export interface FigureMetadata {
  format: 'psiform-figure-metadata';
  formatVersion: 1;
  label: string;
  model: { kind: 'one-electron hydrogen-like'; note: string };
  nucleus: { Z: number; name: string };
  terms: { n: number; l: number; m: number; subshell: string; basis: 'complex' | 'real'; coefficient: { re: number; im: number }; label: string }[];
  isRealState: boolean;
  surface: {
    rule: 'enclosed' | 'psi';
    /** Target fraction (enclosed rule) or requested |psi| (psi rule). */
    target: number;
    /** Probability inside the surface over all space (`enclosedOver`), with its estimated error. */
    enclosedAchieved: number;
    enclosedError: number | null;
    enclosedOver: string;
    /** The part drawn inside the box: less than enclosedAchieved when the box cuts the surface. */
    enclosedInBox: number;
    /** |psi| level of the surfaces, a0^-3/2. */
    isovalue: number;
    /** How close the mesh is to the exact surface (a0); null for meshes that were not placed on it (uploads). */
    exactness: { toleranceBohr: number | null; toleranceFrom: string; maxDeviationBohr: number | null } | null;
    phaseColouring: 'sign' | 'argument';
  };
  grid: {
    n: number;
    mode: 'auto' | 'fixed';
    /** Finer cubes for inner radial lobes (automatic grids only). */
    innerGrids: { n: number; extentBohr: number }[];
    requestedExtent: 'auto' | number;
    extentBohr: number;
    extentAngstrom: number;
    spacingBohr: number;
    spacingAngstrom: number;
  };
  surfaces: { phase: '+' | '-' | 'complex'; stats: SurfaceStatsLike | null }[];
  /** Everything the figure cannot show truthfully (also in the caption). Empty when none. */
  warnings: WarningLike[];
  /** Sign conventions (Condon–Shortley, real forms, hybrids, normalisation). */
  conventions: string;
  engineVersion: string;
  palette: FigureMetadataInput['palette'];
  generatedAt: string;
  caption: string;
  /** Short alt text, at most ALT_TEXT_MAX characters (publishers' rule of thumb for screen readers). */
  altText: string;
  /** Long description: the shape in words, the model, the surface rule and the colouring. */
  longDescription: string;
  /** The recipe itself (written to recipe.json in a bundle, not repeated in metadata.json). */
  recipe: RecipeLike;
}

/** Element symbols Z = 1..36 (IUPAC periodic table; written from memory). */
const SYMBOLS = 'H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar K Ca Sc Ti V Cr Mn Fe Co Ni Cu Zn Ga Ge As Se Br Kr'.split(' ');
const SUP: Record<string, string> = { '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** Name of the one-electron ion with nuclear charge Z: H, He⁺, Li²⁺, Be³⁺ ... (generic beyond Kr). */
export function ionName(Z: number): string {
  if (!Number.isInteger(Z) || Z < 1) throw new RangeError(`Z must be a positive integer (got ${String(Z)})`);
  if (Z === 1) return 'H';
  if (Z > SYMBOLS.length) return `hydrogen-like ion, Z = ${Z}`;
  const q = Z - 1;
  return `${SYMBOLS[Z - 1]}${q === 1 ? '' : String(q).replace(/\d/g, (d) => SUP[d])}⁺`;
}

function percent(x: number): string {
  const p = x * 100;
  return `${abs(p - round(p)) < 1e-9 ? round(p) : p.toFixed(1)}%`;
}

function termLabel(t: Term): string {
  return prettyLabel({ ...t, re: 1, im: 0 });
}

/**
 * Plain shape words by l and m for a single real or complex term; generic for superpositions.
 * Written to be honest and simple: the lobe count and nodal surfaces follow from Y_lm alone; radial nodes
 * add inner shells of alternating sign, which an outer isosurface may hide.
 */
export function shapeDescription(state: OrbitalState, label?: string): string {
  const terms = state.terms;
  const radial = (n: number, l: number) => {
    const k = n - l - 1;
    return k === 0 ? '' : ` It has ${k} radial node${k > 1 ? 's' : ''}: inner ${l === 0 ? 'shell' : 'lobe'}${k > 1 ? 's' : ''} of alternating sign lie inside the outer surface and may be hidden by it.`;
  };
  if (terms.length === 1) {
    const t = terms[0];
    const lab = termLabel(t);
    const suffix = lab.includes('_') ? lab.split('_')[1] : '';
    if (t.l === 0) return `A single roughly spherical cloud centred on the nucleus, one sign throughout its outer part.${radial(t.n, t.l)}`;
    if (t.basis === 'complex' && t.m !== 0) {
      return `A ring-shaped (doughnut-like) surface of |ψ| around the z axis, coloured by the phase of ψ, which turns ${abs(t.m)} time${abs(t.m) > 1 ? 's' : ''} round the axis.${radial(t.n, t.l)}`;
    }
    if (t.l === 1) {
      const ax = suffix || 'z';
      const others = ['x', 'y', 'z'].filter((a) => a !== ax).join('');
      return `Two lobes of opposite sign along the ${ax} axis, meeting at the nucleus and separated by the nodal ${others} plane.${radial(t.n, t.l)}`;
    }
    if (t.l === 2) {
      if (t.m === 0) return `Two lobes of the same sign along the z axis with a ring (torus) of opposite sign around the nucleus in the xy plane; two cone-shaped nodal surfaces separate them.${radial(t.n, t.l)}`;
      const planeOf: Record<string, string> = { xy: 'xy', xz: 'xz', yz: 'yz', 'x²−y²': 'xy' };
      const p = planeOf[suffix] ?? 'a coordinate';
      const where = suffix === 'x²−y²' ? 'pointing along the x and y axes' : `pointing between the ${p[0]} and ${p[1]} axes`;
      return `Four-lobed cloverleaf in the ${p} plane, lobes ${where} and alternating in sign, separated by two nodal planes.${radial(t.n, t.l)}`;
    }
    if (t.l === 3) return `An f-orbital shape: several lobes alternating in sign, separated by three angular nodal surfaces (planes or cones).${radial(t.n, t.l)}`;
    return `Lobes alternating in sign, separated by ${t.l} angular nodal surfaces.${radial(t.n, t.l)}`;
  }
  if (label && /^\d*sp[0-9³²d]*/i.test(label.trim())) return 'A hybrid: one large lobe pointing away from the nucleus and a small lobe of opposite sign behind it.';
  const ls = [...new Set(terms.map((t) => `${t.n}${L_LETTERS[t.l]}`))].join(', ');
  return `A superposition of ${terms.length} terms (${ls}); its lobes follow from the coefficients and do not match a single textbook shape.`;
}

/** Publishers ask for alt text of at most 125 characters plus a long description (common practice in their author guides). */
export const ALT_TEXT_MAX = 125;

/** A few words for the shape, for the short alt text. */
export function shortShape(state: OrbitalState, label?: string): string {
  const ts = state.terms;
  if (ts.length === 1) {
    const t = ts[0];
    const suffix = plainLabel(termLabel(t)).slice(String(t.n).length + 1);
    if (t.l === 0) return 'a round cloud around the nucleus';
    if (t.basis === 'complex' && t.m !== 0) return 'a ring around the z axis, coloured by phase';
    if (t.l === 1) return `two lobes of opposite sign along ${suffix || 'z'}`;
    if (t.l === 2 && t.m === 0) return 'two lobes along z with a ring around the middle';
    if (t.l === 2) return `a four-lobed cloverleaf (${suffix})`;
    return 'lobes of alternating sign';
  }
  if (label && /^\d*sp[0-9³²d]*/i.test(label.trim())) return 'one large lobe and a small opposite lobe';
  return `a superposition of ${ts.length} terms`;
}

/** The short alt text (≤ ALT_TEXT_MAX characters): what the picture shows, then the state. */
export function shortAltText(state: OrbitalState, label: string, Z: number): string {
  const what = plainLabel(label);
  const full = `3D isosurface of the ${what} ${state.terms.length === 1 ? 'orbital' : 'state'}${Z > 1 ? ` of ${ionName(Z)}` : ''}: ${shortShape(state, label)}.`;
  if (full.length <= ALT_TEXT_MAX) return full;
  const bare = `3D isosurface: ${shortShape(state, label)}.`;
  return bare.length <= ALT_TEXT_MAX ? bare : `${bare.slice(0, ALT_TEXT_MAX - 1)}…`;
}

/**
 * The name a figure prints and states (overlay label, metadata, alt text, the Studio): the recipe's label when it is
 * free text ("Plate 4, left"); when it is an orbital name the engine reads ('4fz3', '3d_z2', 'sp3#1'), the engine's own
 * name of the state the figure actually draws (prettyLabel: '4f_z³'), so a typed key never prints raw and a label that
 * no longer matches the terms never prints at all; with no label, the state's name (or 'superposition').
 */
export function displayLabel(recipe: { label?: string | null; content: { Z: number; terms: readonly Term[] } }): string {
  const state: OrbitalState = { Z: recipe.content.Z, terms: recipe.content.terms.map((t) => ({ ...t, im: t.im ?? 0 })) };
  const own = (): string | null => {
    try {
      return prettyLabel(state);
    } catch {
      return null;
    }
  };
  const label = recipe.label?.trim();
  if (label) {
    try {
      parseOrbitalLabel(label);
    } catch {
      return label; // free text, printed as written
    }
    return own() ?? label;
  }
  return own() ?? 'superposition';
}

export function figureMetadata(input: FigureMetadataInput): FigureMetadata {
  const { recipe, result, engineVersion, palette, generatedAt } = input;
  if (!recipe || typeof recipe !== 'object' || !recipe.content) throw new RangeError('recipe must be a figure recipe with content, grid and surface');
  if (!result || typeof result !== 'object' || !result.grid) throw new RangeError('result must hold isovalue, enclosed, grid and surfaces');
  if (typeof engineVersion !== 'string' || !engineVersion) throw new RangeError('engineVersion must be a non-empty string');
  if (typeof generatedAt !== 'string' || Number.isNaN(Date.parse(generatedAt))) throw new RangeError(`generatedAt must be an ISO 8601 date-time (got ${JSON.stringify(generatedAt)})`);
  const { Z, terms } = recipe.content;
  const state: OrbitalState = { Z, terms };
  const label = displayLabel(recipe);
  const real = isRealState(state);
  const mode = recipe.phase?.mode ?? 'auto';
  const phaseColouring: 'sign' | 'argument' = mode === 'auto' ? (real ? 'sign' : 'argument') : mode;
  const { n, extent } = result.grid;
  const spacing = (2 * extent) / (n - 1);
  const single = terms.length === 1;
  const plain = plainLabel(label);
  const what = single ? `${plain} orbital` : `state ${plain}`;
  const over = result.enclosedOver ?? 'all space';
  const overText = over === 'all space' ? 'over all space' : over;
  const inBox = result.enclosedInBox ?? result.enclosed;
  const warnings = result.warnings ?? [];
  const cut = warnings.find((w) => w.code === 'box-cuts-surface');
  const ruleText =
    recipe.surface.rule === 'enclosed'
      ? `enclosing ${percent(round(result.enclosed * 1000) / 1000)} of the probability ${overText}`
      : `at |ψ| = ${recipe.surface.value.toPrecision(3)} ${PSI_UNIT_PLAIN} (enclosing ${percent(round(result.enclosed * 1000) / 1000)} of the probability ${overText})`;
  const colourText = phaseColouring === 'sign' ? (real ? 'lobes coloured by the sign of ψ' : 'coloured by the sign of Re ψ') : 'coloured by the phase of ψ';
  const inner = (result.grid.regions ?? []).slice(1);
  const gridText = `Computed on a ${n}³ grid${inner.length ? ` (inner lobes on finer grids: ${inner.map((r) => `${r.n}³ over ±${g(r.extent, 3)} a₀`).join(', ')})` : ''}.`;
  const cutText = cut ? ` The box cuts the surface open: the part shown encloses ${percent(round(inBox * 1000) / 1000)}.` : '';
  const gridWarn = warnings.some((w) => w.code === 'feature-unresolved' || w.code === 'topology-mismatch' || w.code === 'topology-unverified')
    ? ' The grid is too coarse for some details of this surface (see the warnings).'
    : '';
  const caption = `Isosurface of the hydrogen-like ${what} (Z = ${Z}) ${ruleText}; ${colourText}. ${gridText}${cutText}${gridWarn}`;
  const altText = shortAltText(state, label, Z);
  const longDescription = `${shapeDescription(state, label)} ${caption} ${MODEL_NOTE}`;
  return {
    format: 'psiform-figure-metadata',
    formatVersion: 1,
    label,
    model: { kind: 'one-electron hydrogen-like', note: MODEL_NOTE },
    nucleus: { Z, name: ionName(Z) },
    terms: terms.map((t) => ({ n: t.n, l: t.l, m: t.m, subshell: `${t.n}${L_LETTERS[t.l]}`, basis: t.basis, coefficient: { re: t.re, im: t.im }, label: termLabel(t) })),
    isRealState: real,
    surface: {
      rule: recipe.surface.rule,
      target: recipe.surface.rule === 'enclosed' ? recipe.surface.fraction : recipe.surface.value,
      enclosedAchieved: result.enclosed,
      enclosedError: Number.isFinite(result.enclosedError) ? (result.enclosedError as number) : null,
      enclosedOver: over,
      enclosedInBox: inBox,
      isovalue: result.isovalue,
      phaseColouring,
      // Vertices lie on the exact level set; chords within maxDeviationBohr of it (null: not refined, e.g. uploads).
      exactness: result.refinement
        ? { toleranceBohr: Number.isFinite(result.refinement.tolerance) ? result.refinement.tolerance : null, toleranceFrom: result.refinement.toleranceFrom, maxDeviationBohr: Number.isFinite(result.refinement.maxDeviation) ? result.refinement.maxDeviation : null }
        : null,
    },
    grid: {
      n,
      mode: result.grid.mode ?? (recipe.grid.n === 'auto' ? 'auto' : 'fixed'),
      innerGrids: inner.map((r) => ({ n: r.n, extentBohr: r.extent })),
      requestedExtent: recipe.grid.extent ?? 'auto',
      extentBohr: extent,
      extentAngstrom: extent * BOHR_RADIUS_ANGSTROM,
      spacingBohr: spacing,
      spacingAngstrom: spacing * BOHR_RADIUS_ANGSTROM,
    },
    surfaces: result.surfaces.map((s) => ({ phase: s.phase, stats: s.stats ?? (typeof s.triangles === 'number' ? (({ phase: _p, stats: _s, ...flat }) => flat as SurfaceStatsLike)(s) : null) })),
    warnings,
    conventions: result.conventions ?? CONVENTIONS,
    engineVersion,
    palette,
    generatedAt,
    caption,
    altText,
    longDescription,
    recipe,
  };
}

function g(x: number, digits = 4): string {
  return Number(x.toPrecision(digits)).toString();
}

function bytesText(n: number): string {
  return n < 1024 ? `${n} B` : n < 1024 * 1024 ? `${(n / 1024).toFixed(1)} KiB` : `${(n / 1024 / 1024).toFixed(2)} MiB`;
}

/** One line per file: what it is, as read from its bytes (see buildBundle). */
export function fileLine(f: BundleFileEntry): string {
  const parts = [f.format.toUpperCase()];
  if (f.widthPx !== undefined && f.heightPx !== undefined) parts.push(`${f.widthPx} × ${f.heightPx} px`);
  if (f.widthMm !== undefined && f.heightMm !== undefined) parts.push(`${g(f.widthMm)} × ${g(f.heightMm)} mm${f.dpi ? ` at ${f.dpi} dpi` : ''}`);
  if (f.colourSpace) parts.push(f.colourSpace);
  if (f.pages) parts.push(`${f.pages} page${f.pages === 1 ? '' : 's'}`);
  parts.push(bytesText(f.bytes), `sha256 ${f.sha256}`);
  return `- ${f.name}${f.role ? ` (${f.role})` : ''}: ${parts.join(', ')}`;
}

/** Readable sheet (Markdown that reads fine as plain text) for README.txt in a bundle; `files` as buildBundle describes them. */
export function metadataSheetText(meta: FigureMetadata, files: BundleFileEntry[] = []): string {
  const L: string[] = [];
  L.push(`# Figure: ${plainLabel(meta.label)}`, '');
  L.push(`Caption: ${meta.caption}`, '');
  L.push(`Alt text (short): ${meta.altText}`, '');
  L.push(`Long description: ${meta.longDescription}`, '');
  if (files.length) {
    L.push('## Files', '', 'Sizes, resolution and colour space are read from each file itself.', '');
    for (const f of files) L.push(fileLine(f));
    L.push('');
  }
  L.push('## Model', '', `- ${meta.model.kind} (nuclear charge Z = ${meta.nucleus.Z}, ${meta.nucleus.name})`, `- ${meta.model.note}`, '');
  L.push('## Terms', '');
  for (const t of meta.terms) L.push(`- ${plainLabel(t.label)}: n = ${t.n}, l = ${t.l}, m = ${t.m} (${t.basis} basis), coefficient ${g(t.coefficient.re)}${t.coefficient.im ? ` ${t.coefficient.im < 0 ? '−' : '+'} ${g(abs(t.coefficient.im))}i` : ''}`);
  L.push('', '## Surface', '');
  const s = meta.surface;
  L.push(s.rule === 'enclosed' ? `- Rule: enclose ${g(s.target * 100)}% of the probability` : `- Rule: |ψ| = ${g(s.target)} ${PSI_UNIT_PLAIN}`);
  L.push(
    `- Enclosed ${s.enclosedOver === 'all space' ? 'over all space' : s.enclosedOver}: ${(s.enclosedAchieved * 100).toFixed(2)}%${s.enclosedError !== null ? ` (± ${(s.enclosedError * 100).toPrecision(2)}%)` : ''}`,
    ...(s.enclosedInBox < s.enclosedAchieved ? [`- Drawn inside the box: ${(s.enclosedInBox * 100).toFixed(2)}% (the box cuts the surface)`] : []),
    `- Isovalue |ψ|: ${g(s.isovalue)} ${PSI_UNIT_PLAIN}`, `- Colouring: ${s.phaseColouring === 'sign' ? 'sign of ψ' : 'phase (argument) of ψ'}`);
  for (const x of meta.surfaces) if (x.stats) L.push(`- Surface ${x.phase}: ${x.stats.triangles} triangles, area ${g(x.stats.area)} a₀²`);
  const ex = s.exactness;
  if (ex) L.push(`- Mesh vertices on the exact surface; chords and triangle centres within ${ex.maxDeviationBohr !== null ? `${g(ex.maxDeviationBohr)} a₀` : 'an unmeasured distance'} of it${ex.toleranceBohr !== null ? ` (tolerance ${g(ex.toleranceBohr)} a₀, ${ex.toleranceFrom})` : ''}`);
  L.push('', '## Grid', '');
  const gr = meta.grid;
  L.push(`- ${gr.n}³ points; extent ±${g(gr.extentBohr)} a₀ (±${g(gr.extentAngstrom)} Å)${gr.requestedExtent === 'auto' ? ', chosen automatically' : ''}`);
  L.push(`- Spacing ${g(gr.spacingBohr)} a₀ (${g(gr.spacingAngstrom)} Å)${gr.mode === 'auto' ? '; chosen by the engine to resolve the surface' : ''}`);
  for (const r of gr.innerGrids) L.push(`- Inner radial lobes: ${r.n}³ points over ±${g(r.extentBohr)} a₀`);
  L.push('', '## Warnings', '');
  if (meta.warnings.length === 0) L.push('- None: the box holds the whole surface and the grid resolves its details.');
  for (const w of meta.warnings) L.push(`- ${w.message}`);
  L.push('', '## Conventions', '', `- ${meta.conventions}`);
  L.push('', '## Palette', '');
  for (const [k, v] of Object.entries(meta.palette)) if (v !== undefined && v !== null) L.push(`- ${k}: ${String(v)}`);
  L.push('', '## Provenance', '', `- Engine version ${meta.engineVersion}`, `- Generated ${meta.generatedAt}`, '- recipe.json in this bundle reproduces the figure with the same engine version.', '');
  return L.join('\n');
}
