import { useCallback, useEffect, useRef, useState } from 'react';
import { Callout, NonIdealState, Spinner } from '@blueprintjs/core';
import { Canvas } from '@react-three/fiber';
import { annotationsSchema, type Recipe } from '@psiform/contracts';
import { CanvasBoundary } from '../scene/FigureCanvas';
import { disposeGeometries, loadGlbGeometries, type PhaseGeometry } from '../scene/geometry';
import { OrbitalScene } from '../scene/OrbitalScene';
import { PhaseKeyLegend } from '../components/PhaseKeyLegend';
import type { PhaseColourAt } from '@psiform/print';

export { phaseOf } from '../scene/geometry';

export interface FigureViewportProps {
  /** Presigned URL of the GLB (another origin; CORS allowed). */
  url: string;
  palette: Pick<Recipe['palette'], 'positive' | 'negative'>;
  stage: Recipe['stage'];
  /** Axes and nucleus marker as in the recipe (the 2D label layer is the studio's and the export's). */
  annotations?: Recipe['annotations'];
  /** Called once, after the GLB is in the scene and a frame of it has been drawn. */
  onReady?(): void;
  /** A figure coloured by arg ψ: the phase key's colours (scene/phaseKeyColours); the sign legend otherwise. */
  phaseKey?: PhaseColourAt;
}

const NO_ANNOTATIONS = annotationsSchema.parse({});

/** Loads the GLB's geometry per phase once per URL; freed when replaced or on unmount. */
function useGlb(url: string): { surfaces: PhaseGeometry[] | null; error: string | null } {
  const [state, setState] = useState<{ surfaces: PhaseGeometry[] | null; error: string | null }>({ surfaces: null, error: null });
  useEffect(() => {
    let alive = true;
    setState({ surfaces: null, error: null });
    loadGlbGeometries(url)
      .then((surfaces) => {
        if (alive) setState({ surfaces, error: null });
        else disposeGeometries(surfaces);
      })
      .catch((err: unknown) => {
        if (alive) setState({ surfaces: null, error: err instanceof Error ? err.message : String(err) });
      });
    return () => {
      alive = false;
    };
  }, [url]);
  useEffect(() => {
    const s = state.surfaces;
    return () => {
      if (s) disposeGeometries(s);
    };
  }, [state.surfaces]);
  return state;
}

/**
 * The finished GLB in the shared figure scene (scene/OrbitalScene: the same camera framing, lights and
 * materials as the studio and the print export), orbit to inspect. z (the quantisation axis) is up.
 */
export default function FigureViewport({ url, palette, stage, annotations, onReady, phaseKey }: FigureViewportProps) {
  const { surfaces, error } = useGlb(url);
  const [ready, setReady] = useState(false);
  const frames = useRef(0);
  const reported = useRef(false);
  const notify = useRef(onReady);
  notify.current = onReady;
  useEffect(() => {
    setReady(false);
    frames.current = 0;
    reported.current = false;
  }, [surfaces]);
  // Counted in a ref (no state per frame); one state change after the second drawn frame.
  const onFrame = useCallback((_c: unknown, _r: number, invalidate: () => void) => {
    if (reported.current) return;
    frames.current += 1;
    if (frames.current >= 2) {
      reported.current = true;
      setReady(true);
      notify.current?.();
    } else invalidate(); // demand frameloop: ask for the second frame
  }, []);
  const bg = stage.background.transparent ? null : stage.background.color;

  return (
    <div className="pf-viewport" data-testid="figure-viewport" data-ready={ready ? 'true' : 'false'}>
      {error && (
        <Callout intent="danger" title="The mesh could not be loaded" data-testid="viewport-error">
          {error}
        </Callout>
      )}
      {!error && !surfaces && <NonIdealState icon={<Spinner size={28} />} title="Loading the mesh…" />}
      {surfaces && (
        <CanvasBoundary>
          <Canvas
            className={`pf-canvas${bg ? '' : ' pf-checker'}`}
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
              annotations={annotations ?? NO_ANNOTATIONS}
              controls
              onFrame={onFrame}
            />
          </Canvas>
        </CanvasBoundary>
      )}
      <div className="pf-legend" aria-label="Phase colours">
        {phaseKey ? (
          <PhaseKeyLegend colourAt={phaseKey} />
        ) : (
          <>
            <span>
              <i style={{ background: palette.positive }} /> ψ &gt; 0
            </span>
            <span>
              <i style={{ background: palette.negative }} /> ψ &lt; 0
            </span>
          </>
        )}
        <span className="pf-muted">Drag to turn, scroll to zoom. z (the quantisation axis) points up.</span>
      </div>
      {ready && <span data-testid="viewport-ready" data-ready="true" hidden />}
    </div>
  );
}
