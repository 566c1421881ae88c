import { UnrecoverableError } from 'bullmq';
import { parseRecipe, type Recipe } from '@psiform/contracts';
import { AssetStore, JobsStore, ObjectStorage, meshKey, recipeHash, sha256Hex, type AssetEntity, type FigureVersionEntity, type JobContext, type NewAsset, type StoredObject } from '@psiform/server';
import { closeParallelSampler } from '@psiform/orbitals/node';
import { RenderJobProcessor } from './render.processor';
import type { FigureRenderer, RenderRequest } from './figure-renderer';
import type { FigureSetsStore, FiguresStore } from '@psiform/server';
import { NoOutbox, lifecycle } from '../testing/lifecycle';

// Ids are UUIDs: the job contract checks the render payload's figure-set and panel ids.
const VX = '1a2b3c4d-0001-4000-8000-00000000000a';
const VZ = '1a2b3c4d-0002-4000-8000-00000000000b';
const SET1 = '1a2b3c4d-0003-4000-8000-00000000000c';
const FIG_VX = '1a2b3c4d-0004-4000-8000-00000000000d';
const FIG_VZ = '1a2b3c4d-0005-4000-8000-00000000000e';
const J1 = '1a2b3c4d-0006-4000-8000-00000000000f';

// Fresh meshes run the real engine (all-space level, surface analysis, sampling): allow for a busy machine.
jest.setTimeout(60_000);
afterAll(() => closeParallelSampler());

const recipeFor = (m: number, label: string): Recipe => {
  const r = parseRecipe({ version: 1, label, content: { Z: 1, terms: [{ n: 2, l: 1, m, basis: 'real', re: 1 }] }, grid: { n: 20 }, surface: { rule: 'enclosed', fraction: 0.9 } });
  if (!r.ok) throw new Error('bad test recipe');
  return r.recipe;
};
const version = (id: string, recipe: Recipe) => ({ id, figureId: id === VX ? FIG_VX : FIG_VZ, number: 1, recipe, recipeHash: recipeHash(recipe), engineVersion: 'test-engine', authorId: 'u1', locked: false, createdAt: new Date() }) as FigureVersionEntity;
const vx = version(VX, recipeFor(1, '2p_x'));
const vz = version(VZ, recipeFor(0, '2p_z'));
const params = { format: 'png' as const, widthPx: 300, heightPx: 100, dpi: 300, figureSetId: SET1, columns: 2, title: 'p', panels: [{ figureId: FIG_VX, figureVersionId: VX }, { figureId: FIG_VZ, figureVersionId: VZ }] };

class FakeJobs extends JobsStore {
  log: string[] = [];
  completed: NewAsset[] = [];
  async loadContext(id: string): Promise<JobContext | null> {
    return { job: { id, state: 'queued', assetIds: [], publicationId: 'p1', params } as unknown as JobContext['job'], figure: null, version: null };
  }
  async markActive(_id: string, _a: number, stage: string) {
    this.log.push(stage);
  }
  async setStage(_id: string, stage: string) {
    this.log.push(stage);
  }
  async requeue(_id: string, error: string) {
    this.log.push(`requeue:${error}`);
  }
  async fail(_id: string, error: string) {
    this.log.push(`fail:${error}`);
  }
  async complete(_id: string, _t: Record<string, number>, assets: NewAsset[]) {
    this.completed = assets;
    return assets.map((_, i) => `asset-${i}`);
  }
  request = () => Promise.reject(new Error('unused'));
  staleQueued = () => Promise.reject(new Error('unused'));
  redriveQueued = () => Promise.reject(new Error('unused'));
  findById = () => Promise.reject(new Error('unused'));
}

/** vx already has its mesh (glb + stl rows); vz has none, so the job meshes it with the mesh job's code. */
class FakeAssets extends AssetStore {
  keys: string[] = [];
  async storeObject(key: string, bytes: Uint8Array): Promise<StoredObject> {
    this.keys.push(key);
    return { key, bytes: bytes.length, sha256: 'y'.repeat(64), reused: false };
  }
  findForVersion = async (id: string) =>
    id === VX
      ? (['glb', 'stl'] as const).map((kind) => ({ id: `old-${kind}`, figureVersionId: VX, publicationId: 'p1', kind, storageKey: meshKey(vx.recipeHash, 'test-engine', '20', kind), bytes: 4, sha256: 'z'.repeat(64), stats: {} }) as unknown as AssetEntity)
      : [];
  findById = () => Promise.resolve(null);
  findByIds = () => Promise.resolve([]);
  keyReferenced = () => Promise.resolve(false);
  presignGet = () => Promise.resolve('');
  nameFacts = () => Promise.resolve(null);
}

const storage = { get: async (key: string) => new TextEncoder().encode(`stored:${key}`) } as unknown as ObjectStorage;

function fakeRenderer(seen: RenderRequest[]): FigureRenderer {
  return {
    render: async (req: RenderRequest) => {
      seen.push(req);
      return { png: new Uint8Array([1, 2, 3]), widthPx: req.widthPx, heightPx: req.heightPx, tiles: 1, triangles: 10, ms: { page: 0, load: 1, render: 2, encode: 3, finish: 0, total: 6 } };
    },
  } as unknown as FigureRenderer;
}

const bull = { id: 'bull-1', name: 'render', data: { jobId: J1, params }, attemptsMade: 0, opts: { attempts: 3 } };
/** The handler through the job runner's own lifecycle. */
const run = (jobs: FakeJobs, p: RenderJobProcessor) => lifecycle(jobs, new NoOutbox()).process('psiform-render', p, bull) as Promise<{ jobId: string; assetIds: string[] }>;

describe('RenderJobProcessor, figure sets', () => {
  it('renders the panels in order (stored GLB for one, a fresh mesh for the other), stores a set PNG and points the set at it', async () => {
    const jobs = new FakeJobs();
    const assets = new FakeAssets();
    const seen: RenderRequest[] = [];
    const pointed: [string, string][] = [];
    const sets = { versions: async (ids: string[]) => ids.map((id) => (id === VX ? vx : id === VZ ? vz : null)), setPng: async (s: string, a: string) => {
        pointed.push([s, a]);
        return true;
      } } as unknown as FigureSetsStore;
    const p = new RenderJobProcessor(assets, storage, fakeRenderer(seen), {} as FiguresStore, 'test-engine', sets);
    const res = await run(jobs, p);
    expect(jobs.log).toEqual(['meshing', 'rendering', 'encoding', 'storing']);
    expect(seen).toHaveLength(1);
    expect(seen[0]).toMatchObject({ widthPx: 300, heightPx: 100, dpi: 300, columns: 2 });
    expect(seen[0].panels!.map((x) => x.recipe.label)).toEqual(['2p_x', '2p_z']);
    expect(new TextDecoder().decode(seen[0].panels![0].glb)).toBe(`stored:${meshKey(vx.recipeHash, 'test-engine', '20', 'glb')}`);
    expect(Buffer.from(seen[0].panels![1].glb.subarray(0, 4)).toString('latin1')).toBe('glTF');
    // Fresh mesh rows for vz, then the set's PNG: no figure version, the publication's, stats naming the set.
    expect(jobs.completed.map((a) => [a.kind, a.figureVersionId])).toEqual([
      ['glb', VZ],
      ['stl', VZ],
      ['png', null],
    ]);
    expect(jobs.completed[2]).toMatchObject({ publicationId: 'p1', stats: { figureSetId: SET1, widthPx: 300, heightPx: 100, panels: [{ figureVersionId: VX }, { figureVersionId: VZ }] } });
    // Content-derived: the panels' recipe hashes in order name the folder, the PNG's own sha256 the file.
    const folder = sha256Hex(new TextEncoder().encode(`${vx.recipeHash},${vz.recipeHash}`));
    expect(jobs.completed[2].storageKey).toBe(`exports/${folder}/${sha256Hex(new Uint8Array([1, 2, 3]))}.png`);
    expect(res.assetIds).toEqual(['asset-0', 'asset-1', 'asset-2']);
    expect(pointed).toEqual([[SET1, 'asset-2']]);
  });

  it('a panel whose version is gone fails the job at once, naming the panel', async () => {
    const jobs = new FakeJobs();
    const sets = { versions: async (ids: string[]) => ids.map((id) => (id === VX ? vx : null)), setPng: async () => true } as unknown as FigureSetsStore;
    const p = new RenderJobProcessor(new FakeAssets(), storage, fakeRenderer([]), {} as FiguresStore, 'test-engine', sets);
    await expect(run(jobs, p)).rejects.toBeInstanceOf(UnrecoverableError);
    expect(jobs.log).toEqual([`fail:panel 2: figure version ${VZ} no longer exists`]);
  });
});
