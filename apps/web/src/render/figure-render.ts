// What window.psiformRender does with a checked request: a single figure or a figure set, drawn through the host's
// scene by renderRegions, then the 2D layer and the PNG. Contract: CONTRACT.md.
import { planTiles } from '@psiform/print';
import { recipeLabel } from '../figures/model';
import { disposeGeometries, geometryFromArrays, loadGlbGeometries, splitNodal, triangleCount, type PhaseGeometry } from '../scene/geometry';
import { axisTips, type PlacedInfo } from '../scene/OrbitalScene';
import { drawOverlay, inkFor } from '../scene/overlay';
import { phaseKeyColours } from '../scene/phaseKeyColours';
import { loadOverlayFonts } from '../scene/fonts';
import { maxRadius } from '../scene/framing';
import { bytesToBase64, encodeFigurePng } from './pixels';
import { checkRequest, type CheckedRequest, type RenderResult } from './request';
import { commonRadius, intersect, panelGrid, panelViewOffset } from './panels';
import { overlayTiles, renderRegions, tileLimit, tileRegions, type Region, type ViewCamera } from './regions';
import type { RenderHandle } from './RenderHost';

type Timings = RenderResult['ms'];

/** One render at a time per page; the scene is unmounted and its geometries freed whatever happens. */
export function pageRenderer(host: () => RenderHandle | null): (raw: unknown) => Promise<RenderResult> {
  let busy = false;
  return async (raw) => {
    if (busy) throw new Error('a render is already running on this page; wait for it to finish');
    busy = true;
    const loaded: PhaseGeometry[] = [];
    const h = host();
    try {
      const req = checkRequest(raw);
      if (!h) throw new Error('the render page has not started (no WebGL context)');
      return req.panels ? await renderSet(h, req, loaded) : await renderFigure(h, req, loaded);
    } finally {
      // Unmount first, then free the buffers.
      await h?.unmount();
      disposeGeometries(loaded);
      busy = false;
    }
  };
}


async function loadGlb(url: string, what: string): Promise<PhaseGeometry[]> {
  let g: PhaseGeometry[];
  try {
    g = await loadGlbGeometries(url);
  } catch (err) {
    throw new Error(`${what} could not be loaded: ${err instanceof Error ? err.message : String(err)}`, { cause: err });
  }
  if (g.length === 0) throw new Error(`${what} holds no mesh`);
  return g;
}

function finish(req: CheckedRequest, image: Uint8Array, tiles: number, triangles: number, ms: Omit<Timings, 'encode'>): RenderResult {
  const t = performance.now();
  const pngBase64 = bytesToBase64(encodeFigurePng(req.width, req.height, image, req.dpi));
  return { pngBase64, width: req.width, height: req.height, dpi: req.dpi, tiles, triangles, ms: { ...ms, encode: Math.round(performance.now() - t) } };
}

/** Axis letters of a placed camera, in the pixels of a `w` × `h` frame shifted by (dx, dy). */
function axisLetters(info: PlacedInfo, w: number, h: number, dx = 0, dy = 0) {
  info.camera.clearViewOffset();
  info.camera.updateProjectionMatrix();
  return axisTips(info.radius).map((t) => {
    const v = t.at.clone().project(info.camera);
    return { text: t.text, x: ((v.x + 1) / 2) * w + dx, y: ((1 - v.y) / 2) * h + dy };
  });
}

/** A single figure: its tiles through one camera, then label, scale bar, caption and axis letters. */
async function renderFigure(host: RenderHandle, req: CheckedRequest, loaded: PhaseGeometry[]): Promise<RenderResult> {
  const t0 = performance.now();
  loaded.push(...(req.source.kind === 'glb' ? await loadGlb(req.source.url, 'glbUrl') : req.source.surfaces.map((s) => ({ phase: s.phase, geometry: geometryFromArrays(s) }))));
  await loadOverlayFonts();
  const tLoad = performance.now() - t0;
  const info = await host.mount({ req, surfaces: loaded });

  const t1 = performance.now();
  const { width: W, height: H, recipe } = req;
  const image = new Uint8Array(W * H * 4);
  const regions = tileRegions(W, H, tileLimit(host, req.maxTile));
  const letters = recipe.annotations.axes ? axisLetters(info, W, H) : undefined;
  renderRegions(host, info.camera as ViewCamera, regions, image, W, req.transparent);
  const bg = req.transparent ? null : recipe.stage.background.color;
  overlayTiles(
    regions.map((r) => r.sub),
    image,
    W,
    (ctx) =>
      drawOverlay(ctx, {
        width: W,
        height: H,
        pxPerMm: req.dpi / 25.4,
        annotations: recipe.annotations,
        label: recipe.annotations.label.text || recipeLabel(recipe),
        visibleWidthBohr: info.framing.visibleHeight * (W / H),
        ink: inkFor(bg),
        axisLetters: letters,
        // A figure coloured by arg ψ carries its phase key in the 2D layer (the same colours as the GLB's surfaces).
        phaseKey: phaseKeyColours(recipe),
      }),
  );
  const tRender = performance.now() - t1;
  return finish(req, image, regions.length, triangleCount(loaded), { load: Math.round(tLoad), render: Math.round(tRender) });
}

function hexBytes(hex: string): [number, number, number] {
  const m = /^#?([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  return m ? [parseInt(m[1], 16), parseInt(m[2], 16), parseInt(m[3], 16)] : [255, 255, 255];
}

/**
 * A figure set: every panel is drawn through the same camera (the stage recipe's view, projection and distance,
 * placed for the nominal cell with the LARGEST panel radius), so a0 per pixel is equal in all panels. The canvas is
 * cut by planTiles; each panel renders the parts of its cell inside each tile (panelViewOffset), so large outputs
 * tile seamlessly. Then the 2D layer per tile: each panel's label (and axis letters), one shared scale bar.
 */
async function renderSet(host: RenderHandle, req: CheckedRequest, loaded: PhaseGeometry[]): Promise<RenderResult & Required<Pick<RenderResult, 'panels'>>> {
  const panels = req.panels!;
  const t0 = performance.now();
  const perPanel: PhaseGeometry[][] = [];
  for (const [i, p] of panels.entries()) {
    const g = await loadGlb(p.url, `panels[${i}].glbUrl`);
    perPanel.push(g);
    loaded.push(...g);
  }
  await loadOverlayFonts();
  const tLoad = performance.now() - t0;

  const t1 = performance.now();
  const { width: W, height: H, recipe } = req;
  const grid = panelGrid(W, H, panels.length, req.columns);
  const radius = commonRadius(perPanel.map((g) => maxRadius(splitNodal(g).lobes.map((s) => s.geometry))));
  const aspect = grid.cellWidth / grid.cellHeight;
  const bg = req.transparent ? null : recipe.stage.background.color;
  const image = new Uint8Array(W * H * 4);
  if (bg) {
    const [r, g, b] = hexBytes(bg);
    for (const e of grid.empty) for (let y = e.y; y < e.y + e.height; y++) for (let x = e.x; x < e.x + e.width; x++) image.set([r, g, b, 255], (y * W + x) * 4);
  }
  const tiles = planTiles(W, H, tileLimit(host, req.maxTile));
  let unitsPerPixel = 0;
  let regionCount = 0;
  const letters: ({ text: string; x: number; y: number }[] | undefined)[] = [];
  for (const cell of grid.cells) {
    const info = await host.mount({ req, surfaces: perPanel[cell.index], palette: panels[cell.index].recipe.palette, aspect, frameRadius: radius });
    unitsPerPixel = info.framing.visibleHeight / grid.cellHeight;
    // Axis letters in cell coordinates (the nominal cell's top left may sit a rounding pixel off the cell's).
    letters[cell.index] = recipe.annotations.axes ? axisLetters(info, grid.cellWidth, grid.cellHeight, cell.cx - grid.cellWidth / 2 - cell.x, cell.cy - grid.cellHeight / 2 - cell.y) : undefined;
    const regions: Region[] = tiles.flatMap((tile) => {
      const sub = intersect(cell, tile);
      return sub ? [{ sub, view: panelViewOffset(grid, cell, sub) }] : [];
    });
    renderRegions(host, info.camera as ViewCamera, regions, image, W, req.transparent);
    regionCount += regions.length;
  }

  const pxPerMm = req.dpi / 25.4;
  const ink = inkFor(bg);
  const ann = recipe.annotations;
  overlayTiles(tiles, image, W, (ctx, tile) => {
    for (const cell of grid.cells) {
      if (!intersect(cell, tile)) continue;
      const p = panels[cell.index];
      ctx.save();
      ctx.beginPath();
      ctx.rect(cell.x, cell.y, cell.width, cell.height);
      ctx.clip();
      ctx.translate(cell.x, cell.y);
      drawOverlay(ctx, {
        width: cell.width,
        height: cell.height,
        pxPerMm,
        annotations: { ...ann, label: { ...ann.label, show: true }, scaleBar: { ...ann.scaleBar, show: false }, caption: '' },
        label: p.label || p.recipe.annotations.label.text || recipeLabel(p.recipe),
        visibleWidthBohr: 0,
        ink,
        axisLetters: letters[cell.index],
        phaseKey: phaseKeyColours(p.recipe),
      });
      ctx.restore();
    }
    // One scale bar for the whole set (every panel has the same a0 per pixel).
    drawOverlay(ctx, { width: W, height: H, pxPerMm, annotations: { ...ann, label: { ...ann.label, show: false }, caption: '' }, label: '', visibleWidthBohr: unitsPerPixel * W, ink });
  });
  const tRender = performance.now() - t1;
  const result = finish(req, image, tiles.length, perPanel.reduce((n, g) => n + triangleCount(g), 0), { load: Math.round(tLoad), render: Math.round(tRender) });
  return { ...result, panels: { count: panels.length, rows: grid.rows, columns: grid.columns, regions: regionCount, a0PerPixel: unitsPerPixel, radius } };
}
