// The one figure scene (R3F), drawn by the studio viewport, the figure page and the headless render page,
// so an export looks like the screen. z (the quantisation axis) is up; lengths are in a0.
import { useEffect, useLayoutEffect, useMemo, useRef } from 'react';
import { useFrame, useThree } from '@react-three/fiber';
import { OrbitControls } from '@react-three/drei';
import * as THREE from 'three';
import type { Recipe } from '@psiform/contracts';
import { lightOffset, maxRadius, placeCamera, type Framing } from './framing';
import { boundaryEdges, splitNodal, type Phase, type PhaseGeometry } from './geometry';
import { inkFor } from './overlay';

export interface PlacedInfo {
  camera: THREE.PerspectiveCamera | THREE.OrthographicCamera;
  radius: number;
  framing: Framing;
}

export interface OrbitalSceneProps {
  /** Lobe surfaces per phase; an entry of phase 'nodal' (from the GLB or the preview) is drawn only as the nodal outline. */
  surfaces: readonly PhaseGeometry[];
  palette: Pick<Recipe['palette'], 'positive' | 'negative'>;
  stage: Recipe['stage'];
  annotations: Recipe['annotations'];
  /** Image width / height; default: the canvas' own. */
  aspect?: number;
  /** Overrides stage.background.transparent (export option). */
  transparent?: boolean;
  /** Framing radius in a0 instead of the surfaces' own (figure sets: the largest panel's, one scale for all). */
  frameRadius?: number;
  /** Free orbit with the mouse (studio, figure page). */
  controls?: boolean;
  /** After the camera was placed for the current view (each change of view, size or surfaces). */
  onPlaced?(info: PlacedInfo): void;
  /** Each drawn frame (cheap work only: no React state). */
  onFrame?(camera: THREE.Camera, radius: number, invalidate: () => void): void;
  /** The user finished turning or zooming: the pose to keep as the free view. */
  onOrbitEnd?(pose: { position: [number, number, number]; target: [number, number, number]; zoom: number }): void;
}

export const AXIS_LENGTH = 1.1; // × figure radius
/** With axes shown the frame grows so the arrow heads and letters stay inside. */
export const AXES_FRAME = 1.22;
/** Axis tips (for the overlay's letters): slightly beyond the arrow heads. */
export function axisTips(radius: number): { text: string; at: THREE.Vector3 }[] {
  const L = radius * AXIS_LENGTH * 1.08;
  return [
    { text: 'x', at: new THREE.Vector3(L, 0, 0) },
    { text: 'y', at: new THREE.Vector3(0, L, 0) },
    { text: 'z', at: new THREE.Vector3(0, 0, L) },
  ];
}

function useMaterials(palette: OrbitalSceneProps['palette'], material: Recipe['stage']['material']) {
  const { gloss, opacity } = material;
  const materials = useMemo(() => {
    const common = {
      roughness: 1 - 0.7 * gloss,
      metalness: 0,
      side: THREE.DoubleSide,
      transparent: opacity < 1,
      opacity,
      depthWrite: opacity >= 1,
    };
    return {
      '+': new THREE.MeshStandardMaterial({ ...common, color: new THREE.Color(palette.positive), name: 'phase +' }),
      '-': new THREE.MeshStandardMaterial({ ...common, color: new THREE.Color(palette.negative), name: 'phase \u2212' }),
      complex: new THREE.MeshStandardMaterial({ ...common, vertexColors: true, name: 'phase (complex)' }),
    } satisfies Record<Phase, THREE.MeshStandardMaterial>;
  }, [palette.positive, palette.negative, gloss, opacity]);
  useDisposeWhenReplaced(materials);
  return materials;
}

type Disposable = { dispose(): void };

/**
 * Frees the GPU objects a useMemo made (each value of `parts`, or each item of an array value) when the memo makes
 * new ones or the component goes: three does not free geometry and materials on its own (three.js manual,
 * "How to dispose of objects").
 */
function useDisposeWhenReplaced(parts: Record<string, Disposable | Disposable[]>) {
  useEffect(() => () => Object.values(parts).forEach((p) => (Array.isArray(p) ? p : [p]).forEach((x) => x.dispose())), [parts]);
}

function Axes({ radius, ink }: { radius: number; ink: string }) {
  const parts = useMemo(() => {
    const L = radius * AXIS_LENGTH;
    const t = radius * 0.006;
    const shaft = new THREE.CylinderGeometry(t, t, 2 * L, 12, 1);
    const head = new THREE.ConeGeometry(t * 3.2, t * 11, 16, 1);
    head.translate(0, L, 0);
    const mat = new THREE.MeshBasicMaterial({ color: new THREE.Color(ink) });
    return { shaft, head, mat };
  }, [radius, ink]);
  useDisposeWhenReplaced(parts);
  // Cylinders run along +y: rotate onto x and z.
  const rotations: [number, number, number][] = [
    [0, 0, -Math.PI / 2],
    [0, 0, 0],
    [Math.PI / 2, 0, 0],
  ];
  return (
    <group name="axes">
      {rotations.map((r, i) => (
        <group key={i} rotation={r}>
          <mesh geometry={parts.shaft} material={parts.mat} />
          <mesh geometry={parts.head} material={parts.mat} />
        </group>
      ))}
    </group>
  );
}

function Nucleus({ radius, ink }: { radius: number; ink: string }) {
  const geo = useMemo(() => new THREE.SphereGeometry(radius * 0.028, 24, 16), [radius]);
  const mat = useMemo(() => new THREE.MeshStandardMaterial({ color: new THREE.Color(ink), roughness: 0.5 }), [ink]);
  useEffect(() => () => geo.dispose(), [geo]);
  useEffect(() => () => mat.dispose(), [mat]);
  return <mesh name="nucleus" geometry={geo} material={mat} />;
}

/**
 * stage.material.nodalOutline: the nodal surfaces (psi = 0) where they cut the figure, as a faint translucent ink
 * film with a thin ink line where it ends at the lobes. Unlit, so it stays quiet under any light.
 */
function NodalOutline({ geometries, ink }: { geometries: readonly THREE.BufferGeometry[]; ink: string }) {
  const parts = useMemo(() => {
    const film = new THREE.MeshBasicMaterial({ color: new THREE.Color(ink), transparent: true, opacity: 0.18, side: THREE.DoubleSide, depthWrite: false, name: 'nodal' });
    const line = new THREE.LineBasicMaterial({ color: new THREE.Color(ink), transparent: true, opacity: 0.7, name: 'nodal edge' });
    const edges = geometries.map((g) => {
      const e = new THREE.BufferGeometry();
      e.setAttribute('position', new THREE.BufferAttribute(boundaryEdges(g), 3));
      return e;
    });
    return { film, line, edges };
  }, [geometries, ink]);
  useDisposeWhenReplaced(parts);
  return (
    <group name="nodal">
      {geometries.map((g, i) => (
        <group key={g.uuid}>
          <mesh geometry={g} material={parts.film} renderOrder={2} name="nodal" />
          <lineSegments geometry={parts.edges[i]} material={parts.line} renderOrder={3} name="nodal edge" />
        </group>
      ))}
    </group>
  );
}

/** Key, fill and rim lights in a rig that turns with the camera (see lightOffset), plus ambient light. */
function LightRig({ lights, rigRef }: { lights: Recipe['stage']['lights']; rigRef: React.RefObject<THREE.Group | null> }) {
  const { key, fill, rim, ambient } = lights;
  return (
    <>
      <ambientLight intensity={ambient} />
      <group ref={rigRef} name="light-rig">
        {[key, fill, rim].map((l, i) => (
          <directionalLight key={i} position={lightOffset(l.azimuthDeg, l.elevationDeg).toArray()} intensity={l.intensity} color={l.color} />
        ))}
      </group>
    </>
  );
}

export function OrbitalScene(props: OrbitalSceneProps) {
  const { palette, stage, annotations, controls } = props;
  const split = useMemo(() => splitNodal(props.surfaces), [props.surfaces]);
  const surfaces = split.lobes;
  const set = useThree((s) => s.set);
  const size = useThree((s) => s.size);
  const invalidate = useThree((s) => s.invalidate);
  const aspect = props.aspect ?? (size.height > 0 ? size.width / size.height : 1);
  const ortho = stage.camera.projection === 'orthographic';

  const cameras = useMemo(() => {
    const p = new THREE.PerspectiveCamera(stage.camera.fovDeg, aspect, 0.1, 1000);
    const o = new THREE.OrthographicCamera(-1, 1, 1, -1, 0.1, 1000);
    // R3F would reset aspect and frustum on resize; placeCamera owns the projection.
    (p as unknown as { manual: boolean }).manual = true;
    (o as unknown as { manual: boolean }).manual = true;
    return { p, o };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);
  const camera = ortho ? cameras.o : cameras.p;

  const radius = useMemo(() => props.frameRadius ?? maxRadius(surfaces.map((s) => s.geometry)), [surfaces, props.frameRadius]);
  const rig = useRef<THREE.Group>(null);
  const orbit = useRef<{ target: THREE.Vector3; update(): void } | null>(null);
  const callbacks = useRef(props);
  callbacks.current = props;
  const camKey = JSON.stringify(stage.camera);

  useLayoutEffect(() => {
    set({ camera });
  }, [camera, set]);

  useLayoutEffect(() => {
    const framing = placeCamera(camera, stage.camera, annotations.axes ? radius * AXES_FRAME : radius, aspect);
    rig.current?.quaternion.copy(camera.quaternion);
    rig.current?.updateMatrixWorld(true);
    if (orbit.current) {
      orbit.current.target.set(...stage.camera.target);
      orbit.current.update();
    }
    callbacks.current.onPlaced?.({ camera, radius, framing });
    invalidate();
    // camKey stands for stage.camera's content
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [camera, camKey, radius, aspect, invalidate, annotations.axes]);

  useFrame(({ camera: cam, invalidate: again }) => {
    if (rig.current && !rig.current.quaternion.equals(cam.quaternion)) {
      rig.current.quaternion.copy(cam.quaternion);
      rig.current.updateMatrixWorld(true);
    }
    callbacks.current.onFrame?.(cam, radius, again);
  });

  const materials = useMaterials(palette, stage.material);
  const transparent = props.transparent ?? stage.background.transparent;
  const bg = transparent ? null : stage.background.color;
  const ink = inkFor(bg);
  const scene = useThree((s) => s.scene);
  const bgColor = useMemo(() => (bg ? new THREE.Color(bg) : null), [bg]);
  useLayoutEffect(() => {
    scene.background = bgColor;
    invalidate();
  }, [scene, bgColor, invalidate]);

  return (
    <>
      <LightRig lights={stage.lights} rigRef={rig} />
      <group name="surfaces">
        {surfaces.map((s, i) => (
          <mesh key={`${s.phase}-${i}-${s.geometry.uuid}`} geometry={s.geometry} material={materials[s.phase]} name={`phase ${s.phase}`} />
        ))}
      </group>
      {stage.material.nodalOutline && split.nodal.length > 0 && <NodalOutline geometries={split.nodal} ink={ink} />}
      {annotations.axes && <Axes radius={radius} ink={ink} />}
      {annotations.nucleus && <Nucleus radius={radius} ink={ink} />}
      {controls && (
        <OrbitControls
          ref={orbit as never}
          makeDefault
          enableDamping={false}
          target={stage.camera.target}
          onEnd={() => {
            const c = camera;
            const t = orbit.current?.target ?? new THREE.Vector3();
            callbacks.current.onOrbitEnd?.({
              position: [c.position.x, c.position.y, c.position.z],
              target: [t.x, t.y, t.z],
              zoom: ortho ? (stage.camera.zoom || 1) * c.zoom : stage.camera.zoom || 1,
            });
          }}
        />
      )}
    </>
  );
}
