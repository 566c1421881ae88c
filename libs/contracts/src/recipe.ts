import { z } from 'zod';
import { N_MAX, quantumNumberIssues } from './quantum';
import { fractionProblem, gridProblem, HEX_COLOUR, HEX_COLOUR_MESSAGE, isovalueProblem, mmProblem, RECIPE_LIMITS, TEXT_LIMITS, textProblem, zProblem } from './limits';

/** The API's message for a limit: the field, then the very words the client shows (limits.ts). */
const says = (field: string, problem: (v: unknown) => string | null) => (iss: { input?: unknown }) => `${field} ${problem(iss.input) ?? 'is not valid'}`;

/**
 * The figure recipe: one versioned JSON document that fully describes a figure's content and look
 * (see ../shared/architecture.md, "The recipe"). The same recipe and engine version give the same meshes.
 *
 * Upgrade path: every stored recipe carries `version`. `upgradeRecipe` lifts older documents to
 * RECIPE_VERSION step by step before validation, so old figures keep opening.
 */
export const RECIPE_VERSION = 1;

/**
 * The sign conventions and the normalisation rule every figure follows, in one text: the CLI help, the API docs,
 * every mesh summary and the metadata sheet quote it (@psiform/meshing CONVENTIONS_NOTE is this constant).
 */
/**
 * The sign conventions and the normalisation rule, one sentence per line: THE text the API docs, the recipe schema,
 * exported metadata (ENGINE_CONVENTIONS) and the CLI's help (its lines, wrapped) all quote.
 */
export const ENGINE_CONVENTION_LINES = [
  'Y_lm carry the Condon–Shortley phase (-1)^m (as SciPy sph_harm); R_nl > 0 near the nucleus.',
  'Real forms: m > 0 is the cos type, Y^c = [(-1)^m Y_lm + Y_l,-m]/sqrt2; m < 0 the sin type, Y^s = -i[(-1)^m Y_l|m| - Y_l,-|m|]/sqrt2, so p_x, d_xz ... point along +x.',
  'Hybrids: textbook coefficients with each term multiplied by (-1)^(n-l-1), so the large lobe is positive and points along the named direction.',
  'Coefficients are relative: the engine scales them once so that sum |c|^2 = 1 over the orthonormal (complex Y_lm) expansion.',
] as const;

export const ENGINE_CONVENTIONS = ENGINE_CONVENTION_LINES.join(' ');

/**
 * Starting values of a new figure, the same in the Composer, its presets, the figure-set shell and the CLI's help:
 * the engine's own grid ('auto', the state-aware resolution that resolves the smallest feature) and 90 %.
 */
export const RECIPE_DEFAULTS = { gridN: 'auto', fraction: 0.9 } as const;

const finite = (what: string) =>
  z.number({ error: `${what} must be a number` }).refine(Number.isFinite, { message: `${what} must be a finite number` });

const hexColor = z.string().regex(HEX_COLOUR, { message: HEX_COLOUR_MESSAGE });

/**
 * Psiform's own default colours, from the brand: the phases of the "Verdigris and Ochre" swatchbook
 * (assets/palettes/verdigris-and-ochre.json; the verdigris is the brand accent #1f5e5b) for ψ > 0 and ψ < 0 —
 * not the red/blue pair most tools and textbooks use. They pass our swatchbook checks (libs/colour
 * checkSwatchbook: ΔE00 between the phases ≥ 20 for normal vision and every simulated dichromacy, contrast ≥ 3:1
 * on the default, white and paper backgrounds; libs/colour/test/default-palette.test.ts, which also keeps this
 * constant equal to the preset file). New swatchbooks start from them too.
 */
export const PSIFORM_PALETTE = {
  positive: '#1f5e5b',
  negative: '#a86a1c',
  background: '#fbfaf7',
  label: '#1f1d1a',
} as const;

export const termSchema = z
  .strictObject({
    // The rule on n, l, m (ranges and relations) is quantum.ts's, checked below with its one wording.
    n: z.number({ error: 'n must be a number' }).describe(`principal quantum number: an integer, 1 ≤ n ≤ ${N_MAX}`),
    l: z.number({ error: 'l must be a number' }).describe('angular momentum quantum number: an integer, 0 ≤ l < n'),
    m: z.number({ error: 'm must be a number' }).describe('magnetic quantum number: an integer, |m| ≤ l'),
    /** 'complex': Y_lm with the Condon–Shortley phase; 'real': the chemists' real combination (m>0 cos-type, m<0 sin-type). */
    basis: z.enum(['complex', 'real']).describe("'complex': Y_lm with the Condon–Shortley phase; 'real': the real form (m > 0 cos type, m < 0 sin type, (-1)^m as in ENGINE_CONVENTIONS)."),
    /**
     * Complex coefficient c_k of this term in Σ c_k ψ_k. Coefficients are relative weights: the engine applies ONE
     * normalisation rule, once (@psiform/orbitals compileState): it scales them so that Σ|c|² = 1 over the
     * orthonormal expansion in complex Y_lm (a real form is (Y_lm ± Y_l,-m)/√2, so real forms and complex
     * eigenstates are each already normalised). Two real 2p terms with coefficient 1 therefore mean 1/√2 each.
     * Every level, density, NRRD value and enclosed fraction refers to the normalised state.
     */
    re: finite('re').describe('Real part of the relative coefficient; the engine normalises once so that sum |c|^2 = 1 over the orthonormal complex-Y_lm expansion.'),
    im: finite('im').default(0),
  })
  .superRefine((t, ctx) => {
    for (const issue of quantumNumberIssues(t)) ctx.addIssue({ code: 'custom', path: [issue.field], message: issue.message });
  });

export const surfaceSchema = z.discriminatedUnion('rule', [
  z.strictObject({
    rule: z.literal('enclosed'),
    /** Fraction of the probability the surface encloses, in (0, 1). */
    fraction: z.number({ error: says('fraction', fractionProblem) }).refine((f) => fractionProblem(f) === null, { error: says('fraction', fractionProblem) }),
  }),
  z.strictObject({
    rule: z.literal('psi'),
    /** Absolute value c of the isosurfaces ψ = ±c (|ψ| = c for complex states), in a0^(-3/2). */
    value: z.number({ error: says('value', isovalueProblem) }).refine((v) => isovalueProblem(v) === null, { error: says('value', isovalueProblem) }),
  }),
]);

export const cameraSchema = z.strictObject({
  view: z.enum(['axis_x', 'axis_y', 'axis_z', 'three_quarter', 'free']).default('three_quarter'),
  projection: z.enum(['perspective', 'orthographic']).default('perspective'),
  /** Free-orbit position and target in a0, kept when view is 'free'. */
  position: z.tuple([finite('x'), finite('y'), finite('z')]).optional(),
  target: z.tuple([finite('x'), finite('y'), finite('z')]).default([0, 0, 0]),
  fovDeg: finite('fovDeg').refine((v) => v >= 5 && v <= 120, { message: 'fovDeg must be 5..120' }).default(35),
  zoom: finite('zoom').refine((v) => v > 0, { message: 'zoom must be positive' }).default(1),
});

const lightSchema = z.strictObject({
  intensity: finite('intensity').refine((v) => v >= 0 && v <= 20, { message: 'intensity must be 0..20' }),
  color: hexColor,
  /** Direction the light comes from, as azimuth/elevation in degrees. */
  azimuthDeg: finite('azimuthDeg').default(0),
  elevationDeg: finite('elevationDeg').default(30),
});

export const stageSchema = z.strictObject({
  camera: cameraSchema.default({ view: 'three_quarter', projection: 'perspective', target: [0, 0, 0], fovDeg: 35, zoom: 1 }),
  lights: z
    .strictObject({
      key: lightSchema.default({ intensity: 2.2, color: '#fff8ef', azimuthDeg: 35, elevationDeg: 40 }),
      fill: lightSchema.default({ intensity: 0.8, color: '#eef3ff', azimuthDeg: -60, elevationDeg: 10 }),
      rim: lightSchema.default({ intensity: 1.0, color: '#ffffff', azimuthDeg: 180, elevationDeg: 25 }),
      ambient: finite('ambient').refine((v) => v >= 0 && v <= 5, { message: 'ambient must be 0..5' }).default(0.35),
    })
    .default({
      key: { intensity: 2.2, color: '#fff8ef', azimuthDeg: 35, elevationDeg: 40 },
      fill: { intensity: 0.8, color: '#eef3ff', azimuthDeg: -60, elevationDeg: 10 },
      rim: { intensity: 1.0, color: '#ffffff', azimuthDeg: 180, elevationDeg: 25 },
      ambient: 0.35,
    }),
  material: z
    .strictObject({
      gloss: finite('gloss').refine((v) => v >= 0 && v <= 1, { message: 'gloss must be 0..1' }).default(0.45),
      opacity: finite('opacity').refine((v) => v > 0 && v <= 1, { message: 'opacity must be in (0, 1]' }).default(1),
      nodalOutline: z.boolean().default(false),
    })
    .default({ gloss: 0.45, opacity: 1, nodalOutline: false }),
  background: z
    .strictObject({ transparent: z.boolean().default(false), color: hexColor.default(PSIFORM_PALETTE.background) })
    .default({ transparent: false, color: PSIFORM_PALETTE.background }),
});

export const annotationsSchema = z.strictObject({
  axes: z.boolean().default(false),
  scaleBar: z
    .strictObject({ show: z.boolean().default(true), unit: z.enum(['angstrom', 'bohr']).default('angstrom'), length: finite('length').refine((v) => v > 0, { message: 'length must be positive' }).optional() })
    .default({ show: true, unit: 'angstrom' }),
  nucleus: z.boolean().default(true),
  label: z.strictObject({ show: z.boolean().default(true), text: z.string().max(TEXT_LIMITS.labelMax, { error: says('label', (v) => textProblem(v, TEXT_LIMITS.labelMax)) }).optional() }).default({ show: true }),
  caption: z.string().max(TEXT_LIMITS.captionMax, { error: says('caption', (v) => textProblem(v, TEXT_LIMITS.captionMax)) }).optional(),
});

export const canvasSchema = z.strictObject({
  widthMm: z.number({ error: says('widthMm', mmProblem) }).refine((v) => mmProblem(v) === null, { error: says('widthMm', mmProblem) }),
  heightMm: z.number({ error: says('heightMm', mmProblem) }).refine((v) => mmProblem(v) === null, { error: says('heightMm', mmProblem) }),
  dpi: z.union([z.literal(300), z.literal(600), z.literal(1200)], { error: 'dpi must be 300, 600 or 1200' }),
});

export const paletteSchema = z.strictObject({
  /** Swatchbook the colours come from; null means Psiform's own default (PSIFORM_PALETTE). */
  swatchbookId: z.string().nullable().default(null),
  positive: hexColor.default(PSIFORM_PALETTE.positive),
  negative: hexColor.default(PSIFORM_PALETTE.negative),
  /** The swatchbook's phase wheel for arg ψ (OKLCH lightness and chroma); absent = the default wheel (@psiform/colour). */
  wheel: z
    .strictObject({
      lightness: finite('wheel.lightness').refine((v) => v > 0 && v < 1, { message: 'wheel.lightness must be between 0 and 1 (OKLCH L)' }),
      chroma: finite('wheel.chroma').refine((v) => v >= 0 && v <= 0.4, { message: 'wheel.chroma must be from 0 to 0.4 (OKLCH C)' }),
    })
    .optional(),
});

/** Upload limits (issue: figures become jobs): each axis of an uploaded cube has 2..512 points. */
export const UPLOAD_LIMITS = { sizeMin: 2, sizeMax: 512 } as const;

const axisSize = z
  .number()
  .int({ message: 'size must be an integer' })
  .min(UPLOAD_LIMITS.sizeMin, { message: `size must be at least ${UPLOAD_LIMITS.sizeMin}` })
  .max(UPLOAD_LIMITS.sizeMax, { message: `size must be at most ${UPLOAD_LIMITS.sizeMax}` });
const positive = (what: string) => finite(what).refine((v) => v > 0, { message: `${what} must be positive` });

/**
 * Where the sampled field comes from. Absent or 'computed': the engine samples content.terms on the grid.
 * 'upload': a float32 cube stored as an NRRD asset (x fastest); content.terms and grid.n are then not used
 * for sampling. quantity 'psi' keeps the sign (two phases); 'density' is |psi|² (one surface, phase '+').
 */
export const recipeSourceSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('computed') }),
  z.strictObject({
    kind: z.literal('upload'),
    assetId: z.string().uuid({ message: 'assetId must be a UUID' }),
    sha256: z.string().regex(/^[0-9a-f]{64}$/, { message: 'sha256 must be 64 lower-case hex digits' }),
    sizes: z.tuple([axisSize, axisSize, axisSize]),
    spacing: z.tuple([positive('dx'), positive('dy'), positive('dz')]),
    origin: z.tuple([finite('x'), finite('y'), finite('z')]),
    quantity: z.enum(['psi', 'density']),
  }),
]);
export type RecipeSource = z.infer<typeof recipeSourceSchema>;

export const recipeSchema = z.strictObject({
  version: z.literal(RECIPE_VERSION, { error: `version must be ${RECIPE_VERSION}` }),
  /** Display label such as "3d_xy" or "sp3 #1"; informative only, the terms are authoritative. */
  label: z.string().max(TEXT_LIMITS.labelMax, { error: says('label', (v) => textProblem(v, TEXT_LIMITS.labelMax)) }).optional(),
  content: z.strictObject({
    Z: z.number({ error: says('Z', zProblem) }).int({ error: says('Z', zProblem) }).min(1, { error: says('Z', zProblem) }).max(RECIPE_LIMITS.zMax, { error: says('Z', zProblem) }),
    terms: z
      .array(termSchema)
      .min(1, { message: 'at least one term is required' })
      .max(RECIPE_LIMITS.termsMax, { message: `at most ${RECIPE_LIMITS.termsMax} terms` })
      .refine((ts) => ts.some((t) => t.re !== 0 || t.im !== 0), { message: 'at least one coefficient must be non-zero' }),
  }),
  grid: z.strictObject({
    /**
     * Points per side of the sampled cube, or 'auto' (the default): the engine picks the grid that resolves the
     * surface's smallest feature (shell thickness, lobe width, the hole of a ring, the gap at the nucleus), with
     * finer cubes for inner radial lobes when needed. A number forces one uniform grid; when it is too coarse the
     * figure carries a warning naming the feature.
     */
    n: z
      .union([
        z.literal('auto'),
        z.number({ error: says('grid.n', gridProblem) }).int({ error: says('grid.n', gridProblem) }).min(RECIPE_LIMITS.gridMin, { error: says('grid.n', gridProblem) }).max(RECIPE_LIMITS.gridMax, { error: says('grid.n', gridProblem) }),
      ], { error: says('grid.n', gridProblem) })
      .default('auto'),
    /**
     * Half-width of the sampled cube in a0, or 'auto': for meshes, the box that holds the whole surface with a
     * margin (it scales with Z and the state); for density cubes without a surface, a box holding at least 99.9 %
     * of the probability. A box that cuts the surface is reported (warnings, caption), never hidden.
     */
    extent: z.union([z.literal('auto'), finite('grid.extent').refine((v) => v > 0 && v <= RECIPE_LIMITS.extentMax, { message: `grid.extent must be in (0, ${RECIPE_LIMITS.extentMax}]` })]).default('auto'),
    })
    .default({ n: 'auto', extent: 'auto' }),
  surface: surfaceSchema,
  /**
   * 'sign' colours by the sign of ψ (of Re ψ on a complex state) with palette.positive / palette.negative;
   * 'argument' colours by arg ψ on the palette's phase wheel (hue = arg ψ); 'auto' = sign for real states,
   * argument for complex ones. One rule for every output: @psiform/colour phaseColoursInto.
   */
  phase: z.strictObject({ mode: z.enum(['auto', 'sign', 'argument']).default('auto') }).default({ mode: 'auto' }),
  palette: paletteSchema.default({ swatchbookId: null, positive: PSIFORM_PALETTE.positive, negative: PSIFORM_PALETTE.negative }),
  stage: stageSchema.default(stageSchema.parse({})),
  annotations: annotationsSchema.default(annotationsSchema.parse({})),
  canvas: canvasSchema.default({ widthMm: 89, heightMm: 60, dpi: 300 }),
  /** Optional; absent means computed from content (backwards compatible). */
  source: recipeSourceSchema.optional(),
}).describe(`A figure recipe. One-electron hydrogen-like model; lengths in Bohr radii a0, |psi| in a0^-3/2. ${ENGINE_CONVENTIONS}`);

export type Recipe = z.infer<typeof recipeSchema>;
export type RecipeInput = z.input<typeof recipeSchema>;
export type RecipeTerm = z.infer<typeof termSchema>;
export type SurfaceRule = z.infer<typeof surfaceSchema>;

export interface RecipeIssue {
  /** Dotted field path, e.g. "content.terms.0.l". */
  path: string;
  message: string;
}

export type RecipeParseResult = { ok: true; recipe: Recipe } | { ok: false; issues: RecipeIssue[] };

/** Lifts an older recipe document to RECIPE_VERSION. Version 1 is the first; later versions add steps here. */
export function upgradeRecipe(doc: unknown): unknown {
  if (doc === null || typeof doc !== 'object' || Array.isArray(doc)) return doc;
  const d = doc as Record<string, unknown>;
  if (d.version === undefined) return doc; // let validation name the missing field
  return d;
}

/** Validates (after upgrading) and returns the recipe with defaults filled in, or the issues with field paths. */
export function parseRecipe(doc: unknown): RecipeParseResult {
  const result = recipeSchema.safeParse(upgradeRecipe(doc));
  if (result.success) return { ok: true, recipe: result.data };
  const issues: RecipeIssue[] = [];
  for (const i of result.error.issues) {
    // Every object of the recipe is strict: a misspelt field (nodalOutLine) is refused by name, not dropped silently.
    if (i.code === 'unrecognized_keys') for (const k of i.keys) issues.push({ path: [...i.path, k].map(String).join('.'), message: 'unknown field' });
    else issues.push({ path: i.path.map(String).join('.') || '(root)', message: i.message });
  }
  return { ok: false, issues };
}

/** One readable line per issue: "content.terms.0.l: l must be less than n (got n=2, l=2)". */
export function formatRecipeIssues(issues: RecipeIssue[]): string[] {
  return issues.map((i) => `${i.path}: ${i.message}`);
}

/** Canonical JSON (sorted keys) so equal recipes hash equally; used for content-derived storage keys. */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  const obj = value as Record<string, unknown>;
  return `{${Object.keys(obj)
    .filter((k) => obj[k] !== undefined)
    .sort()
    .map((k) => `${JSON.stringify(k)}:${canonicalJson(obj[k])}`)
    .join(',')}}`;
}
