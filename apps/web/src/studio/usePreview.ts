// Drives the preview worker: one sample per state/grid, then surfaces on that grid as the rule moves.
// At most one surface request is in flight; while it runs only the newest rule waits (older ones are dropped),
// and answers carrying an old sequence number are ignored.
import { useEffect, useRef, useState } from 'react';
import type { OrbitalState } from '@psiform/orbitals';
import { disposeGeometries, geometryFromArrays, type PhaseGeometry } from '../scene/geometry';
import type { PreviewRequest, PreviewResponse } from '../workers/preview-protocol';
import type { SurfaceWarning } from '@psiform/meshing';

/** Swappable in tests (jsdom has no module workers). */
export const previewWorker = {
  create: (): Worker => new Worker(new URL('../workers/preview.worker.ts', import.meta.url), { type: 'module' }),
};

/** The surface rule, plus whether the nodal surfaces (ψ = 0) are wanted for the Stage's outline. */
export type PreviewRule = ({ rule: 'enclosed'; fraction: number } | { rule: 'psi'; value: number }) & { nodal?: boolean };

export interface PreviewStatus {
  phase: 'idle' | 'sampling' | 'extracting' | 'ready' | 'error';
  sampleMs: number | null;
  extractMs: number | null;
  /** Round trip of the last surface update as seen by the page. */
  updateMs: number | null;
  triangles: number;
  /** Probability inside the surface over all space, its estimated error and the part inside the box. */
  enclosed: number | null;
  enclosedError: number | null;
  enclosedInBox: number | null;
  /** What the preview cannot show truthfully (e.g. 'box-cuts-surface' with suggestedExtent: offer to widen the box). */
  warnings: SurfaceWarning[];
  isovalue: number | null;
  /** Largest |ψ| on the preview grid (a0^-3/2): no |ψ| surface exists above it. */
  maxAbs: number | null;
  /** Points per side of the preview's outer grid. */
  n: number;
  error: string | null;
}

/** Preview grid: the recipe's N, capped at 112 so the slider stays responsive (about 1.4 M voxels). */
export const PREVIEW_MAX_N = 112;

export function usePreview(
  state: OrbitalState | null,
  gridN: number | 'auto',
  extent: 'auto' | number,
  rule: PreviewRule | null,
  /** The recipe's palette (with its swatchbook's wheel) and phase mode: the colours the surfaces and key share. */
  colours?: { palette: { positive: string; negative: string; wheel?: { lightness: number; chroma: number } | null }; mode?: 'auto' | 'sign' | 'argument' },
) {
  const coloursRef = useRef(colours);
  coloursRef.current = colours;
  const workerRef = useRef<Worker | null>(null);
  const seq = useRef(0);
  const sampleSeq = useRef(-1);
  const inFlight = useRef<{ seq: number; sent: number } | null>(null);
  const pending = useRef<PreviewRule | null>(null);
  const ruleRef = useRef(rule);
  ruleRef.current = rule;
  const [surfaces, setSurfaces] = useState<PhaseGeometry[]>([]);
  const [status, setStatus] = useState<PreviewStatus>({
    phase: 'idle',
    sampleMs: null,
    extractMs: null,
    updateMs: null,
    triangles: 0,
    enclosed: null,
    enclosedError: null,
    enclosedInBox: null,
    warnings: [],
    isovalue: null,
    maxAbs: null,
    n: 0,
    error: null,
  });
  // 'auto': the engine picks the grid (capped at the preview's ceiling in the worker).
  const n: number | 'auto' = gridN === 'auto' ? 'auto' : Math.min(gridN, PREVIEW_MAX_N);

  function send(req: PreviewRequest) {
    workerRef.current?.postMessage(req);
  }
  function requestSurface(r: PreviewRule) {
    if (sampleSeq.current < 0) return;
    if (inFlight.current) {
      pending.current = r;
      return;
    }
    const s = ++seq.current;
    inFlight.current = { seq: s, sent: performance.now() };
    setStatus((st) => ({ ...st, phase: st.phase === 'sampling' ? 'sampling' : 'extracting' }));
    send({ type: 'surface', seq: s, sampleSeq: sampleSeq.current, rule: r, palette: coloursRef.current?.palette, mode: coloursRef.current?.mode });
  }

  useEffect(() => {
    let w: Worker;
    try {
      w = previewWorker.create();
    } catch (err) {
      setStatus((s) => ({ ...s, phase: 'error', error: `The preview could not start: ${err instanceof Error ? err.message : String(err)}` }));
      return;
    }
    workerRef.current = w;
    w.onmessage = (ev: MessageEvent<PreviewResponse>) => {
      const msg = ev.data;
      if (msg.type === 'sampled') {
        if (msg.seq !== sampleSeq.current) return;
        setStatus((s) => ({ ...s, sampleMs: msg.ms, n: typeof msg.n === 'number' ? msg.n : s.n }));
        return;
      }
      if (inFlight.current && msg.seq === inFlight.current.seq) {
        const sent = inFlight.current.sent;
        inFlight.current = null;
        if (msg.type === 'surface' && msg.sampleSeq === sampleSeq.current) {
          const geoms = msg.surfaces.map((s) => ({ phase: s.phase, geometry: geometryFromArrays(s) }));
          setSurfaces(geoms);
          setStatus((s) => ({
            ...s,
            phase: 'ready',
            extractMs: msg.ms.total,
            updateMs: performance.now() - sent,
            triangles: msg.triangles,
            enclosed: msg.enclosed,
            enclosedError: msg.enclosedError ?? null,
            enclosedInBox: msg.enclosedInBox ?? null,
            warnings: msg.warnings ?? [],
            isovalue: msg.isovalue,
            n: msg.grid?.n ?? s.n,
            maxAbs: msg.maxAbs ?? s.maxAbs,
            error: null,
          }));
        } else if (msg.type === 'error') {
          setStatus((s) => ({ ...s, phase: 'error', error: msg.message, maxAbs: msg.maxAbs ?? s.maxAbs }));
        }
        const next = pending.current;
        pending.current = null;
        if (next) requestSurface(next);
      } else if (msg.type === 'error' && msg.seq === sampleSeq.current) {
        setStatus((s) => ({ ...s, phase: 'error', error: msg.message }));
      }
    };
    w.onerror = (ev) => {
      setStatus((s) => ({ ...s, phase: 'error', error: `The preview stopped: ${ev.message || 'worker error'}` }));
    };
    return () => {
      w.terminate();
      workerRef.current = null;
    };
  }, []);

  // Free the previous set of geometries once it is replaced (after React committed the new one).
  useEffect(() => () => disposeGeometries(surfaces), [surfaces]);

  const stateKey = state ? JSON.stringify(state) : '';
  useEffect(() => {
    if (!state || !workerRef.current) return;
    const s = ++seq.current;
    sampleSeq.current = s;
    inFlight.current = null;
    pending.current = null;
    setStatus((st) => ({ ...st, phase: 'sampling', error: null, maxAbs: null }));
    send({ type: 'sample', seq: s, state, n, extent });
    if (ruleRef.current) requestSurface(ruleRef.current);
    // stateKey stands for the state's content
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [stateKey, n, extent]);

  const ruleKey = rule ? JSON.stringify(rule) : '';
  const firstRule = useRef(true);
  useEffect(() => {
    if (firstRule.current) {
      firstRule.current = false;
      return;
    }
    if (rule) requestSurface(rule);
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [ruleKey]);

  return { surfaces, status, previewN: n === 'auto' ? status.n || PREVIEW_MAX_N : n };
}
