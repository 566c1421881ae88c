import { Component, useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { Callout, NonIdealState, Spinner } from '@blueprintjs/core';
import { Canvas, useFrame, useThree } from '@react-three/fiber';
import { OrbitControls } from '@react-three/drei';
import * as THREE from 'three';
import { GLTFLoader } from 'three/examples/jsm/loaders/GLTFLoader.js';
import type { Recipe } from '@psiform/contracts';

export interface FigureViewportProps {
  /** Presigned URL of the GLB (another origin; CORS allowed). */
  url: string;
  palette: Pick<Recipe['palette'], 'positive' | 'negative'>;
  stage: Recipe['stage'];
  /** Called once, after the GLB is in the scene and a frame of it has been drawn. */
  onReady?(): void;
}

type Phase = '+' | '-' | 'complex';

/**
 * Which phase a GLB primitive is: the encoder writes extras {phase} on the mesh and names the material
 * "phase +", "phase −" (U+2212) or "phase (complex)"; both are accepted, plus an ASCII minus.
 */
export function phaseOf(mesh: THREE.Mesh): Phase | null {
  const extra = mesh.userData?.phase;
  if (extra === '+' || extra === '-' || extra === 'complex') return extra;
  const mat = Array.isArray(mesh.material) ? mesh.material[0] : mesh.material;
  const name = (mat?.name ?? mesh.name ?? '').trim();
  if (/^phase\s*\+$/.test(name)) return '+';
  if (/^phase\s*[-\u2212]$/.test(name)) return '-';
  if (/^phase/.test(name)) return 'complex';
  return null;
}

function disposeObject(root: THREE.Object3D, alsoMaterials: boolean) {
  root.traverse((o) => {
    const mesh = o as THREE.Mesh;
    if (mesh.isMesh) {
      mesh.geometry?.dispose();
      if (alsoMaterials) {
        const mats = Array.isArray(mesh.material) ? mesh.material : [mesh.material];
        for (const m of mats) m?.dispose();
      }
    }
  });
}

/** Loads the GLB once per URL with three's GLTFLoader; the file's own materials are dropped (ours replace them). */
function useGlb(url: string): { scene: THREE.Group | null; error: string | null } {
  const [state, setState] = useState<{ scene: THREE.Group | null; error: string | null }>({ scene: null, error: null });
  useEffect(() => {
    let alive = true;
    setState({ scene: null, error: null });
    new GLTFLoader()
      .loadAsync(url)
      .then((gltf) => {
        const scene = gltf.scene;
        scene.traverse((o) => {
          const mesh = o as THREE.Mesh;
          if (!mesh.isMesh) return;
          mesh.userData.phase = phaseOf(mesh);
          const mats = Array.isArray(mesh.material) ? mesh.material : [mesh.material];
          for (const m of mats) m?.dispose();
        });
        if (alive) setState({ scene, error: null });
        else disposeObject(scene, false);
      })
      .catch((err: unknown) => {
        if (alive) setState({ scene: null, error: err instanceof Error ? err.message : String(err) });
      });
    return () => {
      alive = false;
    };
  }, [url]);
  // Geometry belongs to the loaded scene: freed when the scene is replaced or the viewport unmounts.
  useEffect(() => {
    const scene = state.scene;
    return () => {
      if (scene) disposeObject(scene, false);
    };
  }, [state.scene]);
  return state;
}

/** Direction (z up, the quantisation axis) from azimuth/elevation in degrees. */
function fromAngles(azDeg: number, elDeg: number): THREE.Vector3 {
  const az = THREE.MathUtils.degToRad(azDeg);
  const el = THREE.MathUtils.degToRad(elDeg);
  return new THREE.Vector3(Math.cos(el) * Math.cos(az), Math.cos(el) * Math.sin(az), Math.sin(el));
}

// Our three-quarter view: from the front-right, 28° above the xy plane (z, the quantisation axis, is up).
const VIEW_AZ = -55;
const VIEW_EL = 28;

function viewDirection(camera: Recipe['stage']['camera']): THREE.Vector3 {
  switch (camera.view) {
    case 'axis_x':
      return new THREE.Vector3(1, 0, 0);
    case 'axis_y':
      return new THREE.Vector3(0, -1, 0);
    case 'axis_z':
      return new THREE.Vector3(0.0001, -0.0001, 1).normalize();
    case 'free':
      if (camera.position) {
        const v = new THREE.Vector3(...camera.position).sub(new THREE.Vector3(...camera.target));
        if (v.lengthSq() > 0) return v.normalize();
      }
      return fromAngles(VIEW_AZ, VIEW_EL);
    default:
      return fromAngles(VIEW_AZ, VIEW_EL);
  }
}

/** Puts the model in the frame once per loaded scene, then reports readiness after a drawn frame. */
function Framing({ scene, camera: camSpec, onReady }: { scene: THREE.Group; camera: Recipe['stage']['camera']; onReady(): void }) {
  const camera = useThree((s) => s.camera) as THREE.PerspectiveCamera;
  const controls = useThree((s) => s.controls) as unknown as { target: THREE.Vector3; update(): void } | null;
  const invalidate = useThree((s) => s.invalidate);
  const frames = useRef(0);
  const reported = useRef(false);

  useLayoutEffect(() => {
    const box = new THREE.Box3().setFromObject(scene);
    const sphere = box.isEmpty() ? new THREE.Sphere(new THREE.Vector3(), 1) : box.getBoundingSphere(new THREE.Sphere());
    const r = Math.max(sphere.radius, 1e-3);
    const fov = THREE.MathUtils.degToRad(camera.fov);
    // The bounding sphere of a lobed shape is loose, so 0.9 of the sphere-fit distance still keeps it in frame.
    const distance = ((r / Math.sin(fov / 2)) * 0.9) / (camSpec.zoom || 1);
    camera.position.copy(sphere.center).addScaledVector(viewDirection(camSpec), distance);
    camera.near = distance / 100;
    camera.far = distance * 10;
    camera.updateProjectionMatrix();
    camera.lookAt(sphere.center);
    if (controls) {
      controls.target.copy(sphere.center);
      controls.update();
    }
    frames.current = 0;
    reported.current = false;
    invalidate();
  }, [scene, camera, controls, camSpec, invalidate]);

  // No state is set per frame: a counter in a ref, and one callback after the second frame (the first is drawn).
  useFrame(() => {
    if (reported.current) return;
    frames.current += 1;
    if (frames.current >= 2) {
      reported.current = true;
      onReady();
    } else {
      invalidate();
    }
  });
  return null;
}

function Model({ scene, palette, stage }: { scene: THREE.Group; palette: FigureViewportProps['palette']; stage: Recipe['stage'] }) {
  const { gloss, opacity } = stage.material;
  const materials = useMemo(() => {
    const common = {
      roughness: 1 - 0.7 * gloss,
      metalness: 0,
      side: THREE.DoubleSide,
      transparent: opacity < 1,
      opacity,
    };
    return {
      '+': new THREE.MeshStandardMaterial({ ...common, color: new THREE.Color(palette.positive), name: 'phase +' }),
      '-': new THREE.MeshStandardMaterial({ ...common, color: new THREE.Color(palette.negative), name: 'phase \u2212' }),
      complex: new THREE.MeshStandardMaterial({ ...common, vertexColors: true, name: 'phase (complex)' }),
    } satisfies Record<Phase, THREE.MeshStandardMaterial>;
  }, [palette.positive, palette.negative, gloss, opacity]);
  useEffect(() => () => Object.values(materials).forEach((m) => m.dispose()), [materials]);

  useLayoutEffect(() => {
    scene.traverse((o) => {
      const mesh = o as THREE.Mesh;
      if (!mesh.isMesh) return;
      const phase = (mesh.userData.phase as Phase | null) ?? (mesh.geometry.getAttribute('color') ? 'complex' : '+');
      mesh.material = materials[phase];
    });
  }, [scene, materials]);

  return <primitive object={scene} />;
}

function Lights({ stage }: { stage: Recipe['stage'] }) {
  const { key, fill, rim, ambient } = stage.lights;
  // Light azimuths are measured from the viewing direction, so the key light stays where the recipe says.
  const place = (l: typeof key) => fromAngles(VIEW_AZ + l.azimuthDeg, l.elevationDeg).multiplyScalar(100).toArray();
  return (
    <>
      <ambientLight intensity={ambient} />
      <directionalLight position={place(key)} intensity={key.intensity} color={key.color} />
      <directionalLight position={place(fill)} intensity={fill.intensity} color={fill.color} />
      <directionalLight position={place(rim)} intensity={rim.intensity} color={rim.color} />
    </>
  );
}

class CanvasBoundary extends Component<{ children: ReactNode }, { error: string | null }> {
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

/** The finished GLB in a turntable view: phase colours from the recipe's palette, orbit to inspect. */
export default function FigureViewport({ url, palette, stage, onReady }: FigureViewportProps) {
  const { scene, error } = useGlb(url);
  const [ready, setReady] = useState(false);
  const notify = useRef(onReady);
  notify.current = onReady;
  useEffect(() => setReady(false), [scene]);
  const handleReady = useCallback(() => {
    setReady(true);
    notify.current?.();
  }, []);
  const bg = stage.background.transparent ? null : stage.background.color;

  return (
    <div className="pf-viewport" data-testid="figure-viewport" data-ready={ready ? 'true' : 'false'}>
      {error && (
        <Callout intent="danger" title="The mesh could not be loaded" data-testid="viewport-error">
          {error}
        </Callout>
      )}
      {!error && !scene && <NonIdealState icon={<Spinner size={28} />} title="Loading the mesh…" />}
      {scene && (
        <CanvasBoundary>
          <Canvas
            className="pf-canvas"
            data-testid="viewport-canvas"
            flat
            dpr={1}
            frameloop="demand"
            gl={{ antialias: true, preserveDrawingBuffer: true }}
            camera={{ fov: stage.camera.fovDeg, up: [0, 0, 1], near: 0.1, far: 1000 }}
          >
            {bg && <color attach="background" args={[bg]} />}
            <Lights stage={stage} />
            <Model scene={scene} palette={palette} stage={stage} />
            <OrbitControls makeDefault enableDamping={false} />
            <Framing scene={scene} camera={stage.camera} onReady={handleReady} />
          </Canvas>
        </CanvasBoundary>
      )}
      <div className="pf-legend" aria-label="Phase colours">
        <span>
          <i style={{ background: palette.positive }} /> ψ &gt; 0
        </span>
        <span>
          <i style={{ background: palette.negative }} /> ψ &lt; 0
        </span>
        <span className="pf-muted">Drag to turn, scroll to zoom. z (the quantisation axis) points up.</span>
      </div>
      {ready && <span data-testid="viewport-ready" data-ready="true" hidden />}
    </div>
  );
}
