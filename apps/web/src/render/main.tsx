// Headless render page (render.html): window.psiformRender(req) draws the figure's OrbitalScene off screen in
// tiles and returns a print PNG. Contract for the worker: apps/web/src/render/CONTRACT.md.
// This file only starts the page: the React host (RenderHost.tsx, an imperative handle over its scene and render
// target) and the render functions (figure-render.ts: one renderRegions() for a single figure and for sets).
// The 2D layer's faces (Lato, DejaVu Sans) are imported by scene/fonts.ts, which figure-render.ts waits on.
import { createRef } from 'react';
import { createRoot } from 'react-dom/client';
import { RenderHost, type RenderHandle } from './RenderHost';
import { pageRenderer } from './figure-render';
import type { RenderResult } from './request';

declare global {
  interface Window {
    psiformRender?: (req: unknown) => Promise<RenderResult>;
    psiformRenderReady?: boolean;
    psiformRenderError?: string;
  }
}

const host = createRef<RenderHandle>();
window.psiformRender = pageRenderer(() => host.current);
const ready = () => void (window.psiformRenderReady = true);
const failed = (message: string) => void (window.psiformRenderError = message);
const el = document.getElementById('stage');
if (!el) throw new Error('render.html has no #stage element');
try {
  createRoot(el).render(
    <RenderHost ref={host} onReady={ready} onError={failed} />,
  );
} catch (err) {
  window.psiformRenderError = err instanceof Error ? err.message : String(err);
}
