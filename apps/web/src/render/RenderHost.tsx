import { useCallback, useEffect, useImperativeHandle, useRef, useState, type Ref } from 'react';
import { Canvas, useThree } from '@react-three/fiber';
import type * as THREE from 'three';
import type { CheckedRequest } from './request';
import type { PhaseGeometry } from '../scene/geometry';
import { OrbitalScene, type PlacedInfo } from '../scene/OrbitalScene';
import { useRenderTarget, type RenderTarget } from './useRenderTarget';

/** One scene to draw: a single figure, or one panel of a set (its palette, the nominal cell aspect, the shared radius). */
export interface SceneJob {
  req: CheckedRequest;
  surfaces: PhaseGeometry[];
  palette?: CheckedRequest['recipe']['palette'];
  aspect?: number;
  frameRadius?: number;
}

/** What the page's render functions get from the host: the renderer, the mounted scene, the target, and mount/unmount. */
export interface RenderHandle {
  readonly gl: THREE.WebGLRenderer;
  readonly scene: THREE.Scene;
  readonly target: RenderTarget;
  /** Mounts the scene and resolves once its camera is placed (and every child committed). */
  mount(job: SceneJob): Promise<PlacedInfo>;
  /** Unmounts the scene (before its geometries are disposed) and shrinks the target. */
  unmount(): Promise<void>;
}

const MOUNT_TIMEOUT_MS = 20_000;

interface Mounted extends SceneJob {
  id: number;
}

interface BridgeProps {
  handle: Ref<RenderHandle>;
  mountJob(job: SceneJob): Promise<PlacedInfo>;
  clearJob(): Promise<void>;
  onReady(): void;
  onError(message: string): void;
}

/**
 * Inside the Canvas: exposes the renderer, scene and the owned render target through the host's handle, then says the
 * page is ready (effects run after the handle is attached, so a caller never sees "ready" without a handle).
 */
function Bridge({ handle, mountJob, clearJob, onReady, onError }: BridgeProps) {
  const gl = useThree((s) => s.gl);
  const scene = useThree((s) => s.scene);
  const target = useRenderTarget();
  useImperativeHandle(
    handle,
    () => ({
      gl,
      scene,
      target,
      mount: mountJob,
      unmount: async () => {
        await clearJob();
        target.target.setSize(1, 1);
      },
    }),
    [gl, scene, target, mountJob, clearJob],
  );
  useEffect(() => {
    if (gl.capabilities.isWebGL2) onReady();
    else onError('WebGL2 is not available in this browser');
  }, [gl, onReady, onError]);
  return null;
}

/**
 * The render page's React host: one Canvas (frameloop "never": frames are drawn by the page's render functions
 * through `gl.render`), the scene of the current job, and an imperative handle (no module globals, no state setter
 * escaping the component). `onReady` fires once the WebGL2 context exists; `onError` when it cannot.
 */
export function RenderHost({ ref, onReady, onError }: { ref: Ref<RenderHandle>; onReady(): void; onError(message: string): void }) {
  const [job, setJob] = useState<Mounted | null>(null);
  const waiter = useRef<{ id: number; resolve(info: PlacedInfo): void } | null>(null);
  const nextId = useRef(1);

  // Stable callbacks (they only touch state setters and refs), so the handle does not change with every job.
  const mountJob = useCallback(async (next: SceneJob): Promise<PlacedInfo> => {
    const id = nextId.current++;
    const placed = new Promise<PlacedInfo>((resolve) => (waiter.current = { id, resolve }));
    setJob({ id, ...next });
    let timer: ReturnType<typeof setTimeout> | undefined;
    const timeout = new Promise<never>((_, reject) => (timer = setTimeout(() => reject(new Error('the scene did not mount within 20 s')), MOUNT_TIMEOUT_MS)));
    try {
      const info = await Promise.race([placed, timeout]);
      // One more task so every child of the scene (outlines, axes) has committed.
      await new Promise((r) => setTimeout(r, 0));
      return info;
    } finally {
      clearTimeout(timer);
    }
  }, []);
  const clearJob = useCallback(async (): Promise<void> => {
    waiter.current = null;
    setJob(null);
    await new Promise((r) => setTimeout(r, 0));
  }, []);

  return (
    <Canvas
      flat
      dpr={1}
      frameloop="never"
      gl={{ antialias: false, alpha: true, preserveDrawingBuffer: false }}
    >
      <Bridge handle={ref} mountJob={mountJob} clearJob={clearJob} onReady={onReady} onError={onError} />
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
            if (waiter.current?.id === job.id) waiter.current.resolve(info);
          }}
        />
      )}
    </Canvas>
  );
}
