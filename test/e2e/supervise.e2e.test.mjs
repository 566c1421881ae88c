// npm start's supervision (scripts/lib/supervise.mjs): a child that dies is logged and restarted with a
// doubling back-off while its sibling keeps running; stop() ends it for good. Real processes, no stubs.
import assert from 'node:assert/strict';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { test } from 'node:test';
import { setTimeout as sleep } from 'node:timers/promises';
import { startChild } from '../../scripts/lib/services.mjs';
import { supervise } from '../../scripts/lib/supervise.mjs';

test('a crashing child is restarted with back-off while its sibling keeps serving', { timeout: 60_000 }, async () => {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'psiform-supervise-'));
  const counter = path.join(dir, 'starts.txt');
  writeFileSync(counter, '');
  // Crashes on its first three runs, then stays up (like a service that comes back once its dependency does).
  const crashy = path.join(dir, 'crashy.mjs');
  writeFileSync(crashy, `import { appendFileSync, readFileSync } from 'node:fs';
appendFileSync(${JSON.stringify(counter)}, 'x');
const runs = readFileSync(${JSON.stringify(counter)}, 'utf8').length;
console.log('run', runs);
if (runs <= 3) setTimeout(() => process.exit(7), 50); else setInterval(() => {}, 1000);
`);
  const steady = path.join(dir, 'steady.mjs');
  writeFileSync(steady, 'setInterval(() => {}, 1000);\n');
  const events = [];
  const logDir = path.join(dir, 'logs');
  const sibling = startChild('steady', steady, [], { logDir });
  const s = supervise('crashy', () => startChild('crashy', crashy, [], { logDir }), { baseDelayMs: 100, maxDelayMs: 1000, stableMs: 30_000, onEvent: (e) => events.push(e) });
  try {
    const end = Date.now() + 30_000;
    while (s.restarts < 3 && Date.now() < end) await sleep(50);
    assert.equal(s.restarts, 3, 'three restarts after three crashes');
    await sleep(500);
    assert.equal(s.restarts, 3, 'the fourth run stays up: no further restart');
    const exits = events.filter((e) => e.type === 'exit');
    assert.deepEqual(exits.map((e) => e.code), [7, 7, 7]);
    assert.deepEqual(exits.map((e) => e.delayMs), [100, 200, 400], 'back-off doubles from the base delay');
    assert.equal(sibling.exited, false, 'the sibling kept running throughout');
    while (readFileSync(counter, 'utf8').length < 4 && Date.now() < end) await sleep(50);
    assert.equal(readFileSync(counter, 'utf8').length, 4, 'the fourth run started');
    while (!/run 4/.test(readFileSync(path.join(logDir, 'crashy.log'), 'utf8')) && Date.now() < end) await sleep(50);
    assert.match(readFileSync(path.join(logDir, 'crashy.log'), 'utf8'), /run 1[\s\S]*run 4/);
    const pid = s.child.pid;
    await s.stop();
    await sleep(300);
    assert.equal(s.restarts, 3, 'stop() does not restart');
    assert.throws(() => process.kill(pid, 0), 'the supervised child is gone after stop()');
  } finally {
    await s.stop();
    await sibling.stop();
    rmSync(dir, { recursive: true, force: true });
  }
});

test('the back-off is capped and starts again after a stable run', { timeout: 60_000 }, async () => {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'psiform-supervise-'));
  const script = path.join(dir, 'dies.mjs');
  writeFileSync(script, 'setTimeout(() => process.exit(1), Number(process.env.LIFE_MS));\n');
  const events = [];
  let life = 20;
  const s = supervise('dies', () => startChild('dies', script, [], { logDir: dir, env: { LIFE_MS: String(life) } }), { baseDelayMs: 50, maxDelayMs: 200, stableMs: 1500, onEvent: (e) => events.push(e) });
  try {
    const end = Date.now() + 30_000;
    while (events.filter((e) => e.type === 'exit').length < 5 && Date.now() < end) await sleep(20);
    life = 2000; // the next runs outlive stableMs: the back-off starts from the base again
    while (events.filter((e) => e.type === 'exit').length < 7 && Date.now() < end) await sleep(20);
    const delays = events.filter((e) => e.type === 'exit').map((e) => e.delayMs);
    assert.deepEqual(delays.slice(0, 5), [50, 100, 200, 200, 200], 'doubling, capped at maxDelayMs');
    assert.equal(delays[6], 50, 'a run longer than stableMs resets the back-off');
  } finally {
    await s.stop();
    rmSync(dir, { recursive: true, force: true });
  }
});
