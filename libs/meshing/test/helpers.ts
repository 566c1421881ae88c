import { extractIsosurface, type ExtractOptions } from '../src/marching-cubes';

/** Sample f on an n³ grid with origin o and spacing h (x fastest). */
export function sampleField(n: number, o: number, h: number, f: (x: number, y: number, z: number) => number): Float32Array {
  const out = new Float32Array(n * n * n);
  for (let k = 0; k < n; k++)
    for (let j = 0; j < n; j++)
      for (let i = 0; i < n; i++) out[i + n * (j + n * k)] = f(o + h * i, o + h * j, o + h * k);
  return out;
}

export function extractCube(field: Float32Array, n: number, o: number, h: number, level: number, opts: ExtractOptions) {
  return extractIsosurface(field, { nx: n, ny: n, nz: n }, { origin: [o, o, o], spacing: h }, level, opts);
}

export function triNormal(P: Float32Array, I: Uint32Array, f: number): [number, number, number] {
  const a = I[3 * f] * 3, b = I[3 * f + 1] * 3, c = I[3 * f + 2] * 3;
  const u = [P[b] - P[a], P[b + 1] - P[a + 1], P[b + 2] - P[a + 2]];
  const v = [P[c] - P[a], P[c + 1] - P[a + 1], P[c + 2] - P[a + 2]];
  return [u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]];
}
