// The headless render page's request: checked field by field so a bad job fails with a message naming the field.
import { formatRecipeIssues, parseRecipe, type Recipe, type RenderPageResult } from '@psiform/contracts';
import type { Phase, SurfaceArrays } from '../scene/geometry';

export interface RenderRequest {
  recipe: unknown;
  glbUrl?: string;
  surfaces?: { phase: Phase; positions: number[]; normals?: number[]; indices?: number[]; colors?: number[] }[];
  widthPx: number;
  heightPx: number;
  dpi: number;
  transparent?: boolean;
  maxTile?: number;
  /** A figure set: panels in a grid, one camera and one length scale (CONTRACT.md "Panels"). */
  panels?: { recipe: unknown; glbUrl: string; label?: string }[];
  columns?: number;
}

/** The page's answer: the render page contract's (libs/contracts exports.ts), shared with the worker. */
export type RenderResult = RenderPageResult;

export interface CheckedRequest {
  recipe: Recipe;
  source: { kind: 'glb'; url: string } | { kind: 'arrays'; surfaces: SurfaceArrays[] };
  width: number;
  height: number;
  dpi: number;
  transparent: boolean;
  maxTile: number;
  /** Present for a figure set; `recipe` is then the stage's recipe (the request's, else the first panel's). */
  panels?: CheckedPanel[];
  columns: number;
}

export interface CheckedPanel {
  recipe: Recipe;
  url: string;
  /** Shown label; empty = the recipe's own label. */
  label: string;
}

export const MAX_PANELS = 12;
export const MAX_COLUMNS = 6;

export const MAX_IMAGE_SIDE = 20000;
/** Render-target side: at most 4096 (the brief's limit); 2048 by default keeps SwiftShader's memory modest. */
export const DEFAULT_TILE = 2048;
export const MAX_TILE = 4096;

function int(name: string, v: unknown, lo: number, hi: number): number {
  if (typeof v !== 'number' || !Number.isInteger(v) || v < lo || v > hi) {
    throw new Error(`${name} must be an integer between ${lo} and ${hi} (got ${JSON.stringify(v)})`);
  }
  return v;
}

function floats(name: string, v: unknown, multipleOf: number): Float32Array {
  if (!Array.isArray(v) && !ArrayBuffer.isView(v)) throw new Error(`${name} must be an array of numbers`);
  const a = Float32Array.from(v as ArrayLike<number>);
  if (a.length % multipleOf !== 0) throw new Error(`${name} must hold a multiple of ${multipleOf} numbers (got ${a.length})`);
  for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) throw new Error(`${name}[${i}] is not a finite number`);
  return a;
}

export function checkRequest(req: unknown): CheckedRequest {
  if (!req || typeof req !== 'object') throw new Error('the render request must be an object');
  const r = req as RenderRequest;
  if (r.panels !== undefined) return checkPanelRequest(r);
  const parsed = parseRecipe(r.recipe);
  if (!parsed.ok) throw new Error(`recipe is not valid: ${formatRecipeIssues(parsed.issues).join('; ')}`);
  const { width, height, maxTile } = checkSize(r);
  if (r.columns !== undefined) throw new Error('columns is only used with panels');
  const hasUrl = typeof r.glbUrl === 'string' && r.glbUrl.length > 0;
  const hasArrays = Array.isArray(r.surfaces);
  if (hasUrl === hasArrays) throw new Error('give exactly one of glbUrl or surfaces');
  let source: CheckedRequest['source'];
  if (hasUrl) source = { kind: 'glb', url: r.glbUrl! };
  else {
    const list = r.surfaces!;
    if (list.length === 0) throw new Error('surfaces must not be empty');
    source = {
      kind: 'arrays',
      surfaces: list.map((s, i) => {
        if (s.phase !== '+' && s.phase !== '-' && s.phase !== 'complex') throw new Error(`surfaces[${i}].phase must be '+', '-' or 'complex'`);
        const positions = floats(`surfaces[${i}].positions`, s.positions, 3);
        const normals = s.normals ? floats(`surfaces[${i}].normals`, s.normals, 3) : null;
        const colors = s.colors ? floats(`surfaces[${i}].colors`, s.colors, 3) : null;
        if (normals && normals.length !== positions.length) throw new Error(`surfaces[${i}].normals must match positions in length`);
        if (colors && colors.length !== positions.length) throw new Error(`surfaces[${i}].colors must match positions in length`);
        let indices: Uint32Array | null = null;
        if (s.indices) {
          if (!Array.isArray(s.indices) || s.indices.length % 3 !== 0) throw new Error(`surfaces[${i}].indices must hold a multiple of 3 vertex ids`);
          const nv = positions.length / 3;
          indices = Uint32Array.from(s.indices);
          for (let k = 0; k < indices.length; k++) {
            if (indices[k] >= nv || indices[k] !== s.indices[k]) throw new Error(`surfaces[${i}].indices[${k}] is not a vertex id below ${nv}`);
          }
        }
        return { phase: s.phase, positions, normals, colors, indices };
      }),
    };
  }
  const recipe = parsed.recipe;
  return { recipe, source, width, height, dpi: r.dpi, transparent: r.transparent ?? recipe.stage.background.transparent, maxTile, columns: 1 };
}

function checkSize(r: RenderRequest): { width: number; height: number; maxTile: number } {
  const width = int('widthPx', r.widthPx, 1, MAX_IMAGE_SIDE);
  const height = int('heightPx', r.heightPx, 1, MAX_IMAGE_SIDE);
  if (typeof r.dpi !== 'number' || !Number.isFinite(r.dpi) || r.dpi <= 0 || r.dpi > 4800) {
    throw new Error(`dpi must be a positive number up to 4800 (got ${JSON.stringify(r.dpi)})`);
  }
  if (r.transparent !== undefined && typeof r.transparent !== 'boolean') throw new Error('transparent must be true or false');
  const maxTile = r.maxTile === undefined ? DEFAULT_TILE : int('maxTile', r.maxTile, 16, MAX_TILE);
  return { width, height, maxTile };
}

/** A figure set: panels[i] = {recipe, glbUrl, label?}; the stage (camera, lights, background, scale bar) is shared. */
function checkPanelRequest(r: RenderRequest): CheckedRequest {
  if (!Array.isArray(r.panels) || r.panels.length < 1 || r.panels.length > MAX_PANELS) {
    throw new Error(`panels must list 1 to ${MAX_PANELS} panels`);
  }
  if (r.glbUrl !== undefined || r.surfaces !== undefined) throw new Error('give panels or glbUrl/surfaces, not both');
  const { width, height, maxTile } = checkSize(r);
  const columns = r.columns === undefined ? Math.min(r.panels.length, 3) : int('columns', r.columns, 1, MAX_COLUMNS);
  const panels = r.panels.map((p, i): CheckedPanel => {
    if (!p || typeof p !== 'object') throw new Error(`panels[${i}] must be an object`);
    const parsed = parseRecipe(p.recipe);
    if (!parsed.ok) throw new Error(`panels[${i}].recipe is not valid: ${formatRecipeIssues(parsed.issues).join('; ')}`);
    if (typeof p.glbUrl !== 'string' || p.glbUrl.length === 0) throw new Error(`panels[${i}].glbUrl must be a URL`);
    if (p.label !== undefined && (typeof p.label !== 'string' || p.label.length > 200)) throw new Error(`panels[${i}].label must be a text of at most 200 characters`);
    return { recipe: parsed.recipe, url: p.glbUrl, label: p.label ?? '' };
  });
  let recipe = panels[0].recipe;
  if (r.recipe !== undefined) {
    const parsed = parseRecipe(r.recipe);
    if (!parsed.ok) throw new Error(`recipe is not valid: ${formatRecipeIssues(parsed.issues).join('; ')}`);
    recipe = parsed.recipe;
  }
  return {
    recipe,
    source: { kind: 'glb', url: panels[0].url },
    width,
    height,
    dpi: r.dpi,
    transparent: r.transparent ?? recipe.stage.background.transparent,
    maxTile,
    panels,
    columns,
  };
}
