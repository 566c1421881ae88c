// Headless render page (render.html): window.psiformRender(req) draws the figure's OrbitalScene off screen in
// tiles and returns a print PNG. Contract for the worker: apps/web/src/render/CONTRACT.md.
import '@fontsource/lato/400.css';
import '@fontsource/lato/700.css';
import { useLayoutEffect, useRef, useState } from 'react';
import { createRoot } from 'react-dom/client';
import { Canvas, useThree, type RootState } from '@react-three/fiber';
import * as THREE from 'three';
import { flipRowsInPlace, planTiles } from '@psiform/print';
import { recipeLabel } from '../figures/model';
import { disposeGeometries, geometryFromArrays, loadGlbGeometries, splitNodal, triangleCount, type PhaseGeometry } from '../scene/geometry';
import { axisTips, OrbitalScene, type PlacedInfo } from '../scene/OrbitalScene';
import { drawOverlay, inkFor } from '../scene/overlay';
import { phaseKeyColours } from '../scene/phaseKeyColours';
import { bytesToBase64, compositeOver, encodeFigurePng, readBandSrgb } from './pixels';
import { checkRequest, type CheckedRequest, type RenderResult } from './request';
import { commonRadius, intersect, panelGrid, panelViewOffset, type Rect } from './panels';
import { maxRadius } from '../scene/framing';

declare global {
  interface Window {
    psiformRender?: (req: unknown) => Promise<RenderResult>;
    psiformRenderReady?: boolean;
    psiformRenderError?: string;
  }
}

interface Job {
  id: number;
  req: CheckedRequest;
  surfaces: PhaseGeometry[];
  /** Figure sets: this panel's palette, the nominal cell aspect and the shared framing radius. */
  palette?: CheckedRequest['recipe']['palette'];
  aspect?: number;
  frameRadius?: number;
}

/** Read-back band height: keeps the float buffer small whatever the tile size. */
const BAND_ROWS = 256;

function Capture({ onState }: { onState(s: RootState): void }) {
  const state = useThree();
  useLayoutEffect(() => {
    onState(state);
  }, [state, onState]);
  return null;
}

let store: RootState | null = null;
let setJobState: ((job: Job | null) => void) | null = null;
let placedWaiter: { id: number; resolve(info: PlacedInfo): void } | null = null;
let busy = false;

function Host() {
  const [job, setJob] = useState<Job | null>(null);
  setJobState = setJob;
  const jobRef = useRef(job);
  jobRef.current = job;
  return (
    <Canvas
      flat
      dpr={1}
      frameloop="never"
      gl={{ antialias: false, alpha: true, preserveDrawingBuffer: false }}
      onCreated={(s) => {
        store = s;
        if (!s.gl.capabilities.isWebGL2) {
          window.psiformRenderError = 'WebGL2 is not available in this browser';
          return;
        }
        window.psiformRenderReady = true;
      }}
    >
      <Capture onState={keepStore} />
      {job && (
        <OrbitalScene
          key={job.id}
          surfaces={job.surfaces}
          palette={job.palette ?? job.req.recipe.palette}
          stage={job.req.recipe.stage}
          annotations={job.req.recipe.annotations}
          aspect={job.aspect ?? job.req.width / job.req.height}
          transparent={job.req.transparent}
          frameRadius={job.frameRadius}
          onPlaced={(info) => {
            if (placedWaiter && placedWaiter.id === jobRef.current?.id) placedWaiter.resolve(info);
          }}
        />
      )}
    </Canvas>
  );
}

let nextId = 1;

function keepStore(s: RootState): void {
  store = s;
}

async function render(raw: unknown): Promise<RenderResult> {
  if (busy) throw new Error('a render is already running on this page; wait for it to finish');
  busy = true;
  let surfaces: PhaseGeometry[] = [];
  try {
    const req = checkRequest(raw);
    if (!store || !setJobState) throw new Error('the render page has not started (no WebGL context)');
    if (req.panels) return await renderPanels(req, (loaded) => (surfaces = loaded));
    const t0 = performance.now();
    if (req.source.kind === 'glb') {
      try {
        surfaces = await loadGlbGeometries(req.source.url);
      } catch (err) {
        throw new Error(`glbUrl could not be loaded: ${err instanceof Error ? err.message : String(err)}`, { cause: err });
      }
      if (surfaces.length === 0) throw new Error('glbUrl holds no mesh');
    } else {
      surfaces = req.source.surfaces.map((s) => ({ phase: s.phase, geometry: geometryFromArrays(s) }));
    }
    await document.fonts.load('700 32px Lato');
    await document.fonts.load('400 32px Lato');
    const tLoad = performance.now() - t0;

    const id = nextId++;
    const placed = new Promise<PlacedInfo>((resolve) => {
      placedWaiter = { id, resolve };
    });
    setJobState({ id, req, surfaces });
    const timeout = new Promise<never>((_, reject) => setTimeout(() => reject(new Error('the scene did not mount within 20 s')), 20_000));
    const info = await Promise.race([placed, timeout]);
    // One more task so every child of the scene (outlines, axes) has committed.
    await new Promise((r) => setTimeout(r, 0));

    const t1 = performance.now();
    const image = drawTiles(req, info);
    const tRender = performance.now() - t1;

    const t2 = performance.now();
    const png = encodeFigurePng(req.width, req.height, image, req.dpi);
    const pngBase64 = bytesToBase64(png);
    const tEncode = performance.now() - t2;
    return {
      pngBase64,
      width: req.width,
      height: req.height,
      dpi: req.dpi,
      tiles: planTiles(req.width, req.height, tileLimit(req)).length,
      triangles: triangleCount(surfaces),
      ms: { load: Math.round(tLoad), render: Math.round(tRender), encode: Math.round(tEncode) },
    };
  } finally {
    setJobState?.(null);
    placedWaiter = null;
    // Unmount first, then free the buffers.
    await new Promise((r) => setTimeout(r, 0));
    disposeGeometries(surfaces);
    busy = false;
  }
}

function tileLimit(req: CheckedRequest): number {
  const caps = store!.gl.capabilities as unknown as { maxTextureSize: number };
  const gl = store!.gl.getContext() as WebGL2RenderingContext;
  const rb = gl.getParameter(gl.MAX_RENDERBUFFER_SIZE) as number;
  return Math.max(16, Math.min(req.maxTile, caps.maxTextureSize, rb));
}

function drawTiles(req: CheckedRequest, info: PlacedInfo): Uint8Array {
  const { gl, scene } = store!;
  const camera = info.camera;
  const W = req.width;
  const H = req.height;
  const image = new Uint8Array(W * H * 4);
  const tiles = planTiles(W, H, tileLimit(req));
  const float = gl.extensions.has('EXT_color_buffer_float');
  const rt = new THREE.WebGLRenderTarget(1, 1, {
    type: float ? THREE.HalfFloatType : THREE.UnsignedByteType,
    format: THREE.RGBAFormat,
    colorSpace: THREE.LinearSRGBColorSpace,
    depthBuffer: true,
    samples: 4,
  });
  const recipe = req.recipe;
  const bg = req.transparent ? null : recipe.stage.background.color;
  const pxPerMm = req.dpi / 25.4;
  const visibleWidth = info.framing.visibleHeight * (W / H);
  // Axis letters from the whole-image camera (before any view offset).
  const letters = recipe.annotations.axes
    ? axisTips(info.radius).map((t) => {
        const v = t.at.clone().project(camera);
        return { text: t.text, x: ((v.x + 1) / 2) * W, y: ((1 - v.y) / 2) * H };
      })
    : undefined;
  // A figure coloured by arg ψ carries its phase key in the 2D layer (the same colours as the GLB's surfaces).
  const keyColours = phaseKeyColours(recipe);
  const overlayCanvas = document.createElement('canvas');
  const prevClear = gl.getClearColor(new THREE.Color());
  const prevAlpha = gl.getClearAlpha();
  try {
    for (const tile of tiles) {
      const { x, y, width: w, height: h } = tile;
      rt.setSize(w, h);
      camera.setViewOffset(tile.view.fullWidth, tile.view.fullHeight, tile.view.x, tile.view.y, tile.view.width, tile.view.height);
      camera.updateProjectionMatrix();
      gl.setRenderTarget(rt);
      gl.setClearColor(0x000000, 0);
      gl.clear(true, true, true);
      gl.render(scene, camera);

      // The tile's 2D layer (label, scale bar, caption, axis letters) in the same pixel grid.
      overlayCanvas.width = w;
      overlayCanvas.height = h;
      const ctx = overlayCanvas.getContext('2d', { willReadFrequently: true })!;
      ctx.clearRect(0, 0, w, h);
      ctx.translate(-x, -y);
      drawOverlay(ctx, {
        width: W,
        height: H,
        pxPerMm,
        annotations: recipe.annotations,
        label: recipe.annotations.label.text || recipeLabel(recipe),
        visibleWidthBohr: visibleWidth,
        ink: inkFor(bg),
        axisLetters: letters,
        phaseKey: keyColours,
      });
      ctx.setTransform(1, 0, 0, 1, 0, 0);

      for (let by = 0; by < h; by += BAND_ROWS) {
        const bh = Math.min(BAND_ROWS, h - by);
        const band = readBandSrgb(gl, rt, by, w, bh, float, req.transparent);
        // Render-target rows run bottom-up: band row 0 is tile row h-1-by from the top.
        flipRowsInPlace(band, w, bh);
        const topInTile = h - by - bh;
        const over = ctx.getImageData(0, topInTile, w, bh).data;
        compositeOver(band, over);
        for (let r = 0; r < bh; r++) {
          image.set(band.subarray(r * w * 4, (r + 1) * w * 4), ((y + topInTile + r) * W + x) * 4);
        }
      }
    }
  } finally {
    camera.clearViewOffset();
    camera.updateProjectionMatrix();
    gl.setRenderTarget(null);
    gl.setClearColor(prevClear, prevAlpha);
    rt.dispose();
  }
  return image;
}

// ---- figure sets: panels in a grid, one camera, one length scale -----------------------------------

/** Mounts one scene (a single figure or one panel) and waits until its camera is placed. */
async function mount(job: Omit<Job, 'id'>): Promise<PlacedInfo> {
  const id = nextId++;
  const placed = new Promise<PlacedInfo>((resolve) => {
    placedWaiter = { id, resolve };
  });
  setJobState!({ id, ...job });
  let timer: ReturnType<typeof setTimeout> | undefined;
  const timeout = new Promise<never>((_, reject) => (timer = setTimeout(() => reject(new Error('the scene did not mount within 20 s')), 20_000)));
  try {
    const info = await Promise.race([placed, timeout]);
    await new Promise((r) => setTimeout(r, 0));
    return info;
  } finally {
    clearTimeout(timer);
  }
}

/** Renders canvas region `sub` through `camera` (with the given view offset) into `image` (W wide), as sRGB. */
function renderRegion(rt: THREE.WebGLRenderTarget, float: boolean, camera: THREE.Camera & { setViewOffset: THREE.PerspectiveCamera['setViewOffset']; updateProjectionMatrix(): void }, view: [number, number, number, number, number, number], sub: Rect, image: Uint8Array, W: number, transparent: boolean): void {
  const { gl, scene } = store!;
  const { width: w, height: h } = sub;
  rt.setSize(w, h);
  camera.setViewOffset(...view);
  camera.updateProjectionMatrix();
  gl.setRenderTarget(rt);
  gl.setClearColor(0x000000, 0);
  gl.clear(true, true, true);
  gl.render(scene, camera);
  for (let by = 0; by < h; by += BAND_ROWS) {
    const bh = Math.min(BAND_ROWS, h - by);
    const band = readBandSrgb(gl, rt, by, w, bh, float, transparent);
    flipRowsInPlace(band, w, bh);
    const top = sub.y + h - by - bh;
    for (let r = 0; r < bh; r++) image.set(band.subarray(r * w * 4, (r + 1) * w * 4), ((top + r) * W + sub.x) * 4);
  }
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
async function renderPanels(req: CheckedRequest, keep: (all: PhaseGeometry[]) => void): Promise<RenderResult> {
  const panels = req.panels!;
  const t0 = performance.now();
  const loaded: PhaseGeometry[][] = [];
  try {
    for (const [i, p] of panels.entries()) {
      let g: PhaseGeometry[];
      try {
        g = await loadGlbGeometries(p.url);
      } catch (err) {
        throw new Error(`panels[${i}].glbUrl could not be loaded: ${err instanceof Error ? err.message : String(err)}`, { cause: err });
      }
      loaded.push(g);
      if (g.length === 0) throw new Error(`panels[${i}].glbUrl holds no mesh`);
    }
  } finally {
    keep(loaded.flat());
  }
  await document.fonts.load('700 32px Lato');
  await document.fonts.load('400 32px Lato');
  const tLoad = performance.now() - t0;

  const t1 = performance.now();
  const W = req.width;
  const H = req.height;
  const grid = panelGrid(W, H, panels.length, req.columns);
  const radius = commonRadius(loaded.map((g) => maxRadius(splitNodal(g).lobes.map((s) => s.geometry))));
  const aspect = grid.cellWidth / grid.cellHeight;
  const recipe = req.recipe;
  const bg = req.transparent ? null : recipe.stage.background.color;
  const image = new Uint8Array(W * H * 4);
  if (bg) {
    const [r, g, b] = hexBytes(bg);
    for (const e of grid.empty) for (let y = e.y; y < e.y + e.height; y++) for (let x = e.x; x < e.x + e.width; x++) image.set([r, g, b, 255], (y * W + x) * 4);
  }
  const tiles = planTiles(W, H, tileLimit(req));
  const { gl } = store!;
  const float = gl.extensions.has('EXT_color_buffer_float');
  const rt = new THREE.WebGLRenderTarget(1, 1, {
    type: float ? THREE.HalfFloatType : THREE.UnsignedByteType,
    format: THREE.RGBAFormat,
    colorSpace: THREE.LinearSRGBColorSpace,
    depthBuffer: true,
    samples: 4,
  });
  const prevClear = gl.getClearColor(new THREE.Color());
  const prevAlpha = gl.getClearAlpha();
  let unitsPerPixel = 0;
  const letters: ({ text: string; x: number; y: number }[] | undefined)[] = [];
  let regions = 0;
  try {
    for (const cell of grid.cells) {
      const p = panels[cell.index];
      const info = await mount({ req, surfaces: loaded[cell.index], palette: p.recipe.palette, aspect, frameRadius: radius });
      const camera = info.camera;
      unitsPerPixel = info.framing.visibleHeight / grid.cellHeight;
      try {
        camera.clearViewOffset();
        camera.updateProjectionMatrix();
        // Axis letters in cell coordinates (the nominal cell's top left may sit a rounding pixel off the cell's).
        const dx = cell.cx - grid.cellWidth / 2 - cell.x;
        const dy = cell.cy - grid.cellHeight / 2 - cell.y;
        letters[cell.index] = recipe.annotations.axes
          ? axisTips(info.radius).map((t) => {
              const v = t.at.clone().project(camera);
              return { text: t.text, x: ((v.x + 1) / 2) * grid.cellWidth + dx, y: ((1 - v.y) / 2) * grid.cellHeight + dy };
            })
          : undefined;
        for (const tile of tiles) {
          const sub = intersect(cell, tile);
          if (!sub) continue;
          renderRegion(rt, float, camera, panelViewOffset(grid, cell, sub), sub, image, W, req.transparent);
          regions += 1;
        }
      } finally {
        camera.clearViewOffset();
        camera.updateProjectionMatrix();
      }
    }
  } finally {
    gl.setRenderTarget(null);
    gl.setClearColor(prevClear, prevAlpha);
    rt.dispose();
  }

  // The 2D layer, tile by tile over the finished pixels.
  const pxPerMm = req.dpi / 25.4;
  const ink = inkFor(bg);
  const ann = recipe.annotations;
  const overlayCanvas = document.createElement('canvas');
  for (const tile of tiles) {
    const { x, y, width: w, height: h } = tile;
    overlayCanvas.width = w;
    overlayCanvas.height = h;
    const ctx = overlayCanvas.getContext('2d', { willReadFrequently: true })!;
    ctx.clearRect(0, 0, w, h);
    ctx.translate(-x, -y);
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
    drawOverlay(ctx, {
      width: W,
      height: H,
      pxPerMm,
      annotations: { ...ann, label: { ...ann.label, show: false }, caption: '' },
      label: '',
      visibleWidthBohr: unitsPerPixel * W,
      ink,
    });
    ctx.setTransform(1, 0, 0, 1, 0, 0);
    const over = ctx.getImageData(0, 0, w, h).data;
    for (let r = 0; r < h; r++) {
      const at = ((y + r) * W + x) * 4;
      compositeOver(image.subarray(at, at + w * 4), over.subarray(r * w * 4, (r + 1) * w * 4));
    }
  }
  const tRender = performance.now() - t1;

  const t2 = performance.now();
  const png = encodeFigurePng(W, H, image, req.dpi);
  const pngBase64 = bytesToBase64(png);
  const tEncode = performance.now() - t2;
  return {
    pngBase64,
    width: W,
    height: H,
    dpi: req.dpi,
    tiles: tiles.length,
    triangles: loaded.reduce((n, g) => n + triangleCount(g), 0),
    ms: { load: Math.round(tLoad), render: Math.round(tRender), encode: Math.round(tEncode) },
    panels: { count: panels.length, rows: grid.rows, columns: grid.columns, regions, a0PerPixel: unitsPerPixel, radius },
  };
}

window.psiformRender = render;
const el = document.getElementById('stage');
if (!el) throw new Error('render.html has no #stage element');
try {
  createRoot(el).render(<Host />);
} catch (err) {
  window.psiformRenderError = err instanceof Error ? err.message : String(err);
}
