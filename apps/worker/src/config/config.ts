/** Worker start-up configuration, validated once; a bad value names the variable (see apps/api config.ts). */
export interface WorkerConfig {
  redis: { url: string };
  concurrency: number;
}

export type Env = Record<string, string | undefined>;

export class ConfigError extends Error {
  constructor(readonly problems: string[]) {
    super(`Invalid configuration: ${problems.join('; ')}`);
    this.name = 'ConfigError';
  }
}

export const DEFAULT_CONCURRENCY = 2;
const MAX_CONCURRENCY = 64;

export function loadWorkerConfig(env: Env): WorkerConfig {
  const problems: string[] = [];
  const redisUrl = (env.REDIS_URL ?? '').trim();
  if (!redisUrl) problems.push('REDIS_URL is required (a redis:// URL)');
  else {
    let ok = false;
    try {
      const u = new URL(redisUrl);
      ok = (u.protocol === 'redis:' || u.protocol === 'rediss:') && u.hostname !== '';
    } catch {
      ok = false;
    }
    if (!ok) problems.push('REDIS_URL must be a redis:// URL');
  }
  const rawConcurrency = (env.WORKER_CONCURRENCY ?? '').trim() || String(DEFAULT_CONCURRENCY);
  const concurrency = /^\d+$/.test(rawConcurrency) ? Number(rawConcurrency) : NaN;
  if (!Number.isInteger(concurrency) || concurrency < 1 || concurrency > MAX_CONCURRENCY) {
    problems.push(`WORKER_CONCURRENCY must be an integer from 1 to ${MAX_CONCURRENCY}`);
  }
  if (problems.length) throw new ConfigError(problems);
  return { redis: { url: redisUrl }, concurrency };
}

export function loadOrExit<T>(load: () => T): T {
  try {
    return load();
  } catch (err) {
    if (err instanceof ConfigError) {
      process.stderr.write(`${err.message}\n`);
      process.exit(1);
    }
    throw err;
  }
}
