// How close to the true surface a mesh must be, derived from where it goes.
//
// A print: a quarter of a printed pixel at the export's scale, so no facet or chord error can move an edge of the
// silhouette by a visible amount (a quarter pixel is below the half-pixel at which anti-aliased edges change
// their rounding; common practice). The scale is bounded from the framing rule of the render page
// (apps/web/src/scene/framing.ts, placeCamera): a sphere of the surface's radius R, times a margin >= 1, fills
// the narrower image side divided by the zoom, so one pixel covers at least 2 R / (zoom min(width, height)) a0
// on the target plane. Perspective views magnify the near side of the figure by up to d / (d - R) with
// d >= R / sin(fov / 2), hence the factor (1 - sin(fov / 2)). Using the surface's half-width (<= its radius)
// for R only makes the tolerance smaller, never larger.
//
// A 3D file (GLB, STL) has no scale of its own. Its default, TOLERANCE_3D_RELATIVE of the surface's half-width, is
// chosen so that the file is exact for every raster Psiform can export from it: the largest raster is 64 megapixels
// (@psiform/contracts RASTER_LIMITS), so its shorter side is at most 8000 px, whose quarter pixel at the default
// camera (perspective 35°, zoom 1) is 0.25 × 2 / 8000 × (1 − sin 17.5°) = 4.4e-5 of the half-width (printTolerance
// below). 3.5e-5 keeps a margin under that and puts the 90 % surface of 1s (half-width 2.66 a0) within 1e-4 a0. A
// finer default would only add triangles no export can show (each halving of the tolerance doubles them: the chord
// error of an edge grows with its length squared); a print finer still (zoomed camera) re-meshes for itself
// (apps/worker mesh-assets printGlb). Measured in `npm run bench` (exact section): 1s to 5s, 3d, 4f at this default.

// That alone made every 3D file as heavy as the most detailed state needs (the 90 % surface of 4f_xyz: 1.27 M
// triangles, 38 MB; 2p_z 12 MB) and a mesh job took seconds whatever grid it asked for, since refinement, not the
// grid, sets the triangle count. So the default is also bounded by a budget: FILE_TRIANGLE_BUDGET triangles. A
// triangle's chord error grows with its edge length squared, so a triangle whose worst point lies d from the surface
// becomes about d / tol triangles within tol (splitting an edge in k quarters the error k² times, but only along
// the direction of curvature it needs), and the projected mesh's triangles give the count a tolerance costs:
// sum over triangles of max(1, K d / tol), K = REFINE_OVERHEAD (red-green splitting makes more triangles than that
// ideal; measured on the 1s sphere). The tolerance the budget reaches solves count = budget (bisection: the count
// falls as the tolerance grows).
// The default is the coarser of the two: a file is exact for every raster export unless that needs more than the
// budget, and then as exact as the budget allows; the tolerance met is stated in the result (refinement), and a
// render finer than it re-meshes for itself (apps/worker mesh-assets printGlb), so no print loses detail. The
// budget is what the 1s surface needs at its 1e-4 a0 (about 2.8e5 triangles, 8.5 MB as GLB), so the smallest,
// simplest state keeps that target and no default file is heavier than it (bench exact section).

const { PI, max, min, sin, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/** Default tolerance of 3D files, relative to the surface's half-width (see above). */
export const TOLERANCE_3D_RELATIVE = 3.5e-5;

/** Triangles a default 3D file is refined to at most (see above). */
export const FILE_TRIANGLE_BUDGET = 300_000;

/** The part of a recipe's camera (@psiform/contracts cameraSchema) the pixel scale depends on. */
export interface OutputCamera {
  projection?: 'perspective' | 'orthographic';
  fovDeg?: number;
  zoom?: number;
}

export interface OutputScale {
  widthPx: number;
  heightPx: number;
  camera?: OutputCamera;
}

/** Triangles refinement makes per ideal piece (see above; measured 1.28 to 1.51 for 1s, 2p_z, 3d_z², 5s at 3.5e-5 of their half-widths). */
export const REFINE_OVERHEAD = 1.4;

/** Triangles refinement is expected to make from triangles whose worst points lie `deviations` from the surface. */
export function refinedTriangles(deviations: ArrayLike<number>, tolerance: number): number {
  let count = 0;
  for (let i = 0; i < deviations.length; i++) count += max(1, (REFINE_OVERHEAD * deviations[i]) / tolerance);
  return count;
}

/**
 * Distance (a0) the surface may deviate by in a 3D file: TOLERANCE_3D_RELATIVE × the surface's half-width, or
 * coarser when the projected mesh (each triangle's worst deviation, `deviations`) would need more than
 * FILE_TRIANGLE_BUDGET triangles to get there (see above).
 */
export function fileTolerance(surfaceHalfWidth: number, deviations?: ArrayLike<number>): number {
  if (!(surfaceHalfWidth > 0) || !Number.isFinite(surfaceHalfWidth)) throw new RangeError(`surface half-width must be a positive length (got ${surfaceHalfWidth})`);
  const exact = TOLERANCE_3D_RELATIVE * surfaceHalfWidth;
  if (!deviations || deviations.length >= FILE_TRIANGLE_BUDGET || refinedTriangles(deviations, exact) <= FILE_TRIANGLE_BUDGET) return exact;
  let lo = exact;
  let hi = exact;
  while (refinedTriangles(deviations, hi) > FILE_TRIANGLE_BUDGET) hi *= 2;
  for (let it = 0; it < 40 && hi / lo > 1.01; it++) {
    const mid = sqrt(lo * hi);
    if (refinedTriangles(deviations, mid) > FILE_TRIANGLE_BUDGET) lo = mid;
    else hi = mid;
  }
  return hi;
}

/** Distance (a0) the surface may deviate by in an image of widthPx × heightPx framed as the render page frames it. */
export function printTolerance(out: OutputScale, surfaceHalfWidth: number): number {
  const { widthPx, heightPx } = out;
  if (!Number.isInteger(widthPx) || widthPx < 1 || !Number.isInteger(heightPx) || heightPx < 1) throw new RangeError(`image size must be whole pixels >= 1 (got ${widthPx} × ${heightPx})`);
  if (!(surfaceHalfWidth > 0) || !Number.isFinite(surfaceHalfWidth)) throw new RangeError(`surface half-width must be a positive length (got ${surfaceHalfWidth})`);
  const zoom = out.camera?.zoom ?? 1;
  if (!(zoom > 0)) throw new RangeError(`camera.zoom must be positive (got ${zoom})`);
  const a0PerPixel = (2 * surfaceHalfWidth) / (zoom * min(widthPx, heightPx));
  const perspective = (out.camera?.projection ?? 'perspective') === 'perspective';
  const fov = out.camera?.fovDeg ?? 35;
  const near = perspective ? 1 - sin(((fov / 2) * PI) / 180) : 1;
  return 0.25 * a0PerPixel * near;
}
