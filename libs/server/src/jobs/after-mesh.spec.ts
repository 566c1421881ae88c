import type { JobContext } from './jobs.repository';
import type { NewAsset } from '../assets/asset-store';
import type { MeshDone } from './job-handler';
import { afterNewMeshes } from './job-runner';

const asset = (figureVersionId: string, kind: NewAsset['kind']): NewAsset => ({ figureVersionId, publicationId: 'p1', kind, storageKey: `${figureVersionId}/${kind}`, bytes: 1, sha256: 'x', stats: null });
const ctx = (params: Record<string, unknown>, version: string | null = 'v1', figure: string | null = 'f1') =>
  ({ job: { publicationId: 'p1', params }, version: version ? { id: version } : null, figure: figure ? { id: figure } : null }) as unknown as JobContext;

describe('afterNewMeshes: every figure whose mesh a mesh, render, export or set job made gets the after-mesh hook (its thumbnail)', () => {
  it("a figure's own render/export: the figure, its version and the new mesh rows", async () => {
    const calls: MeshDone[] = [];
    const assets = [asset('v1', 'glb'), asset('v1', 'stl'), { ...asset('v1', 'png'), storageKey: 'png' }];
    await afterNewMeshes(async (d) => void calls.push(d), 'j1', ctx({ format: 'png' }), ['v1'], assets, ['a-glb', 'a-stl', 'a-png']);
    expect(calls).toEqual([{ jobId: 'j1', figureId: 'f1', figureVersionId: 'v1', publicationId: 'p1', assetIds: ['a-glb', 'a-stl'] }]);
  });

  it('a figure set: each panel whose mesh was computed, by the figure the job names for that version', async () => {
    const calls: MeshDone[] = [];
    const panels = [{ figureId: 'fa', figureVersionId: 'va' }, { figureId: 'fb', figureVersionId: 'vb' }, { figureId: 'fc', figureVersionId: 'vc' }];
    const assets = [asset('va', 'glb'), asset('va', 'stl'), asset('vc', 'glb'), asset('vc', 'stl')];
    await afterNewMeshes(async (d) => void calls.push(d), 'j2', ctx({ panels }, null, null), ['va', 'vc'], assets, ['1', '2', '3', '4']);
    expect(calls.map((c) => [c.figureId, c.figureVersionId, c.assetIds])).toEqual([['fa', 'va', ['1', '2']], ['fc', 'vc', ['3', '4']]]);
  });

  it('nothing when no mesh was computed (an existing mesh reused), and never for a thumbnail render', async () => {
    const calls: MeshDone[] = [];
    await afterNewMeshes(async (d) => void calls.push(d), 'j3', ctx({ format: 'glb' }), [], [asset('v1', 'glb')], ['a']);
    await afterNewMeshes(async (d) => void calls.push(d), 'j4', ctx({ thumbnail: true }), ['v1'], [asset('v1', 'glb')], ['a']);
    expect(calls).toEqual([]);
  });

  it('a failing hook never fails the job', async () => {
    await expect(afterNewMeshes(async () => Promise.reject(new Error('queue down')), 'j5', ctx({}), ['v1'], [asset('v1', 'glb')], ['a'])).resolves.toBeUndefined();
  });
});
