/**
 * What the worker shares with the api (`@psiform/api/pipeline`): the schema (entities, data source options;
 * migrations stay with the api, which runs them), the Job-row and asset adapters, the S3 adapter, storage
 * keys, job routing and the engine version. One definition of each, compiled once; no Nest modules here.
 */
export { ENTITIES, dataSourceOptions } from '../db/schema';
export { FigureEntity } from '../figures/figure.entity';
export { FigureVersionEntity } from '../figures/figure-version.entity';
export { AssetEntity } from '../assets/asset.entity';
export { JobEntity, type JobType } from '../jobs/job.entity';
export { JobsStore, TypeormJobsStore, type JobContext, type NewAsset, type NewJob } from '../jobs/jobs.repository';
export { AssetStore, S3AssetStore, sha256Hex, type StoredObject } from '../assets/asset-store';
export { ObjectStorage, type ObjectHead } from '../infra/storage/object-storage';
export { S3ObjectStorage } from '../infra/storage/s3-object-storage';
export { FigureSetEntity } from '../exports/figure-set.entity';
export { meshKey, exportKey, uploadKey, uploadTempKey, CONTENT_TYPES } from './storage-keys';
export { DEFAULT_JOB_OPTIONS, JOB_ROUTES, MESH_PROGRESS, type JobPayload, type MeshStage, type RoutedJobType } from './mesh-job';
export { ENGINE_VERSION } from './engine';
export { recipeHash } from '../figures/recipe-input';
export { nrrdHeaderFor } from '../uploads/cube-check';
export { assetsDir, assetPath } from './assets-dir';
