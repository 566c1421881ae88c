/** Fixed-window failure counter (port). The Redis adapter uses INCR + EXPIRE; tests use a fake. */
export interface AttemptCount {
  count: number;
  /** Seconds until the window ends; 0 when there is no window. */
  retryAfterSeconds: number;
}

export abstract class AttemptCounter {
  abstract peek(key: string): Promise<AttemptCount>;
  /** Adds one; the first hit opens a window of windowSeconds. */
  abstract hit(key: string, windowSeconds: number): Promise<AttemptCount>;
  abstract clear(key: string): Promise<void>;
}
