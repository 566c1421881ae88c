import * as THREE from 'three';
import { flipRowsInPlace, planTiles } from '@psiform/print';
import { compositeOver, readBandSrgb } from './pixels';
import type { Rect } from './panels';
import type { RenderHandle } from './RenderHost';

/** Read-back band height: keeps the float buffer small whatever the tile size. */
const BAND_ROWS = 256;

/** A camera the page can draw a window of (both of three's cameras have setViewOffset). */
export type ViewCamera = THREE.Camera & { setViewOffset: THREE.PerspectiveCamera['setViewOffset']; clearViewOffset(): void; updateProjectionMatrix(): void };

/** One region of the canvas: where it goes (`sub`) and the camera window that draws it (setViewOffset arguments). */
export interface Region {
  sub: Rect;
  view: [fullWidth: number, fullHeight: number, x: number, y: number, width: number, height: number];
}

/** The largest render-target side this request and this GPU allow. */
export function tileLimit(host: RenderHandle, maxTile: number): number {
  const caps = host.gl.capabilities as unknown as { maxTextureSize: number };
  const gl = host.gl.getContext() as WebGL2RenderingContext;
  const rb = gl.getParameter(gl.MAX_RENDERBUFFER_SIZE) as number;
  return Math.max(16, Math.min(maxTile, caps.maxTextureSize, rb));
}

/** The canvas cut into tiles (planTiles), each drawn through the whole-canvas camera window: a single figure. */
export function tileRegions(width: number, height: number, limit: number): Region[] {
  return planTiles(width, height, limit).map((t) => ({ sub: { x: t.x, y: t.y, width: t.width, height: t.height }, view: [t.view.fullWidth, t.view.fullHeight, t.view.x, t.view.y, t.view.width, t.view.height] }));
}

/**
 * THE drawing loop of the render page, for a single figure (its tiles) and for a figure set (each panel's cell ∩ tile):
 * every region is drawn through the mounted scene's camera with its view offset into the host's render target, read
 * back in bands as sRGB (un-premultiplied), flipped (render targets run bottom-up) and copied into `image` (W wide).
 * Restores the camera, the clear colour and the default framebuffer afterwards.
 */
export function renderRegions(host: RenderHandle, camera: ViewCamera, regions: readonly Region[], image: Uint8Array, W: number, transparent: boolean): void {
  const { gl, scene } = host;
  const { target: rt, float } = host.target;
  const prevClear = gl.getClearColor(new THREE.Color());
  const prevAlpha = gl.getClearAlpha();
  try {
    for (const { sub, view } of regions) {
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
  } finally {
    camera.clearViewOffset();
    camera.updateProjectionMatrix();
    gl.setRenderTarget(null);
    gl.setClearColor(prevClear, prevAlpha);
  }
}

/**
 * The 2D layer (labels, scale bar, caption, axis letters), drawn tile by tile in the image's own pixel grid by `draw`
 * (canvas translated so it draws in whole-image coordinates) and composited over the finished pixels.
 */
export function overlayTiles(tiles: readonly Rect[], image: Uint8Array, W: number, draw: (ctx: CanvasRenderingContext2D, tile: Rect) => void): void {
  const canvas = document.createElement('canvas');
  for (const tile of tiles) {
    const { x, y, width: w, height: h } = tile;
    canvas.width = w;
    canvas.height = h;
    const ctx = canvas.getContext('2d', { willReadFrequently: true })!;
    ctx.clearRect(0, 0, w, h);
    ctx.translate(-x, -y);
    draw(ctx, tile);
    ctx.setTransform(1, 0, 0, 1, 0, 0);
    const over = ctx.getImageData(0, 0, w, h).data;
    for (let r = 0; r < h; r++) {
      const at = ((y + r) * W + x) * 4;
      compositeOver(image.subarray(at, at + w * 4), over.subarray(r * w * 4, (r + 1) * w * 4));
    }
  }
}
