// A print shows no facets: the PNG export of a 3d_xy at 180 mm wide and 1200 dpi (8504 px), rendered by the
// worker's render path (headless Chromium drawing the figure's mesh), has the silhouette of the true surface to
// within one pixel everywhere. Needs the whole stack (PSIFORM_URL), as the other end-to-end tests.
//
// Seen along z with an orthographic camera, the 3d_xy surface |psi| = c projects onto the region
// |psi(x, y, 0)| >= c: psi = k x y e^{-r/3} (R_32 Y_xy, Griffiths Tables 4.3 and 4.7; real form, common practice) falls
// with |z| at fixed x, y, so the widest section is z = 0. The page frames the figure by the largest vertex
// radius of the mesh it draws (apps/web/src/scene/framing.ts placeCamera: orthographic half-height
// 1.12 × radius for a canvas wider than tall), so pixel (i, j) is at x = (i + 1/2 − W/2) s, y = ±(H/2 − j − 1/2) s
// with s = 2 × 1.12 × radius / H a0; the silhouette is symmetric under x -> −x and y -> −y, so the sign of y
// does not matter. A pixel counts as covered when its alpha is at least half (transparent background).
import assert from 'node:assert/strict';
import { test } from 'node:test';
import { PNG } from 'pngjs';
import { apiCall, apiLogin, DEMO_ILLUSTRATOR } from './browser.mjs';
import { readGlb } from './glb.mjs';

const FRAME_MARGIN = 1.12; // framing.ts

async function waitJob(token, jobId, what) {
  for (let i = 0; i < 1200; i++) {
    const { body: job } = await apiCall(`${what}: polling job ${jobId}`, 'GET', `/api/jobs/${jobId}`, { token });
    if (job.state === 'completed') return job;
    if (job.state === 'failed') throw new Error(`${what} failed: ${job.error}`);
    await new Promise((r) => setTimeout(r, 500));
  }
  throw new Error(`${what}: job ${jobId} did not finish in 10 minutes`);
}

async function download(token, asset) {
  const { body: link } = await apiCall(`Link to asset ${asset.id}`, 'GET', `/api/assets/${asset.id}/link`, { token });
  return new Uint8Array(await (await fetch(link.url)).arrayBuffer());
}

test('PNG export of 3d_xy, 180 mm at 1200 dpi: the silhouette is the analytic one within one pixel', { timeout: 900_000 }, async () => {
  const token = await apiLogin(DEMO_ILLUSTRATOR);
  const { body: pubs } = await apiCall('Listing publications', 'GET', '/api/publications', { token });
  const list = Array.isArray(pubs) ? pubs : pubs.items;
  const recipe = {
    version: 1,
    label: '3d_xy',
    content: { Z: 1, terms: [{ n: 3, l: 2, m: -2, basis: 'real', re: 1, im: 0 }] },
    grid: { n: 'auto', extent: 'auto' },
    surface: { rule: 'enclosed', fraction: 0.9 },
    stage: { camera: { view: 'axis_z', projection: 'orthographic', target: [0, 0, 0], fovDeg: 35, zoom: 1 }, background: { transparent: true, color: '#ffffff' } },
    annotations: { axes: false, scaleBar: { show: false, unit: 'bohr' }, nucleus: false, label: { show: false } },
    canvas: { widthMm: 180, heightMm: 90, dpi: 1200 },
  };
  const { body: fig } = await apiCall('Creating the 3d_xy figure', 'POST', '/api/figures', { token, body: { publicationId: list[0].id, title: `silhouette 3d_xy ${Date.now()}`, recipe } });
  const { body: meshReq } = await apiCall('Asking for its mesh', 'POST', `/api/figures/${fig.id}/meshes`, { token });
  const meshJob = await waitJob(token, meshReq.jobId, 'The mesh job');
  const glbAsset = meshJob.assets.find((a) => a.kind === 'glb');
  const glb = readGlb(await download(token, glbAsset));
  // The page's framing radius: the largest vertex distance of the drawn meshes (float32, as the page reads them).
  let r2 = 0;
  for (const m of Object.values(glb)) for (let i = 0; i < m.positions.length; i += 3) r2 = Math.max(r2, m.positions[i] ** 2 + m.positions[i + 1] ** 2 + m.positions[i + 2] ** 2);
  const radius = Math.sqrt(r2);

  const { body: exp } = await apiCall('Asking for the PNG export', 'POST', `/api/figures/${fig.id}/exports`, { token, body: { format: 'png', widthMm: 180, heightMm: 90, dpi: 1200, transparent: true } });
  const job = await waitJob(token, exp.jobId, 'The PNG export');
  const pngAsset = job.assets.find((a) => a.kind === 'png');
  const png = PNG.sync.read(Buffer.from(await download(token, pngAsset)));
  const W = png.width;
  const H = png.height;
  assert.equal(W, Math.round((180 / 25.4) * 1200));
  assert.equal(H, Math.round((90 / 25.4) * 1200));

  // The level the mesh job solved for (its stats), and psi in the plane z = 0: k x y e^{-r/3} with
  // R_32 = 4/(81 sqrt 30) r² e^{-r/3} and Y_xy = sqrt(15/(16 pi)) sin²θ sin 2φ, r² sin²θ sin 2φ = 2xy:
  // k = 4/(81 sqrt 30) × sqrt(15/(16 pi)) × 2 = 2/(81 sqrt(2 pi)).
  const c = glbAsset.stats.isovalue;
  const k = 2 / (81 * Math.sqrt(2 * Math.PI));
  const s = (2 * FRAME_MARGIN * radius) / H;
  let covered = 0;
  let wrong = 0;
  let worst = 0;
  let worstAt = null;
  for (let j = 0; j < H; j++) {
    const y = (H / 2 - j - 0.5) * s;
    for (let i = 0; i < W; i++) {
      const x = (i + 0.5 - W / 2) * s;
      const inPng = png.data[4 * (j * W + i) + 3] >= 128;
      if (inPng) covered++;
      const r = Math.hypot(x, y);
      const e = Math.exp(-r / 3);
      const psi = k * x * y * e;
      const inside = Math.abs(psi) >= c;
      if (inPng === inside) continue;
      // First-order distance (pixels) of this pixel's centre from the analytic silhouette's edge.
      const gx = k * e * (y - (x * x * y) / (3 * r || 1));
      const gy = k * e * (x - (x * y * y) / (3 * r || 1));
      const d = Math.abs(Math.abs(psi) - c) / Math.hypot(gx, gy) / s;
      if (d > 1) {
        wrong++;
        if (d > worst) {
          worst = d;
          worstAt = [i, j];
        }
      }
    }
  }
  assert.ok(covered > 0.05 * W * H, `the export shows the figure (${covered} covered pixels)`);
  assert.equal(wrong, 0, `${wrong} pixels disagree with the analytic silhouette by more than one pixel (worst ${worst.toFixed(2)} px at ${worstAt})`);
});
