/** Readable (non --json) summaries. Plain text, aligned columns, units stated. */

function num(x: number | null | undefined, digits = 5): string {
  if (x === null || x === undefined) return '-';
  if (x === 0) return '0';
  const a = Math.abs(x);
  return a >= 1e-3 && a < 1e6 ? Number(x.toPrecision(digits)).toString() : x.toExponential(digits - 1);
}

function table(rows: string[][]): string {
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  return rows.map((r) => '  ' + r.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]) : cell.padStart(widths[c]))).join('  ')).join('\n');
}

export interface MeshJson {
  label: string | null;
  Z: number;
  model: string;
  isovalue: number;
  enclosed: number;
  enclosedError: number;
  enclosedInBox: number;
  enclosedOver: string;
  grid: { mode: 'auto' | 'fixed'; n: number; extent: number; spacing: number; regions: { n: number; extent: number; rMin: number; rMax: number | null }[] };
  topology: { expected: Record<string, { components: number; euler: number }> | null; found: Record<string, { components: number; euler: number }> | null; matches: boolean | null };
  warnings: { message: string }[];
  surfaces: { phase: string; vertices: number; triangles: number; area: number; volume: number; components: number; euler: number; watertight: boolean }[];
  timings_ms: Record<string, number>;
  out: { file: string; bytes: number } | null;
}

function topo(t: Record<string, { components: number; euler: number }> | null): string {
  if (!t) return 'not known in advance (superposition of several n, l)';
  return Object.entries(t)
    .filter(([, v]) => v.components > 0)
    .map(([p, v]) => `${p} ${v.components} part${v.components === 1 ? '' : 's'} (Euler ${v.euler})`)
    .join(', ');
}

export function formatMeshSummary(j: MeshJson): string {
  const inner = j.grid.regions.slice(1);
  const lines = [
    `${j.label ?? 'state'}, Z=${j.Z}: grid ${j.grid.n}^3 over +/-${num(j.grid.extent)} a0 (${j.grid.mode === 'auto' ? 'chosen to resolve the surface' : 'as asked'})`,
    ...(inner.length ? [`inner radial lobes on finer grids: ${inner.map((r) => `${r.n}^3 over +/-${num(r.extent)} a0`).join(', ')}`] : []),
    `isovalue |psi| = ${num(j.isovalue)} a0^-3/2, enclosing ${(j.enclosed * 100).toFixed(2)}% (+/- ${(j.enclosedError * 100).toPrecision(2)}%) of the probability ${j.enclosedOver === 'all space' ? 'over all space' : j.enclosedOver}`,
    ...(j.enclosedInBox < j.enclosed ? [`the box cuts the surface: the part drawn encloses ${(j.enclosedInBox * 100).toFixed(2)}%`] : []),
    `topology: expected ${topo(j.topology.expected)}; found ${topo(j.topology.found)}`,
    table([
      ['phase', 'vertices', 'triangles', 'area a0^2', 'volume a0^3', 'components', 'euler', 'watertight'],
      ...j.surfaces.map((s) => [s.phase, String(s.vertices), String(s.triangles), num(s.area), num(s.volume), String(s.components), String(s.euler), s.watertight ? 'yes' : 'no']),
    ]),
    `timings (ms): ${Object.entries(j.timings_ms).map(([k, v]) => `${k} ${v}`).join(', ')}`,
  ];
  for (const w of j.warnings) lines.push(`WARNING: ${w.message}`);
  if (j.out) lines.push(`wrote ${j.out.file} (${j.out.bytes} bytes)`);
  lines.push(`model: ${j.model}`);
  return lines.join('\n');
}

export interface RadialJson {
  n: number;
  l: number;
  Z: number;
  nodes: number[];
  most_probable_r: number;
  mean_r: number;
  turning_point_r: number;
  prob_outside: number | null;
  outside_r: number | null;
  model: string;
}

export function formatRadialSummary(j: RadialJson): string {
  return [
    `R_{${j.n},${j.l}} for Z=${j.Z} (lengths in a0)`,
    `  radial nodes        ${j.nodes.length ? j.nodes.map((r) => num(r, 10)).join(', ') : 'none'}`,
    `  most probable r     ${num(j.most_probable_r, 10)}`,
    `  mean r              ${num(j.mean_r, 10)}`,
    `  turning point r     ${num(j.turning_point_r, 10)}`,
    j.outside_r === null ? `  P(r > R)            (give --outside R)` : `  P(r > ${num(j.outside_r)})${' '.repeat(Math.max(1, 12 - num(j.outside_r).length))}${num(j.prob_outside, 10)}`,
    `model: ${j.model}`,
  ].join('\n');
}
