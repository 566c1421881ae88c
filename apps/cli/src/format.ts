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

export interface MeshJsonSurface {
  phase: '+' | '-' | 'complex';
  vertices: number;
  triangles: number;
  area: number;
  volume: number;
  components: number;
  euler: number;
  watertight: boolean;
}

export interface MeshJson {
  label: string | null;
  Z: number;
  model: string;
  isovalue: number;
  enclosed: number;
  grid: { n: number; extent: number };
  surfaces: MeshJsonSurface[];
  timings_ms: Record<string, number>;
  out: { file: string; bytes: number } | null;
}

export function formatMeshSummary(j: MeshJson): string {
  const lines = [
    `${j.label ?? 'state'}, Z=${j.Z}: grid ${j.grid.n}^3 over +/-${num(j.grid.extent)} a0`,
    `isovalue |psi| = ${num(j.isovalue)} a0^-3/2, enclosing ${(j.enclosed * 100).toFixed(2)}% of the probability`,
    table([
      ['phase', 'vertices', 'triangles', 'area a0^2', 'volume a0^3', 'components', 'euler', 'watertight'],
      ...j.surfaces.map((s) => [s.phase, String(s.vertices), String(s.triangles), num(s.area), num(s.volume), String(s.components), String(s.euler), s.watertight ? 'yes' : 'no']),
    ]),
    `timings (ms): ${Object.entries(j.timings_ms).map(([k, v]) => `${k} ${v}`).join(', ')}`,
  ];
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
    `R_${j.n}${j.l} for Z=${j.Z} (lengths in a0)`,
    `  radial nodes        ${j.nodes.length ? j.nodes.map((r) => num(r, 10)).join(', ') : 'none'}`,
    `  most probable r     ${num(j.most_probable_r, 10)}`,
    `  mean r              ${num(j.mean_r, 10)}`,
    `  turning point r     ${num(j.turning_point_r, 10)}`,
    j.outside_r === null ? `  P(r > R)            (give --outside R)` : `  P(r > ${num(j.outside_r)})${' '.repeat(Math.max(1, 12 - num(j.outside_r).length))}${num(j.prob_outside, 10)}`,
    `model: ${j.model}`,
  ].join('\n');
}
