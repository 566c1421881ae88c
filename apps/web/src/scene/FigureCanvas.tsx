// The on-screen figure: the WebGL canvas with OrbitalScene and the 2D annotation layer on top, framed at
// the recipe's canvas aspect ratio so the screen shows what an export will contain.
import { Component, useCallback, useEffect, useMemo, useRef, type ReactNode } from 'react';
import { Callout } from '@blueprintjs/core';
import { Canvas, useThree } from '@react-three/fiber';
import * as THREE from 'three';
import type { Recipe } from '@psiform/contracts';
import type { PhaseColourAt } from '@psiform/print';
import { visibleHeightNow } from './framing';
import type { PhaseGeometry } from './geometry';
import { axisTips, OrbitalScene, type OrbitalSceneProps } from './OrbitalScene';
import { captionLayout, drawOverlay, inkFor, type CaptionLayout } from './overlay';

export interface FigureCanvasProps {
  surfaces: readonly PhaseGeometry[];
  palette: Pick<Recipe['palette'], 'positive' | 'negative'>;
  stage: Recipe['stage'];
  annotations: Recipe['annotations'];
  canvas: Recipe['canvas'];
  /** Display label (typeset with real subscripts). */
  label: string;
  controls?: boolean;
  onOrbitEnd?: OrbitalSceneProps['onOrbitEnd'];
  /** Once per set of surfaces, after a frame of them has been drawn. */
  onReady?(): void;
  /** A figure coloured by arg ψ: its phase key's colours (scene/phaseKeyColours), drawn in the 2D layer. */
  phaseKey?: PhaseColourAt;
}

export class CanvasBoundary extends Component<{ children: ReactNode }, { error: string | null }> {
  state = { error: null as string | null };
  static getDerivedStateFromError(err: unknown) {
    return { error: err instanceof Error ? err.message : String(err) };
  }
  render() {
    if (this.state.error) {
      return (
        <Callout intent="warning" title="The 3D view could not start" data-testid="viewport-error">
          This browser could not draw the mesh (WebGL: {this.state.error}). The files can still be downloaded.
        </Callout>
      );
    }
    return this.props.children;
  }
}

export function FigureCanvas(props: FigureCanvasProps) {
  const { surfaces, palette, stage, annotations, canvas, label } = props;
  const overlay = useRef<HTMLCanvasElement>(null);
  const frames = useRef(0);
  const reported = useRef(false);
  // The caption's own band at the bottom (same layout as the print render): the 3D view sits above it.
  const caption = useMemo<CaptionLayout>(() => {
    const scratch = document.createElement('canvas').getContext('2d');
    const PX_PER_MM = 10;
    return scratch ? captionLayout(scratch, annotations.caption, canvas.widthMm, PX_PER_MM) : { lines: [], bandMm: 0 };
  }, [annotations.caption, canvas.widthMm]);
  const figureShare = Math.max(0.2, 1 - caption.bandMm / canvas.heightMm);
  const latest = useRef({ ...props, caption, figureShare });
  latest.current = { ...props, caption, figureShare };

  useEffect(() => {
    frames.current = 0;
    reported.current = false;
  }, [surfaces]);

  // The overlay is redrawn from the frame callback (no React state per frame).
  const onFrame = useCallback((camera: THREE.Camera, radius: number, invalidate: () => void) => {
    const el = overlay.current;
    const p = latest.current;
    if (el) {
      const dpr = Math.min(window.devicePixelRatio || 1, 2);
      const w = Math.max(1, Math.round(el.clientWidth * dpr));
      const h = Math.max(1, Math.round(el.clientHeight * dpr));
      if (el.width !== w || el.height !== h) {
        el.width = w;
        el.height = h;
      }
      const ctx = el.getContext('2d');
      if (ctx) {
        ctx.clearRect(0, 0, w, h);
        const target = new THREE.Vector3(...p.stage.camera.target);
        const visibleWidth = visibleHeightNow(camera, target) * (w / (h * p.figureShare));
        const letters = p.annotations.axes
          ? axisTips(radius).map((t) => {
              const v = t.at.clone().project(camera);
              return { text: t.text, x: ((v.x + 1) / 2) * w, y: ((1 - v.y) / 2) * h * p.figureShare };
            })
          : undefined;
        const bg = p.stage.background.transparent ? null : p.stage.background.color;
        drawOverlay(ctx, {
          width: w,
          height: h,
          pxPerMm: w / p.canvas.widthMm,
          annotations: p.annotations,
          label: p.label,
          visibleWidthBohr: visibleWidth,
          ink: inkFor(bg),
          axisLetters: letters,
          caption: p.caption,
          phaseKey: p.phaseKey,
        });
      }
    }
    if (!reported.current && p.surfaces.length > 0) {
      frames.current += 1;
      if (frames.current >= 2) {
        reported.current = true;
        p.onReady?.();
      } else invalidate();
    }
  }, []);

  const bg = stage.background.transparent ? null : stage.background.color;
  return (
    <div
      className={`pf-figure-canvas${bg ? '' : ' pf-checker'}`}
      style={{ aspectRatio: `${canvas.widthMm} / ${canvas.heightMm}`, ['--pf-figure-share' as string]: `${(figureShare * 100).toFixed(3)}%` }}
      data-testid="figure-canvas"
    >
      <CanvasBoundary>
        <Canvas
          className="pf-canvas"
          data-testid="viewport-canvas"
          flat
          dpr={1}
          frameloop="demand"
          gl={{ antialias: true, preserveDrawingBuffer: true, alpha: true }}
          onCreated={({ invalidate }) => invalidate()}
        >
          <OrbitalScene
            surfaces={surfaces}
            palette={palette}
            stage={stage}
            annotations={annotations}
            controls={props.controls}
            onOrbitEnd={props.onOrbitEnd}
            onFrame={onFrame}
          />
          <Invalidator deps={[label, annotations, canvas]} />
        </Canvas>
      </CanvasBoundary>
      <canvas ref={overlay} className="pf-overlay" aria-label={`Figure label ${label}`} data-testid="figure-overlay" data-caption-band-mm={caption.bandMm.toFixed(2)} />
    </div>
  );
}

/** Redraws (and so re-runs the overlay) when annotation-only inputs change. */
function Invalidator({ deps }: { deps: unknown[] }) {
  const invalidate = useThree((s) => s.invalidate);
  const key = JSON.stringify(deps);
  useEffect(() => {
    invalidate();
  }, [key, invalidate]);
  return null;
}
