import type { JobDto } from '@psiform/contracts';
import { compileState, type Bohr } from '@psiform/orbitals';
import { encodeNrrd } from '@psiform/meshing';
import { ObjectStorage } from '@psiform/server';
import { auth, demoTokens, jobEnded, smallRecipe, startTestApp, DEMO_PUBLICATION, RUN_ID, type TestApp } from './support';
import { startWorkerProcess, type WorkerProcess } from './worker-process';

// eslint-disable-next-line @typescript-eslint/no-require-imports
const validator = require('gltf-validator') as { validateBytes(b: Uint8Array): Promise<{ issues: { numErrors: number } }> };

const N = 25;
// a0; 2p_z (Z = 1) has almost all its probability within this cube. N odd puts samples on the nodal plane z = 0.
const EXTENT = 12;
const SPACING = (2 * EXTENT) / (N - 1);

/** psi of real 2p_z sampled by @psiform/orbitals on an N³ cube from -EXTENT to +EXTENT (x fastest). */
function psi2pz(): Float32Array {
  const re = new Float32Array(N ** 3);
  compileState({ Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1, im: 0 }] }).sampleGrid({ n: N, extent: EXTENT as Bohr }, re, null);
  return re;
}

const goodNrrd = () => Buffer.from(encodeNrrd(psi2pz(), { sizes: [N, N, N], spacing: SPACING, origin: [-EXTENT, -EXTENT, -EXTENT] }));
const rawBytes = (data: Float32Array) => Buffer.from(data.buffer, data.byteOffset, data.byteLength);

describe('uploads (e2e)', () => {
  let t: TestApp;
  let small: TestApp;
  let tok: Awaited<ReturnType<typeof demoTokens>>;
  let worker: WorkerProcess;
  let storage: ObjectStorage;
  const pub = DEMO_PUBLICATION.id;

  const upload = (app: TestApp, token: string, parts: { format: string; title?: string; sidecar?: unknown; cube?: Buffer; quantity?: string }) => {
    let req = app
      .http()
      .post('/api/uploads')
      .set(auth(token))
      .field('publicationId', pub)
      .field('title', parts.title ?? `Uploaded cube ${RUN_ID}`)
      .field('format', parts.format);
    if (parts.quantity) req = req.field('quantity', parts.quantity);
    if (parts.sidecar !== undefined) req = req.attach('sidecar', Buffer.from(JSON.stringify(parts.sidecar)), { filename: 'cube.json', contentType: 'application/json' });
    if (parts.cube) req = req.attach('cube', parts.cube, { filename: parts.format === 'raw' ? 'cube.raw' : 'cube.nrrd', contentType: 'application/octet-stream' });
    return req;
  };

  const snapshot = async () => {
    const [[f], [v], [a]] = await Promise.all(['figures', 'figure_versions', 'assets'].map((tb) => t.ds.query(`SELECT count(*)::int AS n FROM ${tb}`)));
    return { figures: f.n, versions: v.n, assets: a.n, objects: (await storage.list('')).sort() };
  };

  const meshAndWait = async (figureId: string): Promise<JobDto> => {
    const { jobId } = (await t.http().post(`/api/figures/${figureId}/meshes`).set(auth(tok.illustrator)).expect(201)).body;
    return jobEnded(t, tok.illustrator, jobId, 60000, 200, 'the mesh job');
  };

  beforeAll(async () => {
    t = await startTestApp();
    small = await startTestApp({ UPLOAD_MAX_BYTES: '4096' });
    tok = await demoTokens(t);
    storage = t.app.get(ObjectStorage);
    worker = await startWorkerProcess({ WORKER_LOCK_MS: '3000' });
  }, 60000);

  afterAll(async () => {
    await worker?.stop();
    await small?.close();
    await t?.close();
  });

  it('a good NRRD (psi) is stored under its content hash, becomes a figure with an upload source, and meshes into two phases', async () => {
    const file = goodNrrd();
    const res = await upload(t, tok.illustrator, { format: 'nrrd', cube: file }).expect(201);
    expect(Object.keys(res.body).sort()).toEqual(['assetId', 'figureId']);
    const figure = (await t.http().get(`/api/figures/${res.body.figureId}`).set(auth(tok.editor)).expect(200)).body;
    const src = figure.currentVersion.recipe.source;
    expect(src).toMatchObject({ kind: 'upload', assetId: res.body.assetId, sizes: [N, N, N], quantity: 'psi', origin: [-EXTENT, -EXTENT, -EXTENT] });
    for (const d of src.spacing) expect(d).toBeCloseTo(SPACING, 12);
    const [asset] = await t.ds.query(`SELECT kind, bytes::int AS bytes, sha256, storage_key FROM assets WHERE id = $1`, [res.body.assetId]);
    expect(asset).toMatchObject({ kind: 'nrrd', bytes: file.length, storage_key: `uploads/${src.sha256}/cube.nrrd` });
    // The stored object is the file, byte for byte.
    expect(Buffer.compare(await storage.get(asset.storage_key), file)).toBe(0);
    expect(await storage.list('tmp/')).toEqual([]);

    const job = await meshAndWait(res.body.figureId);
    expect(job.state).toBe('completed');
    const glb = job.assets.find((a) => a.kind === 'glb')!;
    expect(glb.stats!.surfaces!.map((s) => [s.phase, s.watertight, s.components])).toEqual([
      ['+', true, 1],
      ['-', true, 1],
    ]);
    expect(glb.stats!.enclosed).toBeGreaterThan(0.89);
    const url = (await t.http().get(`/api/assets/${glb.id}/link`).set(auth(tok.editor)).expect(200)).body.url;
    expect((await validator.validateBytes(new Uint8Array(await (await fetch(url)).arrayBuffer()))).issues.numErrors).toBe(0);
  });

  it('a good raw cube with a sidecar (density) is stored as NRRD and meshes into one surface', async () => {
    const density = psi2pz().map((v) => v * v);
    const res = await upload(t, tok.illustrator, { format: 'raw', sidecar: { sizes: [N, N, N], spacing: SPACING, quantity: 'density' }, cube: rawBytes(density) }).expect(201);
    const [asset] = await t.ds.query(`SELECT storage_key, stats FROM assets WHERE id = $1`, [res.body.assetId]);
    expect(asset.stats).toMatchObject({ sizes: [N, N, N], quantity: 'density', uploadedAs: 'raw' });
    const stored = await storage.get(asset.storage_key);
    expect(stored.subarray(0, 9).toString('latin1')).toBe('NRRD0004\n');
    expect(stored.length).toBe(stored.indexOf('\n\n') + 2 + N ** 3 * 4);
    const job = await meshAndWait(res.body.figureId);
    expect(job.state).toBe('completed');
    const surfaces = job.assets.find((a) => a.kind === 'glb')!.stats!.surfaces!;
    // |psi|² has no sign: one surface, the two lobes of 2p_z as two components (the samples on z = 0 are 0).
    expect(surfaces.map((s) => [s.phase, s.watertight, s.components])).toEqual([['+', true, 2]]);
  });

  describe('bad uploads are refused and leave no rows and no storage objects', () => {
    const refused = async (app: TestApp, parts: Parameters<typeof upload>[2], status: number, message: RegExp) => {
      const before = await snapshot();
      const res = await upload(app, tok.illustrator, parts);
      expect(`${res.status} ${JSON.stringify(res.body.message)}`).toMatch(new RegExp(`^${status} `));
      expect([res.body.message].flat().join('\n')).toMatch(message);
      expect(await snapshot()).toEqual(before);
    };

    it('a truncated NRRD (400)', async () => {
      const file = goodNrrd();
      await refused(t, { format: 'nrrd', cube: file.subarray(0, file.length - 101) }, 400, new RegExp(`^cube: truncated: .* need ${N ** 3 * 4} data bytes`));
    });

    it('a NRRD header that is not float / raw / little endian / 3-D (400 naming the field)', async () => {
      const text = goodNrrd().toString('latin1');
      await refused(t, { format: 'nrrd', cube: Buffer.from(text.replace('type: float', 'type: double'), 'latin1') }, 400, /^cube: type:/);
      await refused(t, { format: 'nrrd', cube: Buffer.from(text.replace('endian: little', 'endian: big'), 'latin1') }, 400, /^cube: endian: only little-endian/);
      await refused(t, { format: 'nrrd', cube: Buffer.from(text.replace('encoding: raw', 'encoding: gzip'), 'latin1') }, 400, /^cube: encoding:/);
      await refused(t, { format: 'nrrd', cube: Buffer.from('not a nrrd file at all\n\n' + 'x'.repeat(64), 'latin1') }, 400, /^cube: magic:/);
    });

    it('wrong sidecar dimensions (400)', async () => {
      await refused(t, { format: 'raw', sidecar: { sizes: [N, N, N + 1], spacing: 0.5, quantity: 'psi' }, cube: rawBytes(psi2pz()) }, 400, new RegExp(`^cube: truncated: ${N ** 3 * 4} bytes of data, but the sidecar sizes ${N}x${N}x${N + 1} need nx·ny·nz·4 = ${N * N * (N + 1) * 4} bytes`));
      await refused(t, { format: 'raw', sidecar: { sizes: [N, N], spacing: 0.5, quantity: 'psi' }, cube: rawBytes(psi2pz()) }, 400, /^sidecar\.sizes: must be \[nx, ny, nz\]/);
      await refused(t, { format: 'raw', cube: rawBytes(psi2pz()) }, 400, /^sidecar: required for format raw/);
    });

    it('non-finite values (400)', async () => {
      const data = psi2pz();
      data[12345] = NaN;
      await refused(t, { format: 'raw', sidecar: { sizes: [N, N, N], spacing: 0.5, quantity: 'psi' }, cube: rawBytes(data) }, 400, /^cube: value 12345 is not a finite number/);
      const inf = psi2pz();
      inf[N ** 3 - 1] = Infinity;
      await refused(t, { format: 'nrrd', cube: Buffer.from(encodeNrrd(inf, { sizes: [N, N, N], spacing: 1, origin: [0, 0, 0] })) }, 400, new RegExp(`^cube: value ${N ** 3 - 1} is not a finite number`));
    });

    it('a cube larger than UPLOAD_MAX_BYTES (413)', async () => {
      await refused(small, { format: 'nrrd', cube: goodNrrd() }, 413, /^cube: larger than the upload limit of 4096 bytes \(UPLOAD_MAX_BYTES\)/);
    });

    it('missing or bad fields (400), no multipart (400), editors (403)', async () => {
      await refused(t, { format: 'obj', cube: goodNrrd() }, 400, /format must be one of: nrrd, raw/);
      await refused(t, { format: 'nrrd', title: ' ', cube: goodNrrd() }, 400, /title must not be empty/);
      await refused(t, { format: 'nrrd' }, 400, /^cube: the file part is missing/);
      const before = await snapshot();
      const json = await t.http().post('/api/uploads').set(auth(tok.illustrator)).send({ publicationId: pub }).expect(400);
      expect(json.body.message).toMatch(/multipart\/form-data/);
      await upload(t, tok.editor, { format: 'nrrd', cube: goodNrrd() }).expect(403);
      expect(await snapshot()).toEqual(before);
    });
  });

  it('a figure recipe may name an uploaded cube of the same publication only with its own hash', async () => {
    const res = await upload(t, tok.illustrator, { format: 'nrrd', cube: goodNrrd(), title: `Source check ${RUN_ID}` }).expect(201);
    const fig = (await t.http().get(`/api/figures/${res.body.figureId}`).set(auth(tok.illustrator)).expect(200)).body;
    const source = fig.currentVersion.recipe.source;
    const ok = await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Reuse ${RUN_ID}`, recipe: smallRecipe({ source }) }).expect(201);
    expect(ok.body.currentVersion.recipe.source.assetId).toBe(res.body.assetId);
    const bad = await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Reuse ${RUN_ID}`, recipe: smallRecipe({ source: { ...source, sha256: 'b'.repeat(64) } }) }).expect(400);
    expect(bad.body.message).toEqual(['recipe.source.sha256: does not match the uploaded cube']);
  });
});
