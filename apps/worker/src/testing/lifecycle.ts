import { AssetStore, JobLifecycle, JobsStore, OutboxStore, type AfterMesh, type AssetEntity, type JobContext, type NewAsset, type OutboxEntity, type StoredObject } from '@psiform/server';

/** An outbox with no rows (jobs added straight to a queue, as the unit specs do); records done/failed marks. */
export class NoOutbox extends OutboxStore {
  marks: string[] = [];
  enqueue = () => Promise.reject(new Error('unused'));
  relayDue = () => Promise.reject(new Error('unused'));
  claimStale = () => Promise.reject(new Error('unused'));
  redrive = () => Promise.reject(new Error('unused'));
  async findById(): Promise<OutboxEntity | null> {
    return null;
  }
  async markDone(id: string) {
    this.marks.push(`done:${id}`);
  }
  async markFailed(id: string, error: string) {
    this.marks.push(`failed:${id}:${error}`);
  }
}

/** Jobs the specs never touch the rows of. */
export class NoJobs extends JobsStore {
  request = () => Promise.reject(new Error('unused'));
  staleQueued = () => Promise.reject(new Error('unused'));
  redriveQueued = () => Promise.reject(new Error('unused'));
  findById = () => Promise.reject(new Error('unused'));
  loadContext = () => Promise.reject(new Error('unused'));
  markActive = () => Promise.reject(new Error('unused'));
  setStage = () => Promise.reject(new Error('unused'));
  requeue = () => Promise.reject(new Error('unused'));
  fail = () => Promise.reject(new Error('unused'));
  complete = () => Promise.reject(new Error('unused'));
}

/** The runner's own lifecycle over fake stores: handlers are unit-tested through exactly the code the runner uses. */
export function lifecycle(jobs: JobsStore = new NoJobs(), outbox: OutboxStore = new NoOutbox(), afterMesh?: AfterMesh): JobLifecycle {
  return new JobLifecycle(jobs, outbox, afterMesh);
}

/**
 * A jobs store that records what the lifecycle writes, for handler specs: `log` has `active:<try>:<stage>`,
 * `<stage>:<progress>`, `requeue:<message>`, `fail:<message>`, `complete:<timing keys>`; `stages` only the stage names;
 * `completed` the asset rows of the completion. The spec overrides loadContext.
 */
export class RecordingJobs extends JobsStore {
  log: string[] = [];
  stages: string[] = [];
  completed: NewAsset[] = [];
  /** The spec's job: override. */
  async loadContext(_id: string): Promise<JobContext | null> {
    return null;
  }
  async markActive(_id: string, attempt: number, stage: string) {
    this.log.push(`active:${attempt}:${stage}`);
    this.stages.push(stage);
  }
  async setStage(_id: string, stage: string, progress: number) {
    this.log.push(`${stage}:${progress}`);
    this.stages.push(stage);
  }
  async requeue(_id: string, error: string) {
    this.log.push(`requeue:${error}`);
  }
  async fail(_id: string, error: string) {
    this.log.push(`fail:${error}`);
  }
  async complete(_id: string, timings: Record<string, number>, assets: NewAsset[]) {
    this.log.push(`complete:${Object.keys(timings).sort().join(',')}`);
    this.completed = assets;
    return assets.map((_, i) => `asset-${i}`);
  }
  request = () => Promise.reject(new Error('unused'));
  staleQueued = () => Promise.reject(new Error('unused'));
  redriveQueued = () => Promise.reject(new Error('unused'));
  findById = () => Promise.reject(new Error('unused'));
}

/** An asset store with no rows: specs override the methods they need (findForVersion, storeObject). */
export class EmptyAssets extends AssetStore {
  async storeObject(key: string, bytes: Uint8Array): Promise<StoredObject> {
    return { key, bytes: bytes.length, sha256: 'x'.repeat(64), reused: false };
  }
  async findById(): Promise<AssetEntity | null> {
    return null;
  }
  async findByIds(): Promise<AssetEntity[]> {
    return [];
  }
  async findForVersion(_id: string): Promise<AssetEntity[]> {
    return [];
  }
  async keyReferenced(): Promise<boolean> {
    return false;
  }
  async presignGet(): Promise<string> {
    return '';
  }
  async nameFacts(): Promise<null> {
    return null;
  }
}
