// Reads the closing counts of the runners we use, so `npm test` can print one summary.
// eslint-disable-next-line no-control-regex -- ANSI colour codes start with ESC
const strip = (s) => s.replace(/\x1b\[[0-9;]*m/g, '');

export function parseCounts(runner, output) {
  const text = strip(output);
  const num = (re) => { const m = text.match(re); return m ? Number(m[1]) : 0; };
  if (runner === 'vitest') {
    const line = [...text.matchAll(/^\s*Tests\s+(.*)$/gm)].at(-1)?.[1] ?? '';
    const get = (w) => Number(line.match(new RegExp(`(\\d+) ${w}`))?.[1] ?? 0);
    return { passed: get('passed'), failed: get('failed'), skipped: get('skipped') + get('todo') };
  }
  if (runner === 'jest') {
    const line = [...text.matchAll(/^Tests:\s+(.*)$/gm)].at(-1)?.[1] ?? '';
    const get = (w) => Number(line.match(new RegExp(`(\\d+) ${w}`))?.[1] ?? 0);
    return { passed: get('passed'), failed: get('failed'), skipped: get('skipped') + get('todo') };
  }
  if (runner === 'node') {
    return { passed: num(/^ℹ pass (\d+)$/m) || num(/^# pass (\d+)$/m), failed: num(/^ℹ fail (\d+)$/m) || num(/^# fail (\d+)$/m), skipped: num(/^ℹ skipped (\d+)$/m) || num(/^# skip (\d+)$/m) };
  }
  if (runner === 'eslint') {
    const m = text.match(/^lint: (\d+) files checked, (\d+) with errors$/m);
    return m ? { passed: Number(m[1]) - Number(m[2]), failed: Number(m[2]), skipped: 0 } : { passed: 0, failed: 0, skipped: 0 };
  }
  throw new Error(`unknown runner ${runner}`);
}
