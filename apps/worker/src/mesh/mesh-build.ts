import { UnrecoverableError } from 'bullmq';
import type { Recipe } from '@psiform/contracts';
import { AssetStore, CONTENT_TYPES, ObjectStorage, meshKey, type MeshStage, type NewAsset } from '@psiform/server';
import { MODEL_NOTE } from '@psiform/meshing';
import { SamplingBufferPool, type SamplingBuffers } from '@psiform/orbitals/node';
import { cubeFromNrrd, encode, extract, gridLabel, nodalSurface, sampleComputed, surfaceStats, threshold, type Field, type Surface } from './mesh-pipeline';

export interface MeshBuildInput {
  recipe: Recipe;
  version: { id: string; recipeHash: string };
  publicationId: string;
}

export interface MeshBuild {
  /** glb then stl, stored; rows to insert with the job's completion. */
  assets: NewAsset[];
  files: { glb: Uint8Array; stl: Uint8Array };
  surfaces: Surface[];
  /** The stats written on both assets. */
  stats: Record<string, unknown>;
  timings: Record<string, number>;
}

/**
 * Sampling buffers reused by every mesh build of this process (issue "Stays up and stays scoped": a worker's RSS grew
 * by about 200 MB per 384³ job because each job's fresh SharedArrayBuffer stayed reachable from the idle sampling
 * threads). A set is made only when every existing one is in use, so the pool holds one set per job that ever ran at
 * the same time (the worker's concurrency), each the size of the largest grid seen; 64 is only a ceiling.
 */
const samplingBuffers = new SamplingBufferPool(64);

const ms = (t0: number) => Math.round((performance.now() - t0) * 10) / 10;

/**
 * The mesh computation of a figure version: sampling -> threshold -> extracting -> encoding -> storing; `stage`
 * is awaited on entering each one (the mesh job writes them to its row; render/export jobs that need a mesh first
 * report one "meshing" stage). Objects are stored under content-derived keys; the caller inserts the rows.
 */
export async function buildMesh(
  deps: { assets: AssetStore; storage: ObjectStorage; engineVersion: string },
  input: MeshBuildInput,
  stage: (s: Exclude<MeshStage, 'queued' | 'done'>) => Promise<void>,
): Promise<MeshBuild> {
  if (input.recipe.source?.kind === 'upload') return buildMeshWith(deps, input, stage, undefined);
  // The field is a view into the buffers until the meshes are encoded: hold them for the whole build.
  return samplingBuffers.with((into) => buildMeshWith(deps, input, stage, into));
}

async function buildMeshWith(
  deps: { assets: AssetStore; storage: ObjectStorage; engineVersion: string },
  input: MeshBuildInput,
  stage: (s: Exclude<MeshStage, 'queued' | 'done'>) => Promise<void>,
  into: SamplingBuffers | undefined,
): Promise<MeshBuild> {
  const { recipe, version, publicationId } = input;
  const timings: Record<string, number> = {};
  const total = performance.now();

  await stage('sampling');
  let t0 = performance.now();
  const field = await sampleField(deps, recipe, into);
  timings.sample = ms(t0);

  await stage('threshold');
  t0 = performance.now();
  const level = threshold(field, recipe.surface);
  timings.threshold = ms(t0);

  await stage('extracting');
  t0 = performance.now();
  const surfaces = extract(field, level);
  const nodal = nodalSurface(field, level, recipe);
  timings.extract = ms(t0);
  t0 = performance.now();
  const stats = surfaceStats(surfaces);
  timings.stats = ms(t0);

  await stage('encoding');
  t0 = performance.now();
  const grid = field.kind === 'orbital' ? field.grid : { n: Math.max(...field.source.sizes), extent: recipe.grid.extent === 'auto' ? 0 : recipe.grid.extent, sizes: field.source.sizes };
  const rule = recipe.surface.rule === 'enclosed' ? { rule: 'enclosed', fraction: recipe.surface.fraction } : { rule: 'psi', value: recipe.surface.value };
  const summary = {
    model: MODEL_NOTE,
    engineVersion: deps.engineVersion,
    recipeHash: version.recipeHash,
    surfaceRule: rule,
    isovalue: level.isovalue,
    enclosed: level.enclosed,
    grid,
    source: recipe.source?.kind === 'upload' ? { kind: 'upload', quantity: recipe.source.quantity, sha256: recipe.source.sha256 } : { kind: 'computed' },
  };
  const files = await encode(surfaces, recipe, summary, deps.engineVersion, nodal);
  timings.encode = ms(t0);

  await stage('storing');
  t0 = performance.now();
  const label = gridLabel(recipe);
  const out: NewAsset[] = [];
  const statsJson = { ...summary, surfaces: stats, timings_ms: { ...timings } };
  for (const kind of ['glb', 'stl'] as const) {
    const stored = await deps.assets.storeObject(meshKey(version.recipeHash, deps.engineVersion, label, kind), files[kind], CONTENT_TYPES[kind]);
    out.push({ figureVersionId: version.id, publicationId, kind, storageKey: stored.key, bytes: stored.bytes, sha256: stored.sha256, stats: statsJson });
  }
  timings.store = ms(t0);
  timings.total = ms(total);
  return { assets: out, files, surfaces, stats: statsJson, timings };
}

async function sampleField(deps: { assets: AssetStore; storage: ObjectStorage }, recipe: Recipe, into: SamplingBuffers | undefined): Promise<Field> {
  const src = recipe.source;
  if (src?.kind === 'upload') {
    const asset = await deps.assets.findById(src.assetId);
    if (!asset) throw new UnrecoverableError(`uploaded cube ${src.assetId} no longer exists`);
    if (asset.sha256 !== src.sha256) throw new UnrecoverableError('uploaded cube does not match the recipe (sha256)');
    return cubeFromNrrd(await deps.storage.get(asset.storageKey), src);
  }
  return sampleComputed(recipe, { into });
}
