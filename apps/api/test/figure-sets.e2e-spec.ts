import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { PSIFORM_PALETTE, type FigureSetDto } from '@psiform/contracts';
import { auth, demoTokens, jobEnded, phasePixels, smallRecipe, startTestApp, DEMO_PUBLICATION, RUN_ID, type TestApp, deleteFigureSets } from './support';
import { startWorkerProcess, type WorkerProcess } from './worker-process';

const WEB_DIST = join(__dirname, '..', '..', 'web', 'dist');

/** Real p orbitals (libs/orbitals README: m = +1 cos type ∝ x, m = −1 sin type ∝ y, m = 0 ∝ z; Condon–Shortley phase). */
const P = [
  { label: '2p_x', m: 1 },
  { label: '2p_y', m: -1 },
  { label: '2p_z', m: 0 },
];

/** Figure sets end to end: api in-process, the compiled worker (headless Chromium, render.html with panels) as a child. */
describe('figure sets (e2e)', () => {
  let t: TestApp;
  let tok: Awaited<ReturnType<typeof demoTokens>>;
  let worker: WorkerProcess | undefined;
  const pub = DEMO_PUBLICATION.id;
  const setIds: string[] = [];

  beforeAll(async () => {
    // Fail (not skip) without the browser or the built render page.
    if (!existsSync('/usr/bin/chromium')) throw new Error('figure-set exports need /usr/bin/chromium (apt-get install chromium)');
    if (!existsSync(join(WEB_DIST, 'render.html'))) throw new Error(`figure-set exports need the built client: ${WEB_DIST}/render.html is missing (npm run build -w @psiform/web)`);
    t = await startTestApp();
    tok = await demoTokens(t);
    worker = await startWorkerProcess({ WEB_DIST });
  }, 60000);

  afterAll(async () => {
    await worker?.stop();
    if (t) await deleteFigureSets(t.ds, setIds);
    await t?.close();
  });

  it('2p_x, 2p_y, 2p_z (grid 32) at 178 × 60 mm, 300 dpi: a 2102 × 709 PNG, pHYs 11811, both phase colours in each third', async () => {
    const figureIds: string[] = [];
    for (const p of P) {
      const recipe = smallRecipe({ label: p.label, content: { Z: 1, terms: [{ n: 2, l: 1, m: p.m, basis: 'real', re: 1 }] }, grid: { n: 32 } });
      figureIds.push((await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Set ${p.label} ${RUN_ID}`, recipe }).expect(201)).body.id);
    }
    const set: FigureSetDto = (await t.http().post('/api/figure-sets').set(auth(tok.illustrator)).send({ publicationId: pub, title: `n = 2 shell ${RUN_ID}`, figureIds, columns: 3 }).expect(201)).body;
    setIds.push(set.id);
    expect(set).toMatchObject({ figureIds, columns: 3, pngAssetId: null });
    const listed: FigureSetDto[] = (await t.http().get(`/api/figure-sets?publicationId=${pub}`).set(auth(tok.editor)).expect(200)).body;
    expect(listed.map((s) => s.id)).toContain(set.id);

    const jobId: string = (await t.http().post(`/api/figure-sets/${set.id}/exports`).set(auth(tok.illustrator)).send({ format: 'png', widthMm: 178, heightMm: 60, dpi: 300 }).expect(201)).body.jobId;
    const job = await jobEnded(t, tok.editor, jobId, 150000, 300, 'the figure-set job to finish');
    expect(job.error ?? null).toBeNull();
    expect(job).toMatchObject({ type: 'render', state: 'completed', stage: 'done', progress: 100 });
    // None of the three had a mesh: the job meshed each (glb + stl per figure) and then drew the set.
    expect(job.assets.map((a) => a.kind).sort()).toEqual(['glb', 'glb', 'glb', 'png', 'stl', 'stl', 'stl']);
    const png = job.assets.find((a) => a.kind === 'png')!;
    expect(png.stats).toMatchObject({ figureSetId: set.id, widthPx: 2102, heightPx: 709, dpi: 300, widthMm: 178, heightMm: 60 });
    const after: FigureSetDto = (await t.http().get(`/api/figure-sets/${set.id}`).set(auth(tok.editor)).expect(200)).body;
    expect(after.pngAssetId).toBe(png.id);

    const res = await t.http().get(`/api/assets/${png.id}/download`).set(auth(tok.editor)).expect(302);
    const bytes = Buffer.from(await (await fetch(res.headers.location as string)).arrayBuffer());
    expect(bytes.length).toBe(png.bytes);
    const img = PNG.sync.read(bytes);
    // round(178 / 25.4 × 300) = 2102, round(60 / 25.4 × 300) = 709 (1 in = 25.4 mm exactly).
    expect([img.width, img.height]).toEqual([2102, 709]);
    // pHYs (PNG spec §11.3.5.3), read by hand after IHDR: 300 dpi = round(300 / 0.0254) = 11811 px/m, unit 1 = metre.
    const at = bytes.indexOf('pHYs', 8, 'latin1');
    expect(at).toBeGreaterThan(0);
    expect([bytes.readUInt32BE(at + 4), bytes.readUInt32BE(at + 8), bytes[at + 12]]).toEqual([11811, 11811, 1]);
    expect(bytes.indexOf('sRGB', 8, 'latin1')).toBeGreaterThan(0);

    // Each third (one panel each, cell edges 0 | 701 | 1401 | 2102) shows both lobes in the recipe's default
    // phase colours (contracts PSIFORM_PALETTE); shading changes brightness, not hue.
    const edges = [0, 701, 1401, 2102];
    for (let k = 0; k < 3; k++) {
      const [pos, neg] = phasePixels(img, [PSIFORM_PALETTE.positive, PSIFORM_PALETTE.negative], edges[k], edges[k + 1]);
      const area = (edges[k + 1] - edges[k]) * img.height;
      expect({ panel: P[k].label, pos: pos / area > 0.01, neg: neg / area > 0.01 }).toEqual({ panel: P[k].label, pos: true, neg: true });
    }
  }, 200000);

  it('bad requests change nothing: an svg of a set, a foreign figure id', async () => {
    const set: FigureSetDto = (await t.http().post('/api/figure-sets').set(auth(tok.illustrator)).send({ publicationId: pub, title: `bad ${RUN_ID}`, figureIds: [(await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Set bad ${RUN_ID}`, recipe: smallRecipe() }).expect(201)).body.id], columns: 1 }).expect(201)).body;
    setIds.push(set.id);
    const before = (await t.ds.query(`SELECT count(*)::int AS n FROM jobs WHERE params->>'figureSetId' = $1`, [set.id]))[0].n;
    const r1 = await t.http().post(`/api/figure-sets/${set.id}/exports`).set(auth(tok.illustrator)).send({ format: 'svg', kind: 'radial' }).expect(400);
    expect(JSON.stringify(r1.body.message)).toMatch(/format/);
    const r2 = await t.http().get(`/api/figure-sets?publicationId=nope`).set(auth(tok.editor)).expect(400);
    expect(JSON.stringify(r2.body.message)).toMatch(/publicationId/);
    const after = (await t.ds.query(`SELECT count(*)::int AS n FROM jobs WHERE params->>'figureSetId' = $1`, [set.id]))[0].n;
    expect(after).toBe(before);
  });
});
