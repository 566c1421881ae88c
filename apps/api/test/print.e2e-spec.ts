import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { unzipSync, strFromU8 } from 'fflate';
import { DEFAULT_DELIVERY_PROFILE, PREFLIGHT_RULES, type JobDto, type PreflightReport } from '@psiform/contracts';
import { auth, demoTokens, jobEnded, startTestApp, RUN_ID, type TestApp } from './support';
import { startWorkerProcess, type WorkerProcess } from './worker-process';

const WEB_DIST = join(__dirname, '..', '..', 'web', 'dist');
const DIR = mkdtempSync(join(tmpdir(), 'psiform-print-e2e-'));

/** Debian readers no one here wrote (libtiff-tools, poppler-utils, qpdf, liblcms2-utils; `npm test` installs them). */
function tool(cmd: string, args: string[], input?: string): { code: number; out: string } {
  const r = spawnSync(cmd, args, { encoding: 'utf8', input });
  if (r.error) throw new Error(`${cmd} is needed: ${r.error.message}`);
  return { code: r.status ?? 1, out: `${r.stdout}${r.stderr}` };
}

/** Print production end to end: delivery profile, CMYK TIFF, PDF section map, swatch CMYK, bundle preflight, approval gate. */
describe('print production (e2e)', () => {
  let t: TestApp;
  let tok: Awaited<ReturnType<typeof demoTokens>>;
  let worker: WorkerProcess | undefined;
  let pub: string;
  let figureId: string;

  const finished = (jobId: string) => jobEnded(t, tok.editor, jobId, 120000, 250);
  const exportOk = async (body: object): Promise<JobDto> => {
    const { jobId } = (await t.http().post(`/api/figures/${figureId}/exports`).set(auth(tok.illustrator)).send(body).expect(201)).body;
    const job = await finished(jobId);
    expect(job.error ?? null).toBeNull();
    expect(job.state).toBe('completed');
    return job;
  };
  const asset = async (assetId: string) => (await t.ds.query(`SELECT kind, stats FROM assets WHERE id = $1`, [assetId]))[0] as { kind: string; stats: Record<string, any> };
  async function download(assetId: string, name: string): Promise<string> {
    const res = await t.http().get(`/api/assets/${assetId}/download`).set(auth(tok.editor)).expect(302);
    const file = await fetch(res.headers.location as string);
    const path = join(DIR, name);
    writeFileSync(path, new Uint8Array(await file.arrayBuffer()));
    return path;
  }
  const everyRule = (r: PreflightReport) => {
    for (const f of r.files) {
      expect(f.results.map((x) => x.rule)).toEqual(PREFLIGHT_RULES.map((x) => x.id));
      for (const x of f.results) expect(['pass', 'fail']).toContain(x.status);
    }
  };

  beforeAll(async () => {
    if (!existsSync('/usr/bin/chromium')) throw new Error('print exports need /usr/bin/chromium');
    if (!existsSync(join(WEB_DIST, 'render.html'))) throw new Error(`print exports need the built client: ${WEB_DIST}/render.html is missing`);
    t = await startTestApp();
    tok = await demoTokens(t);
    pub = (await t.http().post('/api/publications').set(auth(tok.admin)).send({ title: `Print Desk Quarterly ${RUN_ID}`, publisher: 'Fenwold Academic', kind: 'journal_volume' }).expect(201)).body.id;
    const ids: { id: string }[] = await t.ds.query(`SELECT id FROM users WHERE email IN ('illustrator@demo.psiform.test', 'editor@demo.psiform.test', 'artdirector@demo.psiform.test')`);
    for (const { id } of ids) await t.http().post(`/api/publications/${pub}/members`).set(auth(tok.admin)).send({ userId: id }).expect(201);
    const recipe = { version: 1, label: '3d_z²', content: { Z: 1, terms: [{ n: 3, l: 2, m: 0, basis: 'real', re: 1 }] }, grid: { n: 32 }, surface: { rule: 'enclosed', fraction: 0.9 } };
    figureId = (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Plate 3d_z² ${RUN_ID}`, recipe }).expect(201)).body.id;
    worker = await startWorkerProcess({ WEB_DIST, THUMBNAILS: 'off' });
  }, 60000);

  afterAll(async () => {
    await worker?.stop();
    await t?.close();
  });

  it('delivery profile: defaults until set; art directors set it; bad fields are named and change nothing; illustrators may not', async () => {
    const before = (await t.http().get(`/api/publications/${pub}/delivery-profile`).set(auth(tok.editor)).expect(200)).body;
    expect(before).toMatchObject({ isDefault: true, pressCondition: DEFAULT_DELIVERY_PROFILE.pressCondition });
    const bad = await t.http().put(`/api/publications/${pub}/delivery-profile`).set(auth(tok.artDirector)).send({ ...DEFAULT_DELIVERY_PROFILE, minDpi: 20, pressCondition: 'newsprint' }).expect(400);
    expect(bad.body.message).toEqual(expect.arrayContaining([expect.stringMatching(/^minDpi: /), expect.stringMatching(/^pressCondition: /)]));
    expect((await t.http().get(`/api/publications/${pub}/delivery-profile`).set(auth(tok.editor)).expect(200)).body.isDefault).toBe(true);
    await t.http().put(`/api/publications/${pub}/delivery-profile`).set(auth(tok.illustrator)).send(DEFAULT_DELIVERY_PROFILE).expect(403);
    const profile = { ...DEFAULT_DELIVERY_PROFILE, columnWidthsMm: [{ name: 'single', widthMm: 89 }, { name: 'double', widthMm: 183 }], minDpi: 600, colourMode: 'cmyk', pressCondition: 'fogra39' };
    const put = (await t.http().put(`/api/publications/${pub}/delivery-profile`).set(auth(tok.artDirector)).send(profile).expect(200)).body;
    expect(put).toMatchObject({ isDefault: false, minDpi: 600, columnWidthsMm: profile.columnWidthsMm });
  });

  it('a CMYK TIFF of 3d_z² at 89 mm and 600 dpi reads in tiffinfo as separated, LZW, 600 ppi, 2102 px wide, profile embedded', async () => {
    const job = await exportOk({ format: 'tiff', widthMm: 89, heightMm: 60, dpi: 600, colour: 'cmyk', pressCondition: 'fogra39' });
    const tiff = job.assets.find((r) => r.kind === 'tiff')!;
    expect(job.assets.some((r) => r.kind === 'softproof')).toBe(true);
    const info = tool('tiffinfo', [await download(tiff.id, 'plate.tif')]).out;
    expect(info).toMatch(/Image Width: 2102 Image Length: 1417/); // 89 and 60 mm at 600 dpi: round(mm / 25.4 × 600)
    expect(info).toMatch(/Photometric Interpretation: separated/);
    expect(info).toMatch(/Compression Scheme: LZW/);
    expect(info).toMatch(/Resolution: 600, 600 pixels\/inch/);
    expect(info).toMatch(/ICC Profile: <present>, 120296 bytes/);
    expect(info).not.toMatch(/Extra Samples/);
    const report = (tiff.stats as { preflight: PreflightReport }).preflight;
    everyRule(report);
    const by = Object.fromEntries(report.files[0].results.map((r) => [r.rule, r.status]));
    expect(by).toMatchObject({ size: 'pass', resolution: 'pass', column_width: 'pass', colour_mode: 'pass', icc_profile: 'pass' });
  }, 180000);

  it('the section-map PDF has only embedded subset fonts and the requested page size; qpdf finds no errors', async () => {
    const job = await exportOk({ format: 'pdf', kind: 'section', plane: 'xz', widthMm: 120, heightMm: 90 });
    const pdf = job.assets[0].id;
    expect(job.assets[0].kind).toBe('pdf');
    const file = await download(pdf, 'section.pdf');
    const fonts = tool('pdffonts', [file]).out.trim().split('\n').slice(2);
    expect(fonts.length).toBeGreaterThan(0);
    for (const line of fonts) expect(line).toMatch(/^[A-Z]{6}\+\S+\s.*\syes\s+yes\s+yes\s/);
    // 120 × 90 mm = 340.157 × 255.118 pt.
    expect(tool('pdfinfo', ['-box', file]).out).toMatch(/Page size:\s+340\.15\d* x 255\.11\d* pts/);
    expect(tool('qpdf', ['--check', file]).code).toBe(0);
    const stats = (await asset(pdf)).stats;
    expect(stats).toMatchObject({ colour: 'cmyk', pressCondition: 'fogra39' });
    everyRule(stats.preflight);
  }, 120000);

  it('swatch CMYK values agree with transicc on the same profile within 1 percentage point', async () => {
    const colours = { positive: '#1f5e5b', negative: '#a86a1c', screenGreen: '#00ff00', paper: '#f8f5ee' };
    const r = (await t.http().post('/api/press-conditions/fogra39/check').set(auth(tok.artDirector)).send({ colours }).expect(200)).body;
    expect(r.condition.id).toBe('fogra39');
    const lines = Object.values(colours).map((h) => [1, 3, 5].map((i) => parseInt(h.slice(i, i + 2), 16)).join(' '));
    const ref = tool('transicc', ['-t1', '-c0', '-i', '*sRGB', '-o', join(__dirname, '../../../assets/icc/psiform-fogra39.icc'), '-n'], lines.join('\n') + '\n').out.trim().split('\n').map((l) => l.trim().split(/\s+/).map(Number));
    r.swatches.forEach((s: { cmyk: number[] }, i: number) => s.cmyk.forEach((v, k) => expect(Math.abs(v - ref[i][k])).toBeLessThanOrEqual(1)));
    expect(r.swatches.find((s: { name: string }) => s.name === 'screenGreen').inGamut).toBe(false);
    await t.http().post('/api/press-conditions/fogra39/check').set(auth(tok.artDirector)).send({ colours: { a: '#zzz' } }).expect(400);
    await t.http().post('/api/press-conditions/newsprint/check').set(auth(tok.artDirector)).send({ colours }).expect(404);
  });

  it("a bundle's preflight report lists every rule with pass or fail for each print file", async () => {
    const job = await exportOk({ format: 'bundle' });
    const zip = unzipSync(new Uint8Array(readFileSync(await download(job.assets[0].id, 'bundle.zip'))));
    expect(Object.keys(zip)).toEqual(expect.arrayContaining(['figure.png', 'figure.tif', 'radial.svg', 'radial.pdf', 'preflight.json', 'PREFLIGHT.txt']));
    const report = JSON.parse(strFromU8(zip['preflight.json'])) as PreflightReport;
    expect(report.files.map((f) => f.file)).toEqual(expect.arrayContaining(['figure.png', 'figure.tif', 'radial.svg', 'radial.pdf']));
    everyRule(report);
    expect(report.profile.minDpi).toBe(600);
  }, 180000);

  it('failed preflight blocks approval (409 naming the rule) until the editor overrides with a written reason, which is audited', async () => {
    await exportOk({ format: 'tiff', widthMm: 89, heightMm: 60, dpi: 300, colour: 'cmyk' });
    const pf = (await t.http().get(`/api/figures/${figureId}/preflight`).set(auth(tok.editor)).expect(200)).body;
    expect(pf.blocksApproval).toBe(true);
    expect(pf.failures.join('\n')).toMatch(/resolution: expected at least 600 dpi .* has 300 dpi/);
    await t.http().post(`/api/figures/${figureId}/submit`).set(auth(tok.illustrator)).expect(200);
    const blocked = await t.http().post(`/api/figures/${figureId}/approve`).set(auth(tok.editor)).send({}).expect(409);
    expect(blocked.body).toMatchObject({ gate: 'preflight', overridable: true });
    await t.http().post(`/api/figures/${figureId}/approve`).set(auth(tok.editor)).send({ override: { reason: 'ok' } }).expect(400);
    const reason = 'Printer confirmed 300 dpi is enough for this plate at this size.';
    const ok = await t.http().post(`/api/figures/${figureId}/approve`).set(auth(tok.editor)).send({ override: { reason } }).expect(200);
    expect(ok.body.status).toBe('approved');
    const audit = (await t.http().get(`/api/figures/${figureId}/audit`).set(auth(tok.editor)).expect(200)).body as { action: string; note: string }[];
    expect(audit.find((a) => a.action === 'preflight_override')?.note).toContain(reason);
  }, 180000);
});
