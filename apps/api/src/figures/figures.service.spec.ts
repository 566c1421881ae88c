import { parseRecipe, type FigureStatus, type Recipe } from '@psiform/contracts';
import { ConflictError, FiguresStore, recipeHash, type FigureEntity, type FigureVersionEntity, type FigureWriteTx, type NewAuditEntry, type NewJob, type PaletteColours } from '@psiform/server';
import { FiguresService } from './figures.service';
import type { MembershipService } from '../publications/membership.service';
import type { AssetStore } from '@psiform/server';
import type { JobsService } from '../jobs/jobs.service';

const recipe = (positive = '#c2410c'): Recipe => {
  const r = parseRecipe({ version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 16 }, surface: { rule: 'enclosed', fraction: 0.9 }, palette: { positive, negative: '#1d4ed8' } });
  if (!r.ok) throw new Error('bad fixture');
  return r.recipe;
};

/** One figure in memory; a transaction's writes are kept only when its function returns (rolled back on a throw). */
class FakeFigures extends FiguresStore {
  figure = { id: 'f1', publicationId: 'p1', title: 'Figure 1', ownerId: 'ill', status: 'draft' as FigureStatus, currentVersion: 1 } as FigureEntity;
  versions: FigureVersionEntity[] = [{ id: 'v1', figureId: 'f1', number: 1, recipe: recipe(), recipeHash: recipeHash(recipe()), engineVersion: 'e', authorId: 'ill', locked: false } as FigureVersionEntity];
  audit: Omit<NewAuditEntry, 'figureId'>[] = [];
  jobs: NewJob[] = [];
  palette: PaletteColours | null = null;

  async inFigureTransaction<T>(_id: string, fn: (tx: FigureWriteTx) => Promise<T>): Promise<T> {
    const saved = JSON.stringify({ f: this.figure, v: this.versions, a: this.audit, j: this.jobs });
    const figure = this.figure;
    const tx: FigureWriteTx = {
      figure,
      current: this.versions.find((v) => v.number === figure.currentVersion)!,
      enforcedPalette: async () => this.palette,
      addVersion: async (v) => {
        const row = { ...v, id: `v${figure.currentVersion + 1}`, figureId: 'f1', number: figure.currentVersion + 1, locked: false } as FigureVersionEntity;
        this.versions.push(row);
        figure.currentVersion = row.number;
        figure.status = 'draft';
        return row;
      },
      setTitle: async (t) => void (figure.title = t),
      audit: async (e) => void this.audit.push(e),
      requestJob: async (j) => {
        this.jobs.push(j);
        return { id: `job${this.jobs.length}` } as never;
      },
    };
    try {
      return await fn(tx);
    } catch (err) {
      const back = JSON.parse(saved);
      Object.assign(this.figure, back.f);
      this.versions = back.v;
      this.audit = back.a;
      this.jobs = back.j;
      throw err;
    }
  }
  enforcedPalette = async () => this.palette;
  create = () => Promise.reject(new Error('unused'));
  createWithAsset = () => Promise.reject(new Error('unused'));
  findById = async () => this.figure;
  findVersion = async () => this.versions.at(-1)!;
  ownerName = async () => null;
  list = () => Promise.reject(new Error('unused'));
  setThumbnail = () => Promise.reject(new Error('unused'));
  swatchbookHome = () => Promise.reject(new Error('unused'));
}

const caller = { id: 'ill', role: 'illustrator' as const };
const setup = () => {
  const store = new FakeFigures();
  const svc = new FiguresService(store, { findPublication: async () => null } as unknown as MembershipService, {} as AssetStore, {} as JobsService);
  return { store, svc };
};

describe('FiguresService.saveVersion, the one writer of figure versions', () => {
  it('a changed recipe is a new version with a revise entry; the same recipe again changes nothing (idempotent)', async () => {
    const { store, svc } = setup();
    const first = await svc.saveVersion(caller, 'f1', { recipe: recipe('#aa0000'), reason: 'edit' });
    expect(first).toMatchObject({ created: true, version: { number: 2 } });
    expect(store.audit).toEqual([{ actorId: 'ill', action: 'revise', fromStatus: 'draft', toStatus: 'draft', note: 'version 2 created' }]);
    const again = await svc.saveVersion(caller, 'f1', { recipe: recipe('#aa0000'), reason: 'rerender', mesh: true });
    expect(again).toMatchObject({ created: false, version: { number: 2 } });
    expect(store.versions).toHaveLength(2);
    expect(store.jobs).toEqual([]);
    expect(store.audit).toHaveLength(1);
  });

  it('applies the enforced house palette to every version it writes', async () => {
    const { store, svc } = setup();
    store.palette = { swatchbookId: 'sb1', positive: '#111111', negative: '#222222', background: '#f0f0f0' };
    const saved = await svc.saveVersion(caller, 'f1', { recipe: recipe('#aa0000'), reason: 'edit' });
    expect(saved.version.recipe.palette).toEqual({ swatchbookId: 'sb1', positive: '#111111', negative: '#222222' });
    expect(saved.version.recipe.stage.background.color).toBe('#f0f0f0');
    expect(saved.version.recipeHash).toBe(recipeHash(saved.version.recipe));
  });

  it('the edit lock: a proof in review, approved or released is not changed, title included (409), and nothing is written', async () => {
    for (const status of ['in_review', 'approved', 'released'] as FigureStatus[]) {
      const { store, svc } = setup();
      store.figure.status = status;
      const err = await svc.saveVersion(caller, 'f1', { title: 'Renamed', reason: 'edit' }).catch((e: unknown) => e);
      expect(err).toBeInstanceOf(ConflictError);
      expect((err as Error).message).toBe(`cannot edit a figure that is ${status}: allowed only from draft or changes_requested`);
      expect(store.figure.title).toBe('Figure 1');
      expect(store.audit).toEqual([]);
    }
  });

  it('title and recipe in one write: both audit entries; changes_requested becomes draft', async () => {
    const { store, svc } = setup();
    store.figure.status = 'changes_requested';
    await svc.saveVersion(caller, 'f1', { recipe: recipe('#aa0000'), title: 'Figure 1, lobes', reason: 'edit' });
    expect(store.figure).toMatchObject({ title: 'Figure 1, lobes', status: 'draft', currentVersion: 2 });
    expect(store.audit.map((a) => [a.action, a.fromStatus, a.toStatus, a.note])).toEqual([
      ['revise', 'changes_requested', 'draft', 'version 2 created'],
      ['retitle', 'draft', 'draft', 'title "Figure 1" → "Figure 1, lobes"'],
    ]);
  });

  it('a re-render asks for its mesh job in the same write, and loses cleanly when the figure moved on', async () => {
    const { store, svc } = setup();
    const saved = await svc.saveVersion(caller, 'f1', { recipe: recipe('#0000aa'), reason: 'rerender', expectedCurrent: 1, mesh: true, note: 're-rendered with swatchbook "House" v2' });
    expect(saved).toMatchObject({ created: true, jobId: 'job1' });
    expect(store.jobs).toEqual([{ type: 'mesh', params: {}, publicationId: 'p1', figureId: 'f1', figureVersionId: 'v2', requestedBy: 'ill' }]);
    expect(store.audit.at(-1)).toMatchObject({ action: 'rerender', note: 're-rendered with swatchbook "House" v2' });
    await expect(svc.saveVersion(caller, 'f1', { recipe: recipe('#00aa00'), reason: 'rerender', expectedCurrent: 1, mesh: true })).rejects.toThrow('figure f1 changed meanwhile');
    expect(store.versions).toHaveLength(2);
    expect(store.jobs).toHaveLength(1);
  });
});
