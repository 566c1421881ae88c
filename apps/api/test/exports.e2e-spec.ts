import type { AddressInfo } from 'node:net';
import { spawnSync } from 'node:child_process';
import { existsSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { phaseHex } from '@psiform/colour';
import { phaseKeyPlacement, PHASE_KEY_SECTORS } from '@psiform/print';
import { DOMParser } from '@xmldom/xmldom';
import { unzipSync, strFromU8 } from 'fflate';
import { PNG } from 'pngjs';
import { EXPORT_STAGES, PSIFORM_PALETTE, type JobDto } from '@psiform/contracts';
import { auth, demoTokens, jobEnded, phasePixels, smallRecipe, startTestApp, DEMO_PUBLICATION, RUN_ID, type TestApp, deleteFigureSets, newAccount } from './support';
import { readSse, startWorkerProcess, polled, waitFor, type WorkerProcess } from './worker-process';

const WEB_DIST = join(__dirname, '..', '..', 'web', 'dist');

/** PNG chunks read by hand (PNG specification §5.3: length, type, data, CRC), so the test does not trust the encoder's own reader. */
function pngChunks(bytes: Uint8Array): Map<string, Buffer[]> {
  const b = Buffer.from(bytes);
  expect(b.subarray(0, 8).equals(Buffer.from([137, 80, 78, 71, 13, 10, 26, 10]))).toBe(true);
  const out = new Map<string, Buffer[]>();
  for (let o = 8; o < b.length; ) {
    const len = b.readUInt32BE(o);
    const type = b.toString('latin1', o + 4, o + 8);
    out.set(type, [...(out.get(type) ?? []), b.subarray(o + 8, o + 8 + len)]);
    o += 12 + len;
  }
  return out;
}

/** Exports end to end: api in-process, the compiled worker (headless Chromium, apps/web/dist/render.html) as a child. */
describe('exports (e2e)', () => {
  let t: TestApp;
  let base: string;
  let tok: Awaited<ReturnType<typeof demoTokens>>;
  let outsider: string;
  let otherIllustrator: string;
  let worker: WorkerProcess | undefined;
  let figureId: string;
  let pngJob: JobDto;
  let thumbFigure: { id: string; title: string } | undefined;
  const pub = DEMO_PUBLICATION.id;
  const setIds: string[] = [];

  const finished = (jobId: string, timeoutMs = 90000) => jobEnded(t, tok.editor, jobId, timeoutMs);
  const exportJob = async (body: unknown, token = tok.illustrator, id = figureId): Promise<string> =>
    (await t.http().post(`/api/figures/${id}/exports`).set(auth(token)).send(body as object).expect(201)).body.jobId;
  const jobCount = async (id = figureId): Promise<number> => (await t.ds.query(`SELECT count(*)::int AS n FROM jobs WHERE figure_id = $1`, [id]))[0].n;

  async function download(assetId: string, token = tok.editor): Promise<Uint8Array> {
    const res = await t.http().get(`/api/assets/${assetId}/download`).set(auth(token)).expect(302);
    const file = await fetch(res.headers.location as string);
    expect(file.status).toBe(200);
    return new Uint8Array(await file.arrayBuffer());
  }

  beforeAll(async () => {
    if (!existsSync('/usr/bin/chromium')) throw new Error('render exports need /usr/bin/chromium (apt-get install chromium)');
    if (!existsSync(join(WEB_DIST, 'render.html'))) throw new Error(`render exports need the built client: ${WEB_DIST}/render.html is missing (npm run build -w @psiform/web)`);
    t = await startTestApp();
    await t.app.listen(0, '127.0.0.1');
    base = `http://127.0.0.1:${(t.app.getHttpServer().address() as AddressInfo).port}`;
    tok = await demoTokens(t);
    outsider = (await newAccount(t, tok.admin, { name: 'exports-outsider', displayName: 'Outside Viewer', role: 'editor' })).token;
    otherIllustrator = (await newAccount(t, tok.admin, { name: 'exports-illustrator', displayName: 'Second Illustrator', role: 'illustrator', memberOf: pub })).token;
    figureId = (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Export 2p_z ${RUN_ID}`, recipe: smallRecipe({ grid: { n: 48 } }) }).expect(201)).body.id;
    worker = await startWorkerProcess({ WEB_DIST, THUMBNAILS: 'on' });
  }, 60000);

  afterAll(async () => {
    if (process.env.PSIFORM_SHOW_WORKER) console.log(worker?.output());
    await worker?.stop();
    if (t) await deleteFigureSets(t.ds, setIds);
    await t?.close();
  });

  it('png 89 × 60 mm at 300 dpi: meshes first, streams its stages, stores a 1051 × 709 PNG with pHYs 11811 px/m, sRGB and both phase colours', async () => {
    const jobId = await exportJob({ format: 'png', widthMm: 89, heightMm: 60, dpi: 300 });
    const res = await fetch(`${base}/api/jobs/${jobId}/events`, { headers: auth(tok.editor) });
    const seen: JobDto[] = [];
    for await (const e of readSse(res.body!)) seen.push(e as JobDto);
    pngJob = seen[seen.length - 1];
    expect(pngJob).toMatchObject({ id: jobId, type: 'render', state: 'completed', stage: 'done', progress: 100 });
    const order = seen.map((e) => EXPORT_STAGES.indexOf(e.stage as (typeof EXPORT_STAGES)[number]));
    expect(order.every((i) => i >= 0)).toBe(true);
    expect([...order].sort((a, b) => a - b)).toEqual(order);
    // The version had no mesh: the job computed it (glb, stl rows for the version) before rendering.
    expect(pngJob.assets.map((a) => a.kind).sort()).toEqual(['glb', 'png', 'stl']);
    const asset = pngJob.assets.find((a) => a.kind === 'png')!;
    expect(asset.stats).toMatchObject({ widthPx: 1051, heightPx: 709, dpi: 300, widthMm: 89, heightMm: 60 });
    expect(asset.stats!.ms).toBeGreaterThan(0);

    const bytes = await download(asset.id);
    expect(bytes.length).toBe(asset.bytes);
    const chunks = pngChunks(bytes);
    const ihdr = chunks.get('IHDR')![0];
    // round(89 / 25.4 × 300) = 1051, round(60 / 25.4 × 300) = 709 (1 in = 25.4 mm exactly).
    expect([ihdr.readUInt32BE(0), ihdr.readUInt32BE(4)]).toEqual([1051, 709]);
    // pHYs (PNG spec §11.3.5.3): x, y pixels per unit and unit 1 = metre; 300 dpi = round(300 / 0.0254) = 11811.
    const phys = chunks.get('pHYs')![0];
    expect([phys.readUInt32BE(0), phys.readUInt32BE(4), phys[8]]).toEqual([11811, 11811, 1]);
    expect(chunks.get('sRGB')).toHaveLength(1);

    // Both lobes of 2p_z are in the picture, in the recipe's default phase colours (Psiform's verdigris and
    // ochre, contracts PSIFORM_PALETTE): shading changes their brightness, not their hue.
    const img = PNG.sync.read(Buffer.from(bytes));
    const [pos, neg] = phasePixels(img, [PSIFORM_PALETTE.positive, PSIFORM_PALETTE.negative]);
    const total = img.width * img.height;
    expect(pos / total).toBeGreaterThan(0.03);
    expect(neg / total).toBeGreaterThan(0.03);
  }, 120000);

  it('a mesh job leaves a 320 × 240 thumbnail on the figure (stats.thumbnail) without waiting for it', async () => {
    const id = (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Thumb ${RUN_ID}`, recipe: smallRecipe({ label: 'thumb', grid: { n: 40 } }) }).expect(201)).body.id;
    const meshJob = await finished((await t.http().post(`/api/figures/${id}/meshes`).set(auth(tok.illustrator)).expect(201)).body.jobId);
    expect(meshJob.state).toBe('completed');
    expect(meshJob.assets.map((a) => a.kind).sort()).toEqual(['glb', 'stl']);
    const fig = await waitFor('the thumbnail', async () => {
      const f = await polled(t.http().get(`/api/figures/${id}`).set(auth(tok.editor)));
      return f?.thumbnailAssetId ? f : undefined;
    }, 60000, 300);
    const thumb = fig.assets.find((a: { id: string }) => a.id === fig.thumbnailAssetId);
    expect(thumb).toMatchObject({ kind: 'png', stats: { thumbnail: true, widthPx: 320, heightPx: 240, dpi: 96 } });
    const ihdr = pngChunks(await download(thumb.id)).get('IHDR')![0];
    expect([ihdr.readUInt32BE(0), ihdr.readUInt32BE(4)]).toEqual([320, 240]);
    const list = (await t.http().get(`/api/figures?publicationId=${pub}&q=${encodeURIComponent(`Thumb ${RUN_ID}`)}`).set(auth(tok.editor)).expect(200)).body;
    expect(list.items[0].thumbnailAssetId).toBe(fig.thumbnailAssetId);
    thumbFigure = { id, title: `Thumb ${RUN_ID}` };
  }, 120000);

  it('a mesh made by an export (no mesh job) also leaves a thumbnail on the figure', async () => {
    const id = (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Thumb export ${RUN_ID}`, recipe: smallRecipe({ label: 'thumb-export', grid: { n: 36 } }) }).expect(201)).body.id;
    const job = await finished((await t.http().post(`/api/figures/${id}/exports`).set(auth(tok.illustrator)).send({ format: 'glb' }).expect(201)).body.jobId);
    expect(job.state).toBe('completed');
    expect(job.assets.map((a) => a.kind).sort()).toEqual(['glb', 'stl']); // the export computed the mesh itself
    const fig = await waitFor('the thumbnail of the export-made mesh', async () => {
      const f = await polled(t.http().get(`/api/figures/${id}`).set(auth(tok.editor)));
      return f?.thumbnailAssetId ? f : undefined;
    }, 90000, 300);
    expect(fig.assets.find((a: { id: string }) => a.id === fig.thumbnailAssetId)).toMatchObject({ kind: 'png', stats: { thumbnail: true, widthPx: 320, heightPx: 240 } });
    // A second export of the same version reuses the mesh: no second thumbnail job.
    const again = await finished((await t.http().post(`/api/figures/${id}/exports`).set(auth(tok.illustrator)).send({ format: 'stl' }).expect(201)).body.jobId);
    expect(again.state).toBe('completed');
    const after = (await t.http().get(`/api/figures/${id}`).set(auth(tok.editor)).expect(200)).body;
    expect(after.assets.filter((a: { kind: string; stats: { thumbnail?: boolean } | null }) => a.kind === 'png' && a.stats?.thumbnail)).toHaveLength(1);
  }, 150000);

  it('the figures list carries a presigned thumbnailUrl that downloads the 320 × 240 PNG; null for a figure without one', async () => {
    expect(thumbFigure).toBeDefined();
    const bare = (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Thumb ${RUN_ID} none`, recipe: smallRecipe({ grid: { n: 32 } }) }).expect(201)).body.id;
    const list = (await t.http().get(`/api/figures?publicationId=${pub}&pageSize=100&q=${encodeURIComponent(thumbFigure!.title)}`).set(auth(tok.editor)).expect(200)).body;
    const row = list.items.find((f: { id: string }) => f.id === thumbFigure!.id);
    const bareRow = list.items.find((f: { id: string }) => f.id === bare);
    expect(bareRow).toMatchObject({ thumbnailAssetId: null, thumbnailUrl: null });
    expect(typeof row.thumbnailUrl).toBe('string');
    // A presigned S3 GET (query-string signature, AWS SigV4) straight to the object store, no api token needed.
    const url = new URL(row.thumbnailUrl);
    expect(url.searchParams.get('X-Amz-Signature')).toMatch(/^[0-9a-f]{64}$/);
    expect(Number(url.searchParams.get('X-Amz-Expires'))).toBeLessThanOrEqual(600);
    const res = await fetch(row.thumbnailUrl);
    expect(res.status).toBe(200);
    const img = PNG.sync.read(Buffer.from(await res.arrayBuffer()));
    expect([img.width, img.height]).toEqual([320, 240]);
    // Not a blank picture: the background and the lobes differ.
    const first = img.data.readUInt32BE(0);
    let other = 0;
    for (let i = 0; i < img.data.length; i += 4) if (img.data.readUInt32BE(i) !== first) other++;
    expect(other / (img.width * img.height)).toBeGreaterThan(0.02);
  }, 60000);

  it('svg section map (2p_z, xz plane, 3 levels) parses as XML with 3 + 3 contours and one nodal line; the radial plot embeds Lato', async () => {
    const job = await finished(await exportJob({ format: 'svg', kind: 'section', plane: 'xz', levels: 3, widthMm: 80, heightMm: 80 }, tok.editor));
    expect(job).toMatchObject({ type: 'export', state: 'completed' });
    const svg = strFromU8(await download(job.assets[0].id));
    const errors: string[] = [];
    const doc = new DOMParser({ onError: (level, msg) => void (level !== 'warning' && errors.push(msg)) }).parseFromString(svg, 'image/svg+xml');
    expect(errors).toEqual([]);
    const paths = Array.from(doc.getElementsByTagName('path'));
    const cls = (c: string) => paths.filter((p) => (p.getAttribute('class') ?? '').split(/\s+/).includes(c));
    // 2p_z ∝ z e^{-r/2}: in the xz plane one lobe of each sign, cut by the nodal line z = 0 (Y_10 ∝ cos θ).
    expect(cls('contour-pos')).toHaveLength(3);
    expect(cls('contour-neg')).toHaveLength(3);
    expect(cls('nodal')).toHaveLength(1);
    expect(doc.documentElement?.getAttribute('width')).toBe('80mm');
    expect(svg).toContain(PSIFORM_PALETTE.positive);

    const radial = await finished(await exportJob({ format: 'svg', kind: 'radial' }));
    const rsvg = strFromU8(await download(radial.assets[0].id));
    const rdoc = new DOMParser().parseFromString(rsvg, 'image/svg+xml');
    expect(rsvg).toMatch(/@font-face\s*\{[^}]*Lato[^}]*data:font\/woff2;base64,/);
    // R_21 has n − l − 1 = 0 radial nodes (hydrogen-like radial functions; e.g. Griffiths, Introduction to QM, §4.2).
    expect(Array.from(rdoc.getElementsByTagName('circle')).filter((c) => c.getAttribute('class') === 'node')).toHaveLength(0);
    expect(Array.from(rdoc.getElementsByTagName('g')).some((g) => g.getAttribute('class') === 'plot')).toBe(true);
  }, 60000);

  it('glb export hands over the existing mesh asset; bundle zips GLB, STL, the latest PNG, radial SVG, recipe, metadata (model note, enclosed fraction), README', async () => {
    const glbJob = await finished(await exportJob({ format: 'glb' }));
    const meshGlb = pngJob.assets.find((a) => a.kind === 'glb')!;
    expect(glbJob.assets.map((a) => a.id)).toEqual([meshGlb.id]);

    const bundle = await finished(await exportJob({ format: 'bundle' }, tok.artDirector));
    expect(bundle.state).toBe('completed');
    expect(bundle.assets[0].kind).toBe('bundle');
    const files = unzipSync(await download(bundle.assets[0].id));
    // The demo book's delivery profile takes TIFF and PDF, so the bundle carries them and its preflight report too.
    expect(Object.keys(files).sort()).toEqual(['PREFLIGHT.txt', 'README.txt', 'figure-screen.glb', 'figure.glb', 'figure.png', 'figure.stl', 'figure.tif', 'metadata.json', 'preflight.json', 'radial.pdf', 'radial.svg', 'recipe.json', 'section.pdf', 'section.svg']);
    const meta = JSON.parse(strFromU8(files['metadata.json']));
    expect(meta.model.note).toMatch(/one-electron hydrogen-like model/);
    expect(meta.surface).toMatchObject({ rule: 'enclosed', target: 0.9 });
    expect(meta.surface.enclosedAchieved).toBeCloseTo(meshGlb.stats!.enclosed!, 9);
    expect(meta.surface.enclosedAchieved).toBeGreaterThan(0.89);
    expect(meta.grid.n).toBe(48);
    expect(JSON.parse(strFromU8(files['recipe.json'])).content.terms[0]).toMatchObject({ n: 2, l: 1, m: 0 });
    expect(strFromU8(files['README.txt'])).toMatch(/hydrogen-like/);
    // The PNG is the latest print render of this version (the one from the first test), byte for byte.
    const png = pngJob.assets.find((a) => a.kind === 'png')!;
    expect(Buffer.from(files['figure.png']).equals(Buffer.from(await download(png.id)))).toBe(true);
    expect(Buffer.from(files['figure.glb']).subarray(0, 4).toString('latin1')).toBe('glTF');

    // metadata.json describes every file inside, and every PNG matches its entry: IHDR size and pHYs read by hand
    // (PNG specification §11.2.2, §11.3.5.3), sha256 by node:crypto. No file claims a size it does not have.
    const { createHash } = await import('node:crypto');
    expect(meta.canvas).toBeUndefined();
    expect(meta.files.map((f: { name: string }) => f.name).sort()).toEqual(Object.keys(files).filter((n) => n !== 'metadata.json').sort());
    for (const f of meta.files as { name: string; format: string; bytes: number; sha256: string; widthPx?: number; heightPx?: number; dpi?: number; widthMm?: number; heightMm?: number }[]) {
      expect({ name: f.name, bytes: f.bytes, sha256: f.sha256 }).toEqual({ name: f.name, bytes: files[f.name].length, sha256: createHash('sha256').update(files[f.name]).digest('hex') });
      if (f.format !== 'png') continue;
      const c = pngChunks(files[f.name]);
      const ihdr = c.get('IHDR')![0];
      const phys = c.get('pHYs')![0];
      const dpi = Math.round(phys.readUInt32BE(0) * 0.0254);
      expect({ name: f.name, w: f.widthPx, h: f.heightPx, dpi: f.dpi }).toEqual({ name: f.name, w: ihdr.readUInt32BE(0), h: ihdr.readUInt32BE(4), dpi });
      expect(f.widthMm).toBeCloseTo((ihdr.readUInt32BE(0) / dpi) * 25.4, 1);
      expect(strFromU8(files['README.txt'])).toContain(`${f.name}: PNG, ${f.widthPx} × ${f.heightPx} px, ${Number(f.widthMm!.toPrecision(4))} × ${Number(f.heightMm!.toPrecision(4))} mm at ${dpi} dpi`);
    }
    expect(meta.altText.length).toBeLessThanOrEqual(125);
    expect(meta.longDescription.length).toBeGreaterThan(meta.altText.length);
  }, 120000);

  it("a complex figure's bundle carries the phase key: figure.png (the ring in the wheel's colours at 0, π/2, π, 3π/2), section.svg (ring and marks) and section.pdf (pdftotext reads the marks)", async () => {
    // 3d (m = +2), complex: coloured by arg ψ on the swatchbook's wheel (here the default wheel of the demo book's palette).
    const recipe = smallRecipe({ label: '3d(m=+2)', content: { Z: 1, terms: [{ n: 3, l: 2, m: 2, basis: 'complex', re: 1 }] }, grid: { n: 40 } });
    const fig = (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Complex key ${RUN_ID}`, recipe }).expect(201)).body;
    const stored = fig.currentVersion.recipe;
    const bundle = await finished(await exportJob({ format: 'bundle' }, tok.illustrator, fig.id), 150000);
    expect(bundle.error ?? null).toBeNull();
    const files = unzipSync(await download(bundle.assets[0].id));
    const wheel = { positive: stored.palette.positive, negative: stored.palette.negative, wheel: stored.palette.wheel ?? null };
    const hexRgb = (h: string) => [1, 3, 5].map((i) => parseInt(h.slice(i, i + 2), 16));

    // PNG: the ring where the 2D layer places it (@psiform/print phaseKeyPlacement at dpi / 25.4 px per mm), read at
    // 3/4 of its radius on each mark's angle: the wheel's colour there (@psiform/colour phaseHex, the one phase rule).
    const img = PNG.sync.read(Buffer.from(files['figure.png']));
    const dpi = stored.canvas.dpi;
    expect(img.width).toBe(Math.round((stored.canvas.widthMm / 25.4) * dpi));
    const key = phaseKeyPlacement(img.width, dpi / 25.4);
    for (const angle of [0, Math.PI / 2, Math.PI, (3 * Math.PI) / 2]) {
      const x = Math.round(key.cx + 0.75 * key.r * Math.cos(angle));
      const y = Math.round(key.cy - 0.75 * key.r * Math.sin(angle));
      const i = (y * img.width + x) * 4;
      const got = [img.data[i], img.data[i + 1], img.data[i + 2]];
      const want = hexRgb(phaseHex(wheel, 'argument', 'complex', angle));
      // 8-bit sRGB after the canvas draw and the PNG encode: within 3 levels per channel (common practice for 8-bit round trips).
      expect({ angle, diff: Math.max(...got.map((v, k) => Math.abs(v - want[k]))) <= 3, got, want }).toMatchObject({ angle, diff: true });
    }

    // SVG: the section map is coloured by phase and carries the key (ring sectors and the four marks, titled arg ψ).
    const svg = strFromU8(files['section.svg']);
    const doc = new DOMParser().parseFromString(svg, 'image/svg+xml');
    const groups = Array.from(doc.getElementsByTagName('g')).filter((g) => g.getAttribute('class') === 'phase-key');
    expect(groups).toHaveLength(1);
    expect(Array.from(groups[0].getElementsByTagName('text')).map((e) => e.textContent)).toEqual(['arg ψ', '0', 'π/2', 'π', '3π/2']);
    expect(groups[0].getElementsByTagName('path').length).toBe(PHASE_KEY_SECTORS);
    expect(svg).toContain('class="phase-band"');
    expect(svg).not.toContain('ψ &gt; 0'); // no two-phase legend on a map coloured by phase

    // PDF: the same drawing; poppler's pdftotext reads the key's marks back.
    const pdfPath = join(tmpdir(), `psiform-key-${process.pid}.pdf`);
    writeFileSync(pdfPath, files['section.pdf']);
    const text = spawnSync('pdftotext', [pdfPath, '-'], { encoding: 'utf8' });
    if (text.error) throw new Error(`pdftotext (poppler-utils) is needed: ${text.error.message}`);
    // Each mark on its own line (pdftotext keeps a trailing space after some); the π alone is a line of its own.
    for (const mark of [/arg ?ψ/, /(^|\s)π ?\/ ?2/m, /3 ?π ?\/ ?2/, /^π\s?$/m, /^0\s?$/m]) expect(text.stdout).toMatch(mark);
  }, 180000);

  it('an approved figure whose mesh a figure-set job made gets a thumbnail too', async () => {
    const id = (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Thumb approved ${RUN_ID}`, recipe: smallRecipe({ label: 'thumb-approved', grid: { n: 32 } }) }).expect(201)).body.id;
    await t.http().post(`/api/figures/${id}/submit`).set(auth(tok.illustrator)).send({}).expect(200);
    let decision = (await t.http().post(`/api/figures/${id}/approve`).set(auth(tok.editor)).send({}).expect(200)).body;
    if (decision.status !== 'approved') decision = (await t.http().post(`/api/figures/${id}/colour-signoff`).set(auth(tok.artDirector)).send({}).expect(200)).body;
    expect(decision.status).toBe('approved');
    expect((await t.http().get(`/api/figures/${id}`).set(auth(tok.editor)).expect(200)).body.thumbnailAssetId ?? null).toBeNull();
    const set = (await t.http().post('/api/figure-sets').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Approved set ${RUN_ID}`, figureIds: [id], columns: 1 }).expect(201)).body;
    setIds.push(set.id);
    const jobId: string = (await t.http().post(`/api/figure-sets/${set.id}/exports`).set(auth(tok.illustrator)).send({ format: 'png', widthMm: 60, heightMm: 40, dpi: 300 }).expect(201)).body.jobId;
    const job = await finished(jobId, 150000);
    expect(job.error ?? null).toBeNull();
    expect(job.assets.map((a) => a.kind).sort()).toEqual(['glb', 'png', 'stl']); // the set job made the mesh
    const fig = await waitFor('the thumbnail of the approved figure', async () => {
      const f = await polled(t.http().get(`/api/figures/${id}`).set(auth(tok.editor)));
      return f?.thumbnailAssetId ? f : undefined;
    }, 90000, 300);
    expect(fig.status).toBe('approved');
    expect(fig.assets.find((a: { id: string }) => a.id === fig.thumbnailAssetId)).toMatchObject({ kind: 'png', stats: { thumbnail: true, widthPx: 320, heightPx: 240 } });
  }, 240000);

  it('downloads are attachments named from the figure through the file-name template; every file of the figure gets its own name', async () => {
    const png = pngJob.assets.find((a) => a.kind === 'png')!;
    const figure = (await t.http().get(`/api/figures/${figureId}`).set(auth(tok.editor)).expect(200)).body;
    const names = new Map<string, string>();
    for (const a of figure.assets as { id: string; kind: string; stats: { thumbnail?: boolean } | null }[]) {
      const link = (await t.http().get(`/api/assets/${a.id}/link`).set(auth(tok.editor)).expect(200)).body;
      expect(link.fileName).toMatch(/^[a-z0-9._-]+$/);
      names.set(a.id, link.fileName);
      // The storage answers the presigned link as an attachment with that name (RFC 6266), so the browser
      // saves the file and the app's page stays.
      const res = await fetch(link.url);
      expect(res.status).toBe(200);
      expect(res.headers.get('content-disposition')).toBe(`attachment; filename="${link.fileName}"; filename*=UTF-8''${link.fileName}`);
      await res.arrayBuffer();
    }
    // The publication's delivery profile template (the demo book's: shells-lobes_{figure}_{label}_{widthMm}x{heightMm}mm_{dpi}dpi),
    // filled in by hand here: the figure title up to a colon and the label as slugs, the PNG's size and dpi.
    const template: string = (await t.http().get(`/api/publications/${pub}/delivery-profile`).set(auth(tok.editor)).expect(200)).body.fileNameTemplate;
    const slugTitle = `export-2pz-${RUN_ID}`; // "Export 2p_z <run>": the title is typeset first (2p with subscript z), then slugged
    const fill = (w: Record<string, string>) => template.replace(/\{(\w+)\}/g, (_, k: string) => w[k] ?? '');
    expect(names.get(png.id)).toBe(`${fill({ publication: 'shells-and-lobes', figure: slugTitle, label: '2pz', widthMm: '89', heightMm: '60', dpi: '300' })}.png`);
    expect([...names.values()].some((n) => n.endsWith('.glb') && n.includes(`${slugTitle}_2pz`))).toBe(true);
    expect(new Set(names.values()).size).toBe(names.size); // never two files under one name
  });

  it('invalid export requests answer 400 naming the field and queue nothing', async () => {
    const before = await jobCount();
    const cases: [unknown, RegExp][] = [
      [{ format: 'png', widthMm: 5, heightMm: 60, dpi: 300 }, /^widthMm: .*10 to 1000/],
      [{ format: 'png', widthMm: 89, heightMm: 'tall', dpi: 300 }, /^heightMm: /],
      [{ format: 'png', widthMm: 89, heightMm: 60, dpi: 72 }, /^dpi: must be one of 300, 600, 1200/],
      [{ format: 'png', widthMm: 89, heightMm: 60, dpi: 300, transparent: 'yes' }, /^transparent: /],
      [{ format: 'png', widthMm: 1000, heightMm: 1000, dpi: 1200 }, /^dpi: .*47244 × 47244 px/],
      [{ format: 'png', widthMm: 89, heightMm: 60, dpi: 300, colour: 'red' }, /^colour: is not a field/],
      [{ format: 'jpeg' }, /^format: must be one of png, tiff, svg, pdf, glb, stl, bundle/],
      [{ format: 'tiff', widthMm: 89, heightMm: 60, dpi: 600, colour: 'hexachrome' }, /^colour: must be one of rgb, cmyk/],
      [{ format: 'tiff', widthMm: 89, heightMm: 60, dpi: 600, colour: 'cmyk', alpha: true }, /^alpha: a CMYK TIFF is always flattened/],
      [{ format: 'pdf', kind: 'section', pressCondition: 'newsprint' }, /^pressCondition: must be one of fogra39, gracol, swop/],
      [{ format: 'svg', kind: 'pie' }, /^kind: /],
      [{ format: 'svg', kind: 'section', plane: 'xw' }, /^plane: /],
      [{ format: 'svg', kind: 'section', levels: 0 }, /^levels: /],
    ];
    for (const [body, message] of cases) {
      const res = await t.http().post(`/api/figures/${figureId}/exports`).set(auth(tok.illustrator)).send(body as object).expect(400);
      expect([res.body.message].flat().some((m: string) => message.test(m))).toBe(true);
    }
    expect(await jobCount()).toBe(before);
  });

  it('a non-member can neither export nor download (404); another illustrator of the publication gets 403; editors may export', async () => {
    const before = await jobCount();
    await t.http().post(`/api/figures/${figureId}/exports`).set(auth(outsider)).send({ format: 'glb' }).expect(404);
    await t.http().post(`/api/figures/${figureId}/exports`).set(auth(otherIllustrator)).send({ format: 'glb' }).expect(403);
    expect(await jobCount()).toBe(before);
    const png = pngJob.assets.find((a) => a.kind === 'png')!;
    await t.http().get(`/api/assets/${png.id}/download`).set(auth(outsider)).expect(404);
    await t.http().get(`/api/jobs/${pngJob.id}`).set(auth(outsider)).expect(404);
    await t.http().post(`/api/figures/${figureId}/exports`).send({ format: 'glb' }).expect(401);
    const stl = await finished(await exportJob({ format: 'stl' }, tok.editor));
    expect(stl.assets.map((a) => a.kind)).toEqual(['stl']);
  });
});
