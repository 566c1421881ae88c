import { useEffect, useMemo } from 'react';
import { useThree } from '@react-three/fiber';
import * as THREE from 'three';

/** An off-screen target the render page draws regions into, and how its pixels read back. */
export interface RenderTarget {
  target: THREE.WebGLRenderTarget;
  /** Half-float colour (EXT_color_buffer_float): linear values keep their precision until the sRGB encode. */
  float: boolean;
}

/**
 * Owns one multisampled render target for the component's lifetime and disposes it on unmount (after drei's `useFBO`,
 * src/core/Fbo.tsx: memoised on its settings, disposed in an effect clean-up). Callers size it per region with
 * `setSize` (three frees the old GPU buffers on a size change) and shrink it to 1 × 1 after a job, so a page that has
 * drawn a large print keeps no large buffers between jobs.
 */
export function useRenderTarget(samples = 4): RenderTarget {
  const gl = useThree((s) => s.gl);
  const float = gl.extensions.has('EXT_color_buffer_float');
  const target = useMemo(
    () =>
      new THREE.WebGLRenderTarget(1, 1, {
        type: float ? THREE.HalfFloatType : THREE.UnsignedByteType,
        format: THREE.RGBAFormat,
        colorSpace: THREE.LinearSRGBColorSpace,
        depthBuffer: true,
        samples,
      }),
    [float, samples],
  );
  useEffect(() => () => target.dispose(), [target]);
  return useMemo(() => ({ target, float }), [target, float]);
}
