// Camera framing and light placement shared by the studio viewport and the headless render page, so an
// export frames the figure exactly as the screen does. Pure three.js maths (no React).
import * as THREE from 'three';
import type { Recipe } from '@psiform/contracts';

export type CameraSpec = Recipe['stage']['camera'];
export type ViewName = CameraSpec['view'];

/** Our three-quarter view: from the front-right, 28° above the xy plane (z, the quantisation axis, is up). */
export const THREE_QUARTER = { azimuthDeg: -55, elevationDeg: 28 } as const;

/** Unit vector (z up) from azimuth (from +x towards +y) and elevation (above the xy plane), in degrees. */
export function fromAngles(azDeg: number, elDeg: number): THREE.Vector3 {
  const az = THREE.MathUtils.degToRad(azDeg);
  const el = THREE.MathUtils.degToRad(elDeg);
  return new THREE.Vector3(Math.cos(el) * Math.cos(az), Math.cos(el) * Math.sin(az), Math.sin(el));
}

/**
 * Where the camera sits, seen from the target: along +x, along −y (so +x points right), from +z (tilted a
 * hair so "up" stays defined), the three-quarter view, or the saved free-orbit position.
 */
export function viewDirection(camera: CameraSpec): THREE.Vector3 {
  switch (camera.view) {
    case 'axis_x':
      return new THREE.Vector3(1, 0, 0);
    case 'axis_y':
      return new THREE.Vector3(0, -1, 0);
    case 'axis_z':
      return new THREE.Vector3(0, -1e-4, 1).normalize();
    case 'free':
      if (camera.position) {
        const v = new THREE.Vector3(...camera.position).sub(new THREE.Vector3(...camera.target));
        if (v.lengthSq() > 0) return v.normalize();
      }
      return fromAngles(THREE_QUARTER.azimuthDeg, THREE_QUARTER.elevationDeg);
    default:
      return fromAngles(THREE_QUARTER.azimuthDeg, THREE_QUARTER.elevationDeg);
  }
}

/** Largest distance of any vertex from the nucleus (a0): a tight, rotation-independent size for framing. */
export function maxRadius(geometries: readonly THREE.BufferGeometry[]): number {
  let r2 = 0;
  for (const g of geometries) {
    const p = g.getAttribute('position');
    if (!p) continue;
    const a = p.array as ArrayLike<number>;
    for (let i = 0; i + 2 < a.length; i += 3) {
      const d = a[i] * a[i] + a[i + 1] * a[i + 1] + a[i + 2] * a[i + 2];
      if (d > r2) r2 = d;
    }
  }
  return r2 > 0 ? Math.sqrt(r2) : 1;
}

/** Margin around the figure: the lobes fill 1/1.12 of the shorter side, leaving room for label and scale bar. */
export const FRAME_MARGIN = 1.12;

export interface Framing {
  /** World units (a0) per image pixel at the target plane, for an image `heightPx` tall. */
  unitsPerPixel(heightPx: number): number;
  /** Visible height in a0 at the target plane. */
  visibleHeight: number;
}

/**
 * Puts the camera for the recipe's view: perspective at the distance that fits a sphere of `radius` in the
 * narrower field of view; orthographic with a frustum of the same size. zoom > 1 moves in.
 * The free view keeps its saved distance. Also sets near/far and the projection (aspect = width/height).
 */
export function placeCamera(
  camera: THREE.PerspectiveCamera | THREE.OrthographicCamera,
  spec: CameraSpec,
  radius: number,
  aspect: number,
): Framing {
  const target = new THREE.Vector3(...spec.target);
  const dir = viewDirection(spec);
  const r = Math.max(radius, 1e-3) * FRAME_MARGIN;
  const zoom = spec.zoom || 1;
  camera.up.set(0, 0, 1);
  let visibleHeight: number;
  if ((camera as THREE.PerspectiveCamera).isPerspectiveCamera) {
    const cam = camera as THREE.PerspectiveCamera;
    cam.fov = spec.fovDeg;
    cam.aspect = aspect;
    const vHalf = THREE.MathUtils.degToRad(spec.fovDeg) / 2;
    const hHalf = Math.atan(Math.tan(vHalf) * aspect);
    const half = Math.min(vHalf, hHalf);
    let distance = r / Math.sin(half) / zoom;
    if (spec.view === 'free' && spec.position) {
      const saved = new THREE.Vector3(...spec.position).distanceTo(target);
      if (saved > 0) distance = saved;
    }
    cam.position.copy(target).addScaledVector(dir, distance);
    cam.near = Math.max(distance - 4 * r, distance / 200);
    cam.far = distance + 4 * r;
    visibleHeight = 2 * distance * Math.tan(vHalf);
  } else {
    const cam = camera as THREE.OrthographicCamera;
    const halfH = (aspect >= 1 ? r : r / aspect) / zoom;
    cam.top = halfH;
    cam.bottom = -halfH;
    cam.left = -halfH * aspect;
    cam.right = halfH * aspect;
    cam.zoom = 1;
    const distance = 6 * r;
    cam.position.copy(target).addScaledVector(dir, distance);
    cam.near = distance / 100;
    cam.far = distance + 6 * r;
    visibleHeight = 2 * halfH;
  }
  camera.lookAt(target);
  camera.updateProjectionMatrix();
  camera.updateMatrixWorld();
  return { visibleHeight, unitsPerPixel: (h) => visibleHeight / h };
}

/** Visible height (a0) at the target plane for a camera as it is now (after the user orbited or zoomed). */
export function visibleHeightNow(camera: THREE.Camera, target: THREE.Vector3): number {
  if ((camera as THREE.PerspectiveCamera).isPerspectiveCamera) {
    const cam = camera as THREE.PerspectiveCamera;
    return 2 * cam.position.distanceTo(target) * Math.tan(THREE.MathUtils.degToRad(cam.fov) / 2);
  }
  const cam = camera as THREE.OrthographicCamera;
  return (cam.top - cam.bottom) / cam.zoom;
}

/**
 * Light position in camera space: azimuth measured from the viewing direction towards the camera's right,
 * elevation towards the camera's up, so a light keeps its place on the figure whatever the view.
 */
export function lightOffset(azimuthDeg: number, elevationDeg: number, distance = 100): THREE.Vector3 {
  const az = THREE.MathUtils.degToRad(azimuthDeg);
  const el = THREE.MathUtils.degToRad(elevationDeg);
  return new THREE.Vector3(Math.sin(az) * Math.cos(el), Math.sin(el), Math.cos(az) * Math.cos(el)).multiplyScalar(distance);
}
