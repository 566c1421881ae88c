import { Injectable } from '@nestjs/common';
import { AssetStore, ENGINE_VERSION, MESH_PROGRESS, ObjectStorage, type TrackedJobHandler, type TrackedOutcome, type TrackedRun } from '@psiform/server';
import { buildMesh } from './mesh-assets';
import { versionOf } from '../render/tracked-job';

/**
 * Mesh jobs: sampling -> threshold -> extracting -> encoding -> storing -> done, each stage written to the Job
 * row by the runner (what the api streams). Outputs go to content-derived keys (recipe hash, engine version, grid),
 * stored idempotently, and the asset rows plus the completion are one transaction (the runner's), so a retried or
 * re-delivered job (a killed worker) ends with the same single pair of glb/stl rows.
 */
@Injectable()
export class MeshJobProcessor implements TrackedJobHandler<'mesh'> {
  readonly kind = 'tracked';
  readonly name = 'mesh';
  readonly progress = MESH_PROGRESS;

  constructor(
    private readonly assets: AssetStore,
    private readonly storage: ObjectStorage,
    private readonly engineVersion: string = ENGINE_VERSION,
  ) {}

  async run(t: TrackedRun<'mesh'>): Promise<TrackedOutcome> {
    const { version, recipe } = versionOf(t.ctx);
    const built = await buildMesh(
      { assets: this.assets, storage: this.storage, engineVersion: this.engineVersion },
      { recipe, version, publicationId: t.ctx.job.publicationId },
      (stage) => t.stage(stage),
    );
    const { timings, assets: out } = built;
    // The runner calls the after-mesh hook (the figure's thumbnail) once these rows are stored, as for every job that meshes.
    t.madeMesh(version.id);
    return { timings, assets: out };
  }
}
