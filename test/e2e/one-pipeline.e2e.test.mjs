// One recipe, three entry points, the same surfaces: the worker's mesh job (through the running API), the CLI
// (apps/cli/bin/psiform.js) and the Studio's preview Web Worker (the built bundle apps/web/dist/assets/
// preview.worker-*.js, run in a Node worker thread with a `self` stand-in) all call @psiform/meshing's
// recipeToSurfaces and colour with @psiform/colour's phaseColoursInto. Positions, triangles and vertex colours
// must agree to the bit: the worker and the CLI at the 3D-file tolerance, the preview (which projects its
// vertices but splits nothing, to stay quick) with the CLI at --tolerance none. Needs the whole stack
// (PSIFORM_URL) and the built CLI and client.
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { test } from 'node:test';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { baseUrl, DEMO_ILLUSTRATOR } from './browser.mjs';
import { readGlb } from './glb.mjs';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

async function api(method, route, token, body) {
  const res = await fetch(`${baseUrl()}${route}`, {
    method,
    headers: { 'Content-Type': 'application/json', Accept: 'application/json', ...(token ? { Authorization: `Bearer ${token}` } : {}) },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const text = await res.text();
  if (!res.ok) throw new Error(`${method} ${route} answered ${res.status}: ${text.slice(0, 300)}`);
  return text ? JSON.parse(text) : null;
}

/** Runs the built preview worker bundle in a worker thread; resolves with its 'surface' answer. */
async function preview(recipe) {
  const assets = path.join(ROOT, 'apps/web/dist/assets');
  const bundle = fs.existsSync(assets) && fs.readdirSync(assets).find((f) => /^preview\.worker-.*\.js$/.test(f));
  if (!bundle) throw new Error('apps/web/dist/assets/preview.worker-*.js is missing: build the client (npm run build -w @psiform/web)');
  const boot = `
    const { parentPort } = require('node:worker_threads');
    globalThis.self = globalThis;
    globalThis.postMessage = (msg) => parentPort.postMessage(msg);
    parentPort.on('message', (data) => globalThis.onmessage?.({ data }));
    import(${JSON.stringify(pathToFileURL(path.join(assets, bundle)).href)}).then(() => parentPort.postMessage({ type: 'loaded' }));
  `;
  const w = new Worker(boot, { eval: true });
  try {
    return await new Promise((resolve, reject) => {
      w.on('error', reject);
      w.on('message', (msg) => {
        if (msg.type === 'loaded') {
          const state = { Z: recipe.content.Z, terms: recipe.content.terms };
          w.postMessage({ type: 'sample', seq: 1, state, n: recipe.grid.n, extent: recipe.grid.extent });
          w.postMessage({ type: 'surface', seq: 2, sampleSeq: 1, rule: recipe.surface, palette: recipe.palette, mode: recipe.phase.mode });
        } else if (msg.type === 'surface') resolve(msg);
        else if (msg.type === 'error') reject(new Error(`preview worker: ${msg.message}`));
      });
    });
  } finally {
    await w.terminate();
  }
}

function sameArray(a, b, what) {
  assert.equal(a.length, b.length, `${what}: lengths ${a.length} and ${b.length}`);
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i] && !(Number.isNaN(a[i]) && Number.isNaN(b[i]))) assert.fail(`${what}: element ${i} differs (${a[i]} vs ${b[i]})`);
}

test('worker job, CLI and preview worker give the same vertices, triangles and colours for one recipe', { timeout: 300_000 }, async () => {
  const { accessToken: token } = await api('POST', '/api/auth/login', null, DEMO_ILLUSTRATOR);
  const pubs = await api('GET', '/api/publications', token);
  const list = Array.isArray(pubs) ? pubs : pubs.items;
  assert.ok(list?.length, 'the demo illustrator belongs to a publication');
  // A complex state (colours from arg psi on a swatchbook wheel) and a real one (sign colours), on fixed grids so
  // the three entry points sample exactly the same points.
  const recipes = [
    { version: 1, label: '3d (m=+1)', content: { Z: 1, terms: [{ n: 3, l: 2, m: 1, basis: 'complex', re: 1, im: 0 }] }, grid: { n: 40, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.8 }, palette: { wheel: { lightness: 0.66, chroma: 0.12 } } },
    { version: 1, label: '3d_z²', content: { Z: 2, terms: [{ n: 3, l: 2, m: 0, basis: 'real', re: 1, im: 0 }] }, grid: { n: 36, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } },
  ];
  for (const input of recipes) {
    const fig = await api('POST', '/api/figures', token, { publicationId: list[0].id, title: `one pipeline ${input.label} ${Date.now()}`, recipe: input });
    const recipe = fig.currentVersion.recipe;
    assert.ok(recipe?.content, 'the figure carries its stored recipe');
    const { jobId } = await api('POST', `/api/figures/${fig.id}/meshes`, token);
    let job;
    for (let i = 0; i < 240; i++) {
      job = await api('GET', `/api/jobs/${jobId}`, token);
      if (job.state === 'completed' || job.state === 'failed') break;
      await new Promise((r) => setTimeout(r, 500));
    }
    assert.equal(job.state, 'completed', `mesh job: ${job.error ?? job.state}`);
    const glbAsset = job.assets.find((a) => a.kind === 'glb');
    const link = await api('GET', `/api/assets/${glbAsset.id}/link`, token);
    const fromWorker = readGlb(new Uint8Array(await (await fetch(link.url)).arrayBuffer()));

    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'psiform-one-pipeline-'));
    try {
      fs.writeFileSync(path.join(dir, 'r.json'), JSON.stringify(recipe));
      const out = path.join(dir, 'cli.glb');
      const r = spawnSync(process.execPath, [path.join(ROOT, 'apps/cli/bin/psiform.js'), 'mesh', '--recipe', path.join(dir, 'r.json'), '--out', out, '--json'], { encoding: 'utf8', timeout: 120_000 });
      assert.equal(r.status, 0, `CLI: ${r.stderr}`);
      const fromCli = readGlb(new Uint8Array(fs.readFileSync(out)));
      const outNone = path.join(dir, 'cli-none.glb');
      const rn = spawnSync(process.execPath, [path.join(ROOT, 'apps/cli/bin/psiform.js'), 'mesh', '--recipe', path.join(dir, 'r.json'), '--out', outNone, '--tolerance', 'none'], { encoding: 'utf8', timeout: 120_000 });
      assert.equal(rn.status, 0, `CLI --tolerance none: ${rn.stderr}`);
      const fromCliNone = readGlb(new Uint8Array(fs.readFileSync(outNone)));
      const fromPreview = await preview(recipe);

      assert.deepEqual(Object.keys(fromCli).sort(), Object.keys(fromWorker).sort());
      for (const phase of Object.keys(fromWorker)) {
        const w = fromWorker[phase];
        const c = fromCli[phase];
        const p = fromPreview.surfaces.find((s) => s.phase === phase);
        const n = fromCliNone[phase];
        assert.ok(p, `the preview has the ${phase} surface`);
        sameArray(c.positions, w.positions, `${input.label} ${phase} positions, CLI vs worker`);
        sameArray(c.indices, w.indices, `${input.label} ${phase} triangles, CLI vs worker`);
        sameArray(c.colors, w.colors, `${input.label} ${phase} colours, CLI vs worker`);
        sameArray(p.positions, n.positions, `${input.label} ${phase} positions, preview vs CLI --tolerance none`);
        sameArray(p.indices, n.indices, `${input.label} ${phase} triangles, preview vs CLI --tolerance none`);
        sameArray(p.colors, n.colors, `${input.label} ${phase} colours (linear), preview vs CLI --tolerance none`);
        // The refined mesh keeps every projected vertex of the unrefined one, first and in order.
        sameArray(w.positions.subarray(0, n.positions.length), n.positions, `${input.label} ${phase} projected vertices kept by refinement`);
      }
      // And the claims agree: level, all-space fraction and warnings.
      const cli = JSON.parse(r.stdout);
      const stats = glbAsset.stats;
      assert.equal(cli.isovalue, stats.isovalue);
      assert.equal(fromPreview.isovalue, stats.isovalue);
      assert.equal(cli.enclosed, stats.enclosed);
      assert.deepEqual(cli.warnings, stats.warnings);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }
});
