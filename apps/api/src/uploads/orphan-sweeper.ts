import { Inject, Injectable, Logger, type OnApplicationBootstrap, type OnApplicationShutdown } from '@nestjs/common';
import { APP_CONFIG, AssetStore, ObjectStorage, type AppConfig } from '@psiform/server';

/** Where uploads live (pipeline/storage-keys.ts: uploadTempKey, uploadKey). */
const TEMP_PREFIX = 'tmp/uploads/';
const CUBE_PREFIX = 'uploads/';

export interface SweepResult {
  tempObjects: number;
  unfinishedUploads: number;
  unreferencedCubes: number;
}

/**
 * Removes what an upload leaves behind when its API process dies mid-way (issue "Stays up and stays scoped"): the
 * temporary object, the parts of an unfinished multipart upload, and a cube copied to its final key whose figure
 * rows were never written. Only leftovers older than UPLOAD_ORPHAN_AGE_SECONDS are touched, so an upload still in
 * progress (in this process or another) keeps its objects. Runs shortly after start-up and then periodically;
 * deletes are idempotent, so several API processes may sweep at once. (A real S3 bucket can also abort unfinished
 * uploads by a lifecycle rule; the storage fake cannot.)
 */
@Injectable()
export class UploadOrphanSweeper implements OnApplicationBootstrap, OnApplicationShutdown {
  private readonly log = new Logger('UploadOrphanSweeper');
  private timer: NodeJS.Timeout | undefined;
  private running: Promise<unknown> | undefined;

  constructor(
    @Inject(APP_CONFIG) private readonly config: Pick<AppConfig, 'uploads'>,
    private readonly storage: ObjectStorage,
    private readonly assets: AssetStore,
  ) {}

  onApplicationBootstrap(): void {
    const ageMs = this.config.uploads.orphanAgeSeconds * 1000;
    const every = Math.min(Math.max(ageMs, 1000), 15 * 60_000);
    const tick = () => {
      this.running = this.sweep().catch((err: Error) => this.log.warn(`sweep failed (retried later): ${err.message}`));
    };
    this.timer = setInterval(tick, every);
    this.timer.unref();
    setTimeout(tick, Math.min(every, 2000)).unref();
  }

  async onApplicationShutdown(): Promise<void> {
    clearInterval(this.timer);
    await this.running;
  }

  async sweep(now = Date.now()): Promise<SweepResult> {
    const cutoff = now - this.config.uploads.orphanAgeSeconds * 1000;
    const result: SweepResult = { tempObjects: 0, unfinishedUploads: 0, unreferencedCubes: 0 };
    for (const u of await this.storage.listUnfinishedUploads(TEMP_PREFIX)) {
      if (u.initiated.getTime() >= cutoff) continue;
      await this.storage.abortUpload(u.key, u.uploadId);
      result.unfinishedUploads++;
    }
    for (const o of await this.storage.listDetailed(TEMP_PREFIX)) {
      if (o.lastModified.getTime() >= cutoff) continue;
      await this.storage.delete(o.key);
      result.tempObjects++;
    }
    for (const o of await this.storage.listDetailed(CUBE_PREFIX)) {
      if (o.lastModified.getTime() >= cutoff || (await this.assets.keyReferenced(o.key))) continue;
      await this.storage.delete(o.key);
      result.unreferencedCubes++;
    }
    const swept = result.tempObjects + result.unfinishedUploads + result.unreferencedCubes;
    if (swept) this.log.log(`swept upload leftovers: ${result.tempObjects} temporary objects, ${result.unfinishedUploads} unfinished uploads, ${result.unreferencedCubes} cubes no figure uses`);
    return result;
  }
}
