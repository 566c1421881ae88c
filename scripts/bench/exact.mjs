// Bench sections for exact surfaces (projection, refinement to a tolerance, coarse-to-fine sampling, screen GLB):
// called from scripts/bench.mjs with its helpers, so they print in the same tables and summary.
//   exact    geometric error per state at the defaults of a 3D file, and of a 180 mm / 1200 dpi print
//   sparse   3d_z² at 512³ effective (coarse-to-fine) against scikit-image marching cubes on a uniform 256³ grid
//            of the same field, in the same run, as medians of pairs; peak RSS of the 512³ run in its own process
//   topology components and Euler characteristics found against the true surface's (analyseSurface) at the defaults

import { spawnSync } from 'node:child_process';
import * as os from 'node:os';
import * as path from 'node:path';

export function exactSections(ctx) {
  const { orbitals, meshing, table, heading, fmt, results, ARGS, HERE, skimageAvailable, peakRssKb, now } = ctx;
  const label = (s) => orbitals.parseOrbitalLabel(s).state;
  const recipe = (content, n = 'auto') => ({ content, grid: { n, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } });
  const e = (x) => (Number.isFinite(x) ? x.toExponential(2) : String(x));

  /** Largest deviation of every surface of a result, measured here (not the pipeline's own number). */
  function measured(r) {
    let worst = 0;
    for (const s of r.surfaces) {
      if (s.mesh.indices.length === 0) continue;
      const F = meshing.levelFunction(r.field, s.phase, r.isovalue);
      worst = Math.max(worst, meshing.meshDeviation(s.mesh, F).max);
    }
    return worst;
  }

  async function sectionExact() {
    heading('Exact surfaces: geometric error at the 3D-file default (max |F|/|grad F| over vertices, edge midpoints, centroids; a0)');
    const rows = [];
    const states = [
      ['1s', label('1s')],
      ['2s', label('2s')],
      ['2p_z', label('2pz')],
      ['3d_z²', label('3dz2')],
      ['3d_xy', label('3dxy')],
      ['4f_xyz', label('4fxyz')],
      ['2p(m=+1) complex', orbitals.stateFromNlm(2, 1, 1, { complex: true })],
      ['5s', label('5s')],
    ];
    for (const [name, content] of ARGS.has('--quick') ? states.slice(0, 3) : states) {
      const t0 = now();
      const r = await meshing.recipeToSurfaces(recipe(content), { tolerance: 'file' });
      const ms = now() - t0;
      let extra = '';
      if (name === '1s') {
        // Closed form: the 90 % surface of 1s is the sphere r = R with 1 − e^{-2R}(1 + 2R + 2R²) = 0.9.
        const R = orbitals.oneSEnclosingRadius(0.9, 1);
        const m = r.surfaces[0].mesh;
        let worst = 0;
        const P = m.positions;
        const I = m.indices;
        for (let v = 0; v < P.length; v += 3) worst = Math.max(worst, Math.abs(Math.hypot(P[v], P[v + 1], P[v + 2]) - R));
        for (let t = 0; t < I.length; t += 3)
          for (const [a, b] of [[I[t], I[t + 1]], [I[t + 1], I[t + 2]], [I[t + 2], I[t]]])
            worst = Math.max(worst, Math.abs(Math.hypot((P[3 * a] + P[3 * b]) / 2, (P[3 * a + 1] + P[3 * b + 1]) / 2, (P[3 * a + 2] + P[3 * b + 2]) / 2) - R));
        results.oneSExactError = worst;
        extra = `sphere: ${e(worst)}`;
      }
      const dev = measured(r);
      results[`exactError_${name}`] = { tolerance: r.refinement.tolerance, dev };
      rows.push([name, e(r.refinement.tolerance), e(dev), extra, String(r.refinement.trianglesBefore), String(r.refinement.trianglesAfter), fmt(ms, 0), dev <= r.refinement.tolerance * 1.0001 ? 'PASS' : 'MISS']);
    }
    table(['state', 'tolerance', 'measured', '1s vs closed form', 'tris before', 'tris after', 'ms', 'within'], rows);

    // A print: 3d_xy on a 180 mm square plate at 1200 dpi (8504 px), perspective 35° (the recipe default camera).
    const px = Math.round((180 / 25.4) * 1200);
    const t0 = now();
    const r = await meshing.recipeToSurfaces(recipe(label('3dxy')), { output: { widthPx: px, heightPx: px, camera: { projection: 'perspective', fovDeg: 35, zoom: 1 } } });
    const dev = measured(r);
    results.printError = { tolerance: r.refinement.tolerance, dev };
    console.log(`  print 3d_xy 180 mm × 180 mm at 1200 dpi (${px} px): quarter pixel ${e(r.refinement.tolerance)} a0, measured ${e(dev)} a0, ${r.refinement.trianglesAfter} triangles, ${fmt(now() - t0, 0)} ms`);

    // The screen GLB beside the archival one.
    const a = await meshing.recipeToSurfaces(recipe(label('3dz2')), { tolerance: 'file' });
    const surfaces = a.surfaces.filter((s) => s.mesh.indices.length > 0);
    const archival = await meshing.encodeGlb(surfaces, { version: 'bench' });
    const info = {};
    const screen = await meshing.encodeScreenGlb(surfaces, { version: 'bench', field: a.field, isovalue: a.isovalue, tolerance: meshing.screenTolerance(a.refinement.surfaceHalfWidth) }, info);
    results.screenGlb = { archival: archival.length, screen: screen.length };
    console.log(`  GLB 3d_z²: archival ${fmt(archival.length / 1e6, 2)} MB (${info.trianglesBefore} triangles, tolerance ${e(a.refinement.tolerance)} a0) → screen ${fmt(screen.length / 1e6, 3)} MB (${info.trianglesAfter} triangles, ≤ ${e(info.maxDeviation)} a0 of ${e(info.tolerance)} allowed)`);
  }

  async function childSparse512() {
    const t0 = now();
    const r = await meshing.recipeToSurfaces(recipe(label('3dz2'), 512), { tolerance: Infinity, stats: false });
    const ms = now() - t0;
    console.log(JSON.stringify({ ms, timings: r.timings_ms, sampling: r.sampling, triangles: r.surfaces.reduce((s, x) => s + x.mesh.indices.length / 3, 0), rssKb: peakRssKb() }));
  }

  /** The peer: NumPy samples 3d_z² on a uniform n³ grid and scikit-image meshes both phases (bench/skimage_field_mc.py). */
  function peerFieldMc(n, extent, level) {
    const r = spawnSync('/usr/bin/python3', [path.join(HERE, 'bench', 'skimage_field_mc.py'), String(n), String(extent), String(level)], { encoding: 'utf8', maxBuffer: 1 << 20 });
    if (r.status !== 0) return { error: (r.stderr || '').trim().split('\n').pop() };
    return JSON.parse(r.stdout);
  }

  /** One timed side of a pair, in its own process: sampling + marching cubes of 3d_z² at 512³, both phases. */
  async function childSparseTime() {
    const identity = (ctx) => ctx.surfaces;
    // --warm: as in a running worker, the process has already made one other figure (3d_xy at 256³, untimed; a
    // different state and grid, so nothing but the compiled code carries over).
    if (ARGS.has('--warm')) await meshing.recipeToSurfaces(recipe(label('3dxy'), 256), { refine: identity, stats: false });
    const c0 = process.cpuUsage();
    const t0 = now();
    const r = await meshing.recipeToSurfaces(recipe(label('3dz2'), 512), { refine: identity, stats: false, symmetry: !ARGS.has('--nosym') });
    const wall = now() - t0;
    const cu = process.cpuUsage(c0);
    console.log(JSON.stringify({ wall, cpu: (cu.user + cu.system) / 1000, sampling: r.sampling, triangles: r.surfaces.reduce((a, x) => a + x.mesh.indices.length / 3, 0) }));
  }

  async function sectionSparse() {
    heading('Coarse-to-fine: 3d_z² at 512³ effective (both phases) vs NumPy field + scikit-image marching cubes on uniform 256³ (same field, same run)');
    const content = label('3dz2');
    const plan = meshing.planSurfaces(recipe(content, 512));
    const c = plan.level.isovalue;
    const E = plan.extent;
    const compiled = orbitals.compileState(content);
    const withSk = skimageAvailable();
    console.log(`  peer: ${results.skimageNote}; load ${os.loadavg().map((x) => x.toFixed(2)).join(' ')} (uptime)`);
    const pairs = [];
    const reps = ARGS.has('--quick') ? 1 : 3;
    let last = null;
    // Ours: sampling (octree with safe bounds, blocks the surface can cross) + marching cubes, both phases; the
    // projection is timed apart (hooks.refine = identity), as the peer does not project. Wall and CPU time, like the peer's.
    // Each side runs in a fresh process of its own (the peer: python3; ours: node bench.mjs --child-sparse-time), so
    // neither carries the heap of earlier sections; each times only its work (imports and module loading excluded).
    // Two of ours per peer run: a fresh process (cold: the JavaScript engine compiles our kernels during the run) and
    // a process that has made one other figure first (warm: as a worker does from its second job on).
    const ours = (warm, nosym = false) => JSON.parse(spawnSync(process.execPath, [path.join(HERE, 'bench.mjs'), '--child-sparse-time', ...(warm ? ['--warm'] : []), ...(nosym ? ['--nosym'] : [])], { encoding: 'utf8', maxBuffer: 1 << 22 }).stdout.trim().split('\n').pop());
    const plain = [];
    for (let i = 0; i < reps; i++) {
      const j = ours(false);
      const w = ours(true);
      // For the record: the same without symmetry (every block bounded, sampled and meshed), fresh process.
      plain.push(ours(false, true));
      last = j;
      const sk = withSk ? peerFieldMc(256, E, c) : null;
      if (sk?.error) console.log(`  peer failed: ${sk.error}`);
      const skWall = sk && !sk.error ? sk.field_ms + sk.mc_ms : NaN;
      const skCpu = sk && !sk.error ? sk.field_cpu_ms + sk.mc_cpu_ms : NaN;
      pairs.push({ wall: j.wall, cpu: j.cpu, warmWall: w.wall, warmCpu: w.cpu, sk, skWall, skCpu });
    }
    // Same field on both sides: psi at the peer's probe points against the engine's psi.
    const probe = pairs.find((p) => p.sk && !p.sk.error)?.sk.probes ?? [];
    const h = (2 * E) / 255;
    let probeErr = 0;
    for (const [i, j, k, v] of probe) probeErr = Math.max(probeErr, Math.abs(compiled.evaluate(-E + i * h, -E + j * h, -E + k * h).re - v) / Math.abs(v));
    const med = (xs) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
    const ratio = med(pairs.map((p) => p.wall / p.skWall));
    const ratioCpu = med(pairs.map((p) => p.cpu / p.skCpu));
    results.sparseRatio = ratio;
    results.sparseRatioCpu = ratioCpu;
    results.sparseWarmRatio = med(pairs.map((p) => p.warmWall / p.skWall));
    results.sparseWarmRatioCpu = med(pairs.map((p) => p.warmCpu / p.skCpu));
    results.sparseLoad = os.loadavg()[0];
    const s = last.sampling;
    table(
      ['run', 'ours cold wall / CPU ms', 'ours warm wall / CPU ms', 'peer wall ms (field + mc)', 'peer CPU ms', 'cold ratio wall / CPU', 'warm ratio wall / CPU', 'points sampled', 'of dense 512³', 'triangles', 'peer triangles'],
      pairs.map((p, i) => [String(i + 1), `${fmt(p.wall, 0)} / ${fmt(p.cpu, 0)}`, `${fmt(p.warmWall, 0)} / ${fmt(p.warmCpu, 0)}`, p.sk && !p.sk.error ? `${fmt(p.skWall, 0)} (${fmt(p.sk.field_ms, 0)} + ${fmt(p.sk.mc_ms, 0)})` : '-', fmt(p.skCpu, 0), `${fmt(p.wall / p.skWall, 2)} / ${fmt(p.cpu / p.skCpu, 2)}`, `${fmt(p.warmWall / p.skWall, 2)} / ${fmt(p.warmCpu / p.skCpu, 2)}`, String(s.points), `${fmt((100 * s.points) / s.densePoints, 1)} %`, String(last.triangles), String(p.sk?.triangles ?? '-')]),
    );
    // 3d_z² is even in x, y and z: ours bounds, samples and meshes the upper eighth and reflects it (sparse.ts).
    const plainWall = med(pairs.map((p, i) => plain[i].wall / p.skWall));
    const plainCpu = med(pairs.map((p, i) => plain[i].cpu / p.skCpu));
    console.log(`  ours meshes the upper eighth (3d_z² is even in x, y and z) and reflects it; without symmetry (every block): ${plain.map((x) => `${fmt(x.wall, 0)} / ${fmt(x.cpu, 0)}`).join(', ')} ms wall / CPU, ratio ${fmt(plainWall, 2)} wall, ${fmt(plainCpu, 2)} CPU (same ${plain[0].triangles} triangles: ${plain[0].triangles === last.triangles ? 'yes' : 'NO'})`);
    console.log(`  median of pairs: ours / peer = ${fmt(ratio, 2)} wall, ${fmt(ratioCpu, 2)} CPU in a fresh process; ${fmt(results.sparseWarmRatio, 2)} wall, ${fmt(results.sparseWarmRatioCpu, 2)} CPU after one other figure; same field: largest relative difference of psi at the peer's probe points ${probeErr.toExponential(1)}; load after ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
    // The projection of every vertex onto the true surface (not in the ratio: the peer has no counterpart).
    const t1 = now();
    const rp = await meshing.recipeToSurfaces(recipe(content, 512), { tolerance: Infinity, stats: false });
    console.log(`  with the projection of every vertex and analytic normals: ${fmt(now() - t1, 0)} ms wall (projection ${fmt(rp.timings_ms.refining, 0)} ms)`);
    const child = spawnSync(process.execPath, [path.join(HERE, 'bench.mjs'), '--child-sparse512'], { encoding: 'utf8', maxBuffer: 1 << 22 });
    try {
      const j = JSON.parse(child.stdout.trim().split('\n').pop());
      results.sparseRssMB = j.rssKb / 1024;
      console.log(`  peak RSS, 512³ effective in a fresh process: ${fmt(j.rssKb / 1024, 0)} MB (dense float32 512³ alone would be 512 MB); ${fmt(j.ms, 0)} ms`);
    } catch {
      console.log(`  peak RSS child failed: ${(child.stderr || '').split('\n').slice(-3).join(' ')}`);
    }
  }

  async function sectionTopology() {
    heading('Topology at the defaults (grid and box auto, 90 % over all space): the mesh against the true surface (SciPy, libs/meshing/test/topology_reference.py)');
    // Every named real form up to n = 7 (cos types m = 0..l: a sin type is its cos type turned about z by pi/2m, so
    // it has the same parts), complex m = +1, +2, +3 rings up to n = 7 (m and -m give the same |psi|), ns for n = 8..12.
    const cases = [];
    const maxN = ARGS.has('--quick') ? 3 : 7;
    for (let n = 1; n <= maxN; n++)
      for (let l = 0; l < n; l++)
        for (let m = 0; m <= l; m++) cases.push({ name: `${n}${'spdfghi'[l]} m=${m} real`, kind: 'real', n, l, m });
    for (let n = 2; n <= maxN; n++) for (let l = 1; l < n; l++) for (const m of [1, 2, 3]) if (m <= l) cases.push({ name: `${n}${'spdfghi'[l]} m=+${m} complex`, kind: 'complex', n, l, m });
    for (let n = 8; n <= (ARGS.has('--quick') ? 8 : 12); n++) cases.push({ name: `${n}s`, kind: 'real', n, l: 0, m: 0 });
    for (const c of cases) {
      c.state = orbitals.stateFromNlm(c.n, c.l, c.m, { complex: c.kind === 'complex' });
      c.t = orbitals.levelSolver(orbitals.compileState(c.state)).solve(0.9).density;
    }
    const ref = spawnSync('/usr/bin/python3', [path.join(HERE, '..', 'libs', 'meshing', 'test', 'topology_reference.py')], {
      input: JSON.stringify(cases.map((c) => ({ kind: c.kind, n: c.n, l: c.l, m: c.m, Z: 1, t: c.t }))),
      encoding: 'utf8',
      timeout: 600000,
    });
    if (ref.status !== 0) {
      console.log(`  SciPy reference failed (python3-scipy needed): ${(ref.stderr || '').trim().split('\n').pop()}`);
      return;
    }
    const truth = JSON.parse(ref.stdout);
    const rows = [];
    let ok = 0;
    const t0 = now();
    const fmtT = (t) => (t ? Object.entries(t).filter(([, v]) => v && v[0] > 0).map(([p, v]) => `${p}:${v[0]}/${v[1]}`).join(' ') : '-');
    for (let i = 0; i < cases.length; i++) {
      const c = cases[i];
      let r;
      try {
        r = await meshing.recipeToSurfaces(recipe(c.state));
      } catch (err) {
        rows.push([c.name, fmtT(truth[i]), '-', `error: ${err.message}`, '-']);
        continue;
      }
      const found = {};
      for (const s of r.surfaces) if (s.stats && s.stats.components > 0) found[s.phase] = [s.stats.components, s.stats.euler];
      const want = Object.fromEntries(Object.entries(truth[i]).filter(([, v]) => v[0] > 0));
      const canon = (t) => JSON.stringify(Object.keys(t).sort().map((k) => [k, t[k]]));
      const match = canon(found) === canon(want);
      if (match) ok++;
      rows.push([c.name, fmtT(want), fmtT(found), match ? 'ok' : 'DIFFERS', String(r.grid.regions.map((g) => g.n).join('+'))]);
    }
    results.topology = { ok, total: cases.length };
    const bad = rows.filter((r) => r[3] !== 'ok');
    table(['state', 'true (parts/Euler, SciPy)', 'mesh', 'match', 'grid n'], ARGS.has('--all-rows') ? rows : [...rows.slice(0, 12), ...bad]);
    console.log(`  ${ok} of ${cases.length} states match (${!ARGS.has('--all-rows') ? 'first 12 rows and every difference shown; --all-rows for all' : 'all shown'}); ${fmt((now() - t0) / 1000, 0)} s; load ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
  }

  function summaryRows(verdict) {
    const rows = [];
    if (results.oneSExactError !== undefined) rows.push(['1s geometric error at defaults (closed-form sphere)', e(results.oneSExactError) + ' a0', '≤ 1e-4 a0', verdict(results.oneSExactError <= 1e-4)]);
    if (results.printError) rows.push(['3d_xy 180 mm @ 1200 dpi: error vs quarter pixel', `${e(results.printError.dev)} / ${e(results.printError.tolerance)} a0`, '≤ quarter pixel', verdict(results.printError.dev <= results.printError.tolerance * 1.0001)]);
    if (results.sparseRatio !== undefined) {
      rows.push([`3d_z² 512³ effective / NumPy + skimage 256³, fresh process (wall; CPU ${fmt(results.sparseRatioCpu, 2)}; load ${fmt(results.sparseLoad, 1)})`, fmt(results.sparseRatio, 2), '≤ 1.0', verdict(results.sparseRatio <= 1)]);
      rows.push([`the same after one other figure in the process, as a running worker (wall; CPU ${fmt(results.sparseWarmRatioCpu, 2)})`, fmt(results.sparseWarmRatio, 2), '≤ 1.0', verdict(results.sparseWarmRatio <= 1)]);
    }
    if (results.sparseRssMB !== undefined) rows.push(['peak RSS 512³ effective', fmt(results.sparseRssMB, 0) + ' MB', '≤ 400 MB', verdict(results.sparseRssMB <= 400)]);
    if (results.topology) rows.push(['topology at defaults', `${results.topology.ok} / ${results.topology.total}`, 'all', verdict(results.topology.ok === results.topology.total)]);
    return rows;
  }

  return { sectionExact, sectionSparse, sectionTopology, childSparse512, childSparseTime, summaryRows };
}
