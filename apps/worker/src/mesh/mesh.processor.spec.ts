import { UnrecoverableError } from 'bullmq';
import { parseRecipe } from '@psiform/contracts';
import { AssetStore, JobsStore, ObjectStorage, meshKey, recipeHash, type JobContext, type NewAsset, type StoredObject } from '@psiform/server';
import { closeParallelSampler } from '@psiform/orbitals/node';
import type { AfterMesh, MeshDone } from '@psiform/server';
import { MeshJobProcessor } from './mesh.processor';
import { NoOutbox, lifecycle } from '../testing/lifecycle';

// Each job runs the real engine (all-space level, surface analysis, sampling on worker threads): allow for a busy machine.
jest.setTimeout(60_000);
afterAll(() => closeParallelSampler());

const recipe = (() => {
  const r = parseRecipe({ version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 20 }, surface: { rule: 'enclosed', fraction: 0.9 } });
  if (!r.ok) throw new Error('bad test recipe');
  return r.recipe;
})();

class FakeJobs extends JobsStore {
  log: string[] = [];
  completed: NewAsset[] = [];
  state = 'queued';
  version: JobContext['version'] = { id: 'v1', figureId: 'f1', number: 1, recipe, recipeHash: recipeHash(recipe), engineVersion: 'test-engine', authorId: 'u1', locked: false, createdAt: new Date() };
  async loadContext(id: string): Promise<JobContext | null> {
    if (id === GONE) return null;
    return {
      job: { id, state: this.state, assetIds: ['a1', 'a2'], publicationId: 'p1' } as JobContext['job'],
      figure: { id: 'f1' } as JobContext['figure'],
      version: this.version,
    };
  }
  async markActive(_id: string, attempt: number, stage: string) {
    this.log.push(`active:${attempt}:${stage}`);
  }
  async setStage(_id: string, stage: string, progress: number) {
    this.log.push(`${stage}:${progress}`);
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

class FakeAssets extends AssetStore {
  objects = new Map<string, Uint8Array>();
  failPuts = 0;
  async storeObject(key: string, bytes: Uint8Array): Promise<StoredObject> {
    if (this.failPuts > 0) {
      this.failPuts--;
      throw new Error('storage unreachable');
    }
    const reused = this.objects.has(key);
    this.objects.set(key, bytes);
    return { key, bytes: bytes.length, sha256: 'x'.repeat(64), reused };
  }
  findById = () => Promise.resolve(null);
  findByIds = () => Promise.resolve([]);
  findForVersion = () => Promise.resolve([]);
  keyReferenced = () => Promise.resolve(false);
  presignGet = () => Promise.resolve('');
  nameFacts = () => Promise.resolve(null);
}

const J1 = '0b6f7c1e-2d3a-4b5c-9d8e-7f6a5b4c3d2e';
const GONE = '9e8d7c6b-5a4f-4e3d-8c2b-1a0f9e8d7c6b';
const job = (attemptsMade = 0, id = J1) => ({ id: `bull-${id}`, name: 'mesh', data: { jobId: id, params: {} }, attemptsMade, opts: { attempts: 3 } });
/** The handler run through the job runner's own lifecycle (stages, retries, completion, failure recording). */
const runner = (jobs: FakeJobs, p: MeshJobProcessor, afterMesh?: AfterMesh) => ({
  process: (j: ReturnType<typeof job>) => lifecycle(jobs, new NoOutbox(), afterMesh).process('psiform-mesh', p, j),
  onFailed: (j: ReturnType<typeof job>, e: Error, final: boolean) => lifecycle(jobs, new NoOutbox()).recordFailure(p, j, e, final),
});

describe('MeshJobProcessor', () => {
  it('reports the stages in order, stores glb and stl under content-derived keys and completes with timings', async () => {
    const jobs = new FakeJobs();
    const assets = new FakeAssets();
    const p = runner(jobs, new MeshJobProcessor(assets, {} as ObjectStorage, 'test-engine'));
    const res = await p.process(job());
    expect(res).toEqual({ jobId: J1, assetIds: ['asset-0', 'asset-1'] });
    expect(jobs.log).toEqual(['active:1:sampling', 'threshold:40', 'extracting:50', 'encoding:75', 'storing:90', 'complete:encode,extract,sample,stats,store,threshold,total']);
    const h = jobs.version!.recipeHash;
    expect(jobs.completed.map((a) => [a.kind, a.storageKey, a.figureVersionId, a.publicationId])).toEqual([
      ['glb', meshKey(h, 'test-engine', '20', 'glb'), 'v1', 'p1'],
      ['stl', meshKey(h, 'test-engine', '20', 'stl'), 'v1', 'p1'],
    ]);
    const stats = jobs.completed[0].stats!;
    expect(stats.surfaces!.map((s) => s.phase)).toEqual(['+', '-']);
    expect(stats).toMatchObject({ engineVersion: 'test-engine', recipeHash: h, grid: { n: 20 } });
    // GLB magic "glTF" (glTF 2.0 spec, 4.4.3.1) and a binary STL of 84 + 50·F bytes.
    const glb = assets.objects.get(meshKey(h, 'test-engine', '20', 'glb'))!;
    expect(Buffer.from(glb.subarray(0, 4)).toString('latin1')).toBe('glTF');
    const stl = assets.objects.get(meshKey(h, 'test-engine', '20', 'stl'))!;
    const triangles = stats.surfaces!.reduce((n, s) => n + s.triangles, 0);
    expect(stl.length).toBe(84 + 50 * triangles);
  });

  it('a failed attempt with retries left goes back to queued with the error; the last one marks the row failed', async () => {
    const jobs = new FakeJobs();
    const assets = new FakeAssets();
    assets.failPuts = 2;
    const p = runner(jobs, new MeshJobProcessor(assets, {} as ObjectStorage, 'test-engine'));
    await expect(p.process(job(0))).rejects.toThrow('storage unreachable');
    expect(jobs.log.at(-1)).toBe('requeue:attempt 1 of 3 failed: storage unreachable; retrying');
    await expect(p.process(job(2))).rejects.toThrow('storage unreachable');
    expect(jobs.log.at(-1)).toBe('fail:storage unreachable');
  });

  it('a completed row is not redone; a missing row or an invalid stored recipe fails without retries', async () => {
    const jobs = new FakeJobs();
    const p = runner(jobs, new MeshJobProcessor(new FakeAssets(), {} as ObjectStorage, 'test-engine'));
    jobs.state = 'completed';
    await expect(p.process(job())).resolves.toEqual({ jobId: J1, assetIds: ['a1', 'a2'] });
    expect(jobs.log).toEqual([]);
    await expect(p.process(job(0, GONE))).rejects.toBeInstanceOf(UnrecoverableError);
    jobs.state = 'queued';
    jobs.version = { ...jobs.version!, recipe: { ...recipe, grid: { n: 4, extent: 'auto' } } };
    await expect(p.process(job(0))).rejects.toBeInstanceOf(UnrecoverableError);
    expect(jobs.log.at(-1)).toMatch(/^fail:the stored recipe is not valid: grid\.n: grid\.n must be 'auto' or a whole number from 16 to 384 \(got 4\)/);
  });

  it("the runner's after-mesh hook (thumbnails) runs after the completion; its failure is logged and the mesh job still succeeds", async () => {
    const jobs = new FakeJobs();
    const seen: unknown[] = [];
    const ok = runner(jobs, new MeshJobProcessor(new FakeAssets(), {} as ObjectStorage, 'test-engine'), async (d: MeshDone) => void seen.push({ ...d, log: [...jobs.log] }));
    await ok.process(job());
    expect(seen).toEqual([{ jobId: J1, figureId: 'f1', figureVersionId: 'v1', publicationId: 'p1', assetIds: ['asset-0', 'asset-1'], log: expect.arrayContaining([expect.stringMatching(/^complete:/)]) }]);
    const jobs2 = new FakeJobs();
    const failing = runner(jobs2, new MeshJobProcessor(new FakeAssets(), {} as ObjectStorage, 'test-engine'), () => Promise.reject(new Error('no browser')));
    await expect(failing.process(job())).resolves.toEqual({ jobId: J1, assetIds: ['asset-0', 'asset-1'] });
    expect(jobs2.log.some((l) => l.startsWith('fail:') || l.startsWith('requeue:'))).toBe(false);
  });

  it('a box that cuts the surface travels with the job result: warnings, all-space and in-box fractions on both assets', async () => {
    const jobs = new FakeJobs();
    const cut = parseRecipe({ version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 20, extent: 3 }, surface: { rule: 'enclosed', fraction: 0.9 } });
    if (!cut.ok) throw new Error('bad test recipe');
    jobs.version = { ...jobs.version!, recipe: cut.recipe, recipeHash: recipeHash(cut.recipe) };
    await runner(jobs, new MeshJobProcessor(new FakeAssets(), {} as ObjectStorage, 'test-engine')).process(job());
    for (const a of jobs.completed) {
      const s = a.stats as unknown as { warnings: { code: string }[]; enclosed: number; enclosedError: number; enclosedInBox: number; surfaces: { watertight: boolean }[]; units: { length: string }; conventions: string };
      expect(s.warnings.map((w: { code: string }) => w.code)).toContain('box-cuts-surface');
      expect(Math.abs(s.enclosed - 0.9)).toBeLessThanOrEqual(s.enclosedError);
      expect(s.enclosedInBox).toBeLessThan(0.9);
      expect(s.surfaces.every((x: { watertight: boolean }) => x.watertight === false)).toBe(true);
      expect(s.units.length).toMatch(/a0/);
      expect(s.conventions).toMatch(/Condon–Shortley/);
    }
  });

  it('onFailed marks the row failed only when BullMQ gives up', async () => {
    const jobs = new FakeJobs();
    const p = runner(jobs, new MeshJobProcessor(new FakeAssets(), {} as ObjectStorage));
    await p.onFailed(job(), new Error('job stalled more than allowable limit'), false);
    expect(jobs.log).toEqual([]);
    await p.onFailed(job(), new Error('job stalled more than allowable limit'), true);
    expect(jobs.log).toEqual(['fail:job stalled more than allowable limit']);
  });
});
