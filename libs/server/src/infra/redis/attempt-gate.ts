/**
 * Exponential back-off for repeated attempts (sign-in), counted BEFORE the attempt is checked: `acquire` atomically
 * records the attempt and says whether it may go ahead, so parallel guesses cannot all slip through between a read
 * and a write. The first `freeAttempts` go ahead at once; after the k-th (k ≥ freeAttempts) the next one must wait
 * baseDelayMs·2^(k−freeAttempts), at most maxDelayMs. Attempts refused while waiting are not counted, so a flood
 * of refused tries cannot lengthen the wait: a back-off, never a lock. The count is forgotten `memoryMs` after the
 * last counted attempt. (Doubling delays for repeated authentication failures: NIST SP 800-63B §5.2.2 allows
 * throttling "such as ... an increasing delay"; the doubling with a cap is common practice.)
 */
export interface BackoffPolicy {
  freeAttempts: number;
  baseDelayMs: number;
  maxDelayMs: number;
  memoryMs: number;
}

export interface GateVerdict {
  allowed: boolean;
  /** Attempts counted so far (including this one when allowed). */
  attempts: number;
  /** When refused: milliseconds until the next attempt may go ahead. When allowed: the wait this attempt set. */
  waitMs: number;
}

/** Port; RedisAttemptGate is the adapter (one Lua script per call). */
export abstract class AttemptGate {
  abstract acquire(key: string, policy: BackoffPolicy): Promise<GateVerdict>;
  /** Takes back one counted attempt (a successful sign-in behind a shared address). */
  abstract refund(key: string): Promise<void>;
  abstract clear(key: string): Promise<void>;
}

/** The wait after the n-th counted attempt. */
export function backoffDelayMs(attempts: number, p: BackoffPolicy): number {
  if (attempts < p.freeAttempts) return 0;
  return Math.min(p.maxDelayMs, p.baseDelayMs * 2 ** (attempts - p.freeAttempts));
}
