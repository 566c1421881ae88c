import type { AssetKind } from '@psiform/contracts';

/** Content-derived keys: equal content gives equal keys, so re-runs overwrite nothing new and never duplicate. */
export function meshKey(recipeHash: string, engineVersion: string, grid: string, kind: Extract<AssetKind, 'glb' | 'stl'>): string {
  return `meshes/${recipeHash}/${engineVersion}/${grid}/mesh.${kind}`;
}

/**
 * Renders and exports (png, svg, bundle): keyed by the bytes themselves under the version's recipe hash, so an
 * identical re-render reuses object and row, and a different one (a newer render page) never overwrites.
 */
export function exportKey(recipeHash: string, sha256: string, ext: 'png' | 'svg' | 'zip' | 'tif' | 'pdf'): string {
  return `exports/${recipeHash}/${sha256}.${ext}`;
}

/** Final home of an uploaded cube (always stored as NRRD). */
export function uploadKey(sha256: string): string {
  return `uploads/${sha256}/cube.nrrd`;
}

/** Where an upload streams to while it is checked; removed on failure, copied to uploadKey on success. */
export function uploadTempKey(id: string): string {
  return `tmp/uploads/${id}`;
}

export const CONTENT_TYPES: Record<AssetKind, string> = {
  glb: 'model/gltf-binary',
  stl: 'model/stl',
  ply: 'application/octet-stream',
  obj: 'text/plain',
  nrrd: 'application/octet-stream',
  png: 'image/png',
  svg: 'image/svg+xml',
  bundle: 'application/zip',
  tiff: 'image/tiff',
  pdf: 'application/pdf',
  softproof: 'image/png',
};
