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

/** Default tolerance of 3D files, relative to the surface's half-width (see above). */
export const TOLERANCE_3D_RELATIVE = 3.5e-5;

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

/** Distance (a0) the surface may deviate by in a 3D file: TOLERANCE_3D_RELATIVE × the surface's half-width. */
export function fileTolerance(surfaceHalfWidth: number): number {
  if (!(surfaceHalfWidth > 0) || !Number.isFinite(surfaceHalfWidth)) throw new RangeError(`surface half-width must be a positive length (got ${surfaceHalfWidth})`);
  return TOLERANCE_3D_RELATIVE * surfaceHalfWidth;
}

/** Distance (a0) the surface may deviate by in an image of widthPx × heightPx framed as the render page frames it. */
export function printTolerance(out: OutputScale, surfaceHalfWidth: number): number {
  const { widthPx, heightPx } = out;
  if (!Number.isInteger(widthPx) || widthPx < 1 || !Number.isInteger(heightPx) || heightPx < 1) throw new RangeError(`image size must be whole pixels >= 1 (got ${widthPx} × ${heightPx})`);
  if (!(surfaceHalfWidth > 0) || !Number.isFinite(surfaceHalfWidth)) throw new RangeError(`surface half-width must be a positive length (got ${surfaceHalfWidth})`);
  const zoom = out.camera?.zoom ?? 1;
  if (!(zoom > 0)) throw new RangeError(`camera.zoom must be positive (got ${zoom})`);
  const a0PerPixel = (2 * surfaceHalfWidth) / (zoom * Math.min(widthPx, heightPx));
  const perspective = (out.camera?.projection ?? 'perspective') === 'perspective';
  const fov = out.camera?.fovDeg ?? 35;
  const near = perspective ? 1 - Math.sin(((fov / 2) * Math.PI) / 180) : 1;
  return 0.25 * a0PerPixel * near;
}
