/**
 * A call to a dependency (Redis, PostgreSQL, storage) that did not answer in time. HttpErrorFilter answers it with
 * 503 naming the dependency, so a stalled service gives a fast, explained refusal instead of a hung request.
 */
export class DependencyTimeout extends Error {
  override readonly name = 'DependencyTimeout';
  constructor(
    readonly dependency: string,
    readonly ms: number,
  ) {
    super(`${dependency} did not answer within ${ms} ms`);
  }
}

/** Rejects with DependencyTimeout when `p` has not settled after `ms` (p itself is left to finish or fail). */
export function withDeadline<T>(p: Promise<T>, ms: number, dependency: string): Promise<T> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new DependencyTimeout(dependency, ms)), ms);
    timer.unref?.();
  });
  p.catch(() => undefined); // a late failure after the deadline must not become an unhandled rejection
  return Promise.race([p, timeout]).finally(() => clearTimeout(timer));
}
