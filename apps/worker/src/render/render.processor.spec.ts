import { UnrecoverableError } from 'bullmq';
import { parseRecipe, type Recipe } from '@psiform/contracts';
import { AssetStore, JobsStore, ObjectStorage, meshKey, recipeHash, sha256Hex, type AssetEntity, type FigureVersionEntity, type JobContext, type NewAsset, type StoredObject } from '@psiform/server';
import { closeParallelSampler } from '@psiform/orbitals/node';
import { RenderJobProcessor } from './render.processor';
import type { FigureRenderer, RenderRequest } from './figure-renderer';
import type { FigureSetStore } from './figure-sets';
import type { ThumbnailStore } from './thumbnails';

// Fresh meshes run the real engine (all-space level, surface analysis, sampling): allow for a busy machine.
jest.setTimeout(60_000);
afterAll(() => closeParallelSampler());

const recipeFor = (m: number, label: string): Recipe => {
  const r = parseRecipe({ version: 1, label, content: { Z: 1, terms: [{ n: 2, l: 1, m, basis: 'real', re: 1 }] }, grid: { n: 20 }, surface: { rule: 'enclosed', fraction: 0.9 } });
  if (!r.ok) throw new Error('bad test recipe');
  return r.recipe;
};
const version = (id: string, recipe: Recipe) => ({ id, figureId: `fig-${id}`, number: 1, recipe, recipeHash: recipeHash(recipe), engineVersion: 'test-engine', authorId: 'u1', locked: false, createdAt: new Date() }) as FigureVersionEntity;
const vx = version('vx', recipeFor(1, '2p_x'));
const vz = version('vz', recipeFor(0, '2p_z'));
const params = { format: 'png', widthPx: 300, heightPx: 100, dpi: 300, figureSetId: 'set1', columns: 2, title: 'p', panels: [{ figureId: 'fig-vx', figureVersionId: 'vx' }, { figureId: 'fig-vz', figureVersionId: 'vz' }] };

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
  insert = () => Promise.reject(new Error('unused'));
  setBullJobId = () => Promise.reject(new Error('unused'));
  remove = () => Promise.reject(new Error('unused'));
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
    id === 'vx'
      ? (['glb', 'stl'] as const).map((kind) => ({ id: `old-${kind}`, figureVersionId: 'vx', publicationId: 'p1', kind, storageKey: meshKey(vx.recipeHash, 'test-engine', '20', kind), bytes: 4, sha256: 'z'.repeat(64), stats: {} }) as unknown as AssetEntity)
      : [];
  findById = () => Promise.resolve(null);
  findByIds = () => Promise.resolve([]);
  keyReferenced = () => Promise.resolve(false);
  presignGet = () => Promise.resolve('');
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

const bull = { id: 'j1', name: 'render', data: { jobId: 'j1' }, attemptsMade: 0, opts: { attempts: 3 } };

describe('RenderJobProcessor, figure sets', () => {
  it('renders the panels in order (stored GLB for one, a fresh mesh for the other), stores a set PNG and points the set at it', async () => {
    const jobs = new FakeJobs();
    const assets = new FakeAssets();
    const seen: RenderRequest[] = [];
    const pointed: [string, string][] = [];
    const sets = { versions: async (ids: string[]) => ids.map((id) => (id === 'vx' ? vx : id === 'vz' ? vz : null)), setPng: async (s: string, a: string) => {
        pointed.push([s, a]);
        return true;
      } } as unknown as FigureSetStore;
    const p = new RenderJobProcessor(jobs, assets, storage, fakeRenderer(seen), {} as ThumbnailStore, 'test-engine', sets);
    const res = await p.process(bull);
    expect(jobs.log).toEqual(['meshing', 'rendering', 'encoding', 'storing']);
    expect(seen).toHaveLength(1);
    expect(seen[0]).toMatchObject({ widthPx: 300, heightPx: 100, dpi: 300, columns: 2 });
    expect(seen[0].panels!.map((x) => x.recipe.label)).toEqual(['2p_x', '2p_z']);
    expect(new TextDecoder().decode(seen[0].panels![0].glb)).toBe(`stored:${meshKey(vx.recipeHash, 'test-engine', '20', 'glb')}`);
    expect(Buffer.from(seen[0].panels![1].glb.subarray(0, 4)).toString('latin1')).toBe('glTF');
    // Fresh mesh rows for vz, then the set's PNG: no figure version, the publication's, stats naming the set.
    expect(jobs.completed.map((a) => [a.kind, a.figureVersionId])).toEqual([
      ['glb', 'vz'],
      ['stl', 'vz'],
      ['png', null],
    ]);
    expect(jobs.completed[2]).toMatchObject({ publicationId: 'p1', stats: { figureSetId: 'set1', widthPx: 300, heightPx: 100, panels: [{ figureVersionId: 'vx' }, { figureVersionId: 'vz' }] } });
    // Content-derived: the panels' recipe hashes in order name the folder, the PNG's own sha256 the file.
    const folder = sha256Hex(new TextEncoder().encode(`${vx.recipeHash},${vz.recipeHash}`));
    expect(jobs.completed[2].storageKey).toBe(`exports/${folder}/${sha256Hex(new Uint8Array([1, 2, 3]))}.png`);
    expect(res.assetIds).toEqual(['asset-0', 'asset-1', 'asset-2']);
    expect(pointed).toEqual([['set1', 'asset-2']]);
  });

  it('a panel whose version is gone fails the job at once, naming the panel', async () => {
    const jobs = new FakeJobs();
    const sets = { versions: async (ids: string[]) => ids.map((id) => (id === 'vx' ? vx : null)), setPng: async () => true } as unknown as FigureSetStore;
    const p = new RenderJobProcessor(jobs, new FakeAssets(), storage, fakeRenderer([]), {} as ThumbnailStore, 'test-engine', sets);
    await expect(p.process(bull)).rejects.toBeInstanceOf(UnrecoverableError);
    expect(jobs.log).toEqual(['fail:panel 2: figure version vz no longer exists']);
  });
});
