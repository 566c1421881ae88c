// Headless render page (render.html): window.psiformRender(req) draws the figure's OrbitalScene off screen in
// tiles and returns a print PNG. Contract for the worker: apps/web/src/render/CONTRACT.md.
import '@fontsource/lato/400.css';
import '@fontsource/lato/700.css';
import { useLayoutEffect, useRef, useState } from 'react';
import { createRoot } from 'react-dom/client';
import { Canvas, useThree, type RootState } from '@react-three/fiber';
import * as THREE from 'three';
import { encodeRgbaPng, flipRowsInPlace, linearBufferToSrgb, planTiles } from '@psiform/print';
import { recipeLabel } from '../figures/model';
import { disposeGeometries, geometryFromArrays, loadGlbGeometries, triangleCount, type PhaseGeometry } from '../scene/geometry';
import { axisTips, OrbitalScene, type PlacedInfo } from '../scene/OrbitalScene';
import { drawOverlay, inkFor } from '../scene/overlay';
import { bytesToBase64, compositeOver, halfToFloat, unpremultiply } from './pixels';
import { checkRequest, type CheckedRequest, type RenderResult } from './request';

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
          palette={job.req.recipe.palette}
          stage={job.req.recipe.stage}
          annotations={job.req.recipe.annotations}
          aspect={job.req.width / job.req.height}
          transparent={job.req.transparent}
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
    const t0 = performance.now();
    if (req.source.kind === 'glb') {
      try {
        surfaces = await loadGlbGeometries(req.source.url);
      } catch (err) {
        throw new Error(`glbUrl could not be loaded: ${err instanceof Error ? err.message : String(err)}`);
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
    const png = encodeRgbaPng(req.width, req.height, image, { dpi: req.dpi });
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
      });
      ctx.setTransform(1, 0, 0, 1, 0, 0);

      for (let by = 0; by < h; by += BAND_ROWS) {
        const bh = Math.min(BAND_ROWS, h - by);
        const n = w * bh * 4;
        const lin = new Float32Array(n);
        if (float) {
          const half = new Uint16Array(n);
          gl.readRenderTargetPixels(rt, 0, by, w, bh, half);
          halfToFloat(half, lin);
        } else {
          const u8 = new Uint8Array(n);
          gl.readRenderTargetPixels(rt, 0, by, w, bh, u8);
          for (let i = 0; i < n; i++) lin[i] = u8[i] / 255;
        }
        if (req.transparent) unpremultiply(lin);
        const band = linearBufferToSrgb(lin, new Uint8Array(n));
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

window.psiformRender = render;
const el = document.getElementById('stage');
if (!el) throw new Error('render.html has no #stage element');
try {
  createRoot(el).render(<Host />);
} catch (err) {
  window.psiformRenderError = err instanceof Error ? err.message : String(err);
}
