// Process supervision for `npm start`: a child that exits on its own is logged and started again after a
// back-off (1 s, 2 s, 4 s … capped), while the other children keep serving. A child that stayed up for
// `stableMs` counts as healthy again, so its next crash starts the back-off from the beginning.
// (Exponential back-off with a cap is common practice, e.g. systemd's RestartSec/RestartSteps and Kubernetes'
// CrashLoopBackOff, which doubles from 10 s up to 5 min.)
import { setTimeout as sleep } from 'node:timers/promises';
import { fail, log } from './log.mjs';

/**
 * start(): spawns the child and returns {child, exitPromise, stop, logFile} (the shape of startChild).
 * onEvent({type: 'exit' | 'restart' | 'started', name, code, signal, delayMs, restarts}) reports what happened.
 */
export function supervise(name, start, { baseDelayMs = 1000, maxDelayMs = 30000, stableMs = 60000, onEvent = () => {} } = {}) {
  let current = start();
  let stopped = false;
  let restarts = 0;
  let failuresInARow = 0;
  let wake;
  let firstExit;
  const firstExitP = new Promise((r) => (firstExit = r));
  const loop = (async () => {
    while (!stopped) {
      const startedAt = Date.now();
      const { code, signal } = await current.exitPromise;
      firstExit({ code, signal });
      if (stopped) return;
      failuresInARow = Date.now() - startedAt >= stableMs ? 1 : failuresInARow + 1;
      const delayMs = Math.min(maxDelayMs, baseDelayMs * 2 ** (failuresInARow - 1));
      onEvent({ type: 'exit', name, code, signal, delayMs, restarts, logFile: current.logFile });
      await Promise.race([sleep(delayMs), new Promise((r) => (wake = r))]);
      if (stopped) return;
      restarts += 1;
      current = start();
      onEvent({ type: 'restart', name, restarts, pid: current.child.pid });
    }
  })();
  return {
    name,
    get child() { return current.child; },
    get logFile() { return current.logFile; },
    get restarts() { return restarts; },
    /** Resolves at the first exit of the child, restarted or not (start-up checks race it). */
    firstExit: firstExitP,
    stop: async () => {
      stopped = true;
      wake?.();
      await current.stop();
      await loop;
    },
  };
}

/** Logs a supervised child's exit and restart (the child's own output is in its log file). */
export function logSupervision(e) {
  if (e.type === 'exit') fail(`${e.name} exited (${e.signal ?? `code ${e.code}`}); restarting in ${e.delayMs / 1000} s; see ${e.logFile}`);
  else if (e.type === 'restart') log(`${e.name} restarted (pid ${e.pid}, restart ${e.restarts})`);
}

