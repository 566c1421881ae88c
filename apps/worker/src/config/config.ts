import { resolve } from 'node:path';

/** Worker start-up configuration, validated once; a bad value names the variable (see apps/api config.ts). */
export interface WorkerConfig {
  redis: { url: string };
  database: { url: string };
  s3: { endpoint: string; bucket: string; accessKeyId: string; secretAccessKey: string; region: string };
  concurrency: number;
  /**
   * BullMQ lock of an active job (WORKER_LOCK_MS). A worker that dies stops renewing it; after it expires
   * the stalled-job check of another worker puts the job back in the queue. The stalled check runs every
   * lockMs too.
   */
  lockMs: number;
  /** Mail notices (SMTP_URL, MAIL_FROM as in the api). Without SMTP_URL notices stay queued (MailNoticeProcessor). */
  smtp?: { url: string; from: string };
  /**
   * Render/export jobs (studio issue): the built client whose render.html draws figures (WEB_DIST, default
   * apps/web/dist), the browser (CHROMIUM_PATH, default /usr/bin/chromium), thumbnails after mesh jobs
   * (THUMBNAILS=on|off, default on) and the time one page call may take (RENDER_TIMEOUT_MS, default 120000).
   */
  render: { webDist: string; chromiumPath: string; thumbnails: boolean; timeoutMs: number };
}

/** apps/web/dist of this repository (dist/config/config.js -> ../../../web/dist). */
export const DEFAULT_WEB_DIST = resolve(__dirname, '..', '..', '..', 'web', 'dist');

export type Env = Record<string, string | undefined>;

export class ConfigError extends Error {
  constructor(readonly problems: string[]) {
    super(`Invalid configuration: ${problems.join('; ')}`);
    this.name = 'ConfigError';
  }
}

export const DEFAULT_CONCURRENCY = 2;
const MAX_CONCURRENCY = 64;
export const DEFAULT_LOCK_MS = 30000;

function url(env: Env, name: string, protocols: string[], what: string, problems: string[]): string {
  const v = (env[name] ?? '').trim();
  if (!v) {
    problems.push(`${name} is required (${what})`);
    return '';
  }
  try {
    const u = new URL(v);
    if (protocols.includes(u.protocol) && u.hostname !== '') return v;
  } catch {
    /* reported below */
  }
  problems.push(`${name} must be ${what}`);
  return '';
}

function str(env: Env, name: string, problems: string[], fallback?: string): string {
  const v = (env[name] ?? '').trim() || fallback;
  if (!v) problems.push(`${name} is required`);
  return v ?? '';
}

function int(env: Env, name: string, fallback: number, min: number, max: number, problems: string[]): number {
  const raw = (env[name] ?? '').trim() || String(fallback);
  const n = /^\d+$/.test(raw) ? Number(raw) : NaN;
  if (!Number.isInteger(n) || n < min || n > max) problems.push(`${name} must be an integer from ${min} to ${max}`);
  return n;
}

export function loadWorkerConfig(env: Env): WorkerConfig {
  const problems: string[] = [];
  const config: WorkerConfig = {
    redis: { url: url(env, 'REDIS_URL', ['redis:', 'rediss:'], 'a redis:// URL', problems) },
    database: { url: url(env, 'DATABASE_URL', ['postgres:', 'postgresql:'], 'a postgres:// URL', problems) },
    s3: {
      endpoint: url(env, 'S3_ENDPOINT', ['http:', 'https:'], 'an http:// or https:// URL', problems),
      bucket: str(env, 'S3_BUCKET', problems),
      accessKeyId: str(env, 'S3_ACCESS_KEY_ID', problems),
      secretAccessKey: str(env, 'S3_SECRET_ACCESS_KEY', problems),
      region: str(env, 'S3_REGION', problems, 'us-east-1'),
    },
    concurrency: int(env, 'WORKER_CONCURRENCY', DEFAULT_CONCURRENCY, 1, MAX_CONCURRENCY, problems),
    lockMs: int(env, 'WORKER_LOCK_MS', DEFAULT_LOCK_MS, 1000, 600000, problems),
  } as WorkerConfig;
  const thumbs = (env.THUMBNAILS ?? '').trim().toLowerCase() || 'on';
  if (!['on', 'off'].includes(thumbs)) problems.push('THUMBNAILS must be on or off');
  config.render = {
    webDist: (env.WEB_DIST ?? '').trim() || DEFAULT_WEB_DIST,
    chromiumPath: (env.CHROMIUM_PATH ?? '').trim() || '/usr/bin/chromium',
    thumbnails: thumbs !== 'off',
    timeoutMs: int(env, 'RENDER_TIMEOUT_MS', 120000, 5000, 3600000, problems),
  };
  if ((env.SMTP_URL ?? '').trim()) {
    config.smtp = { url: url(env, 'SMTP_URL', ['smtp:'], 'an smtp://host:port URL', problems), from: str(env, 'MAIL_FROM', problems, 'Psiform <no-reply@psiform.test>') };
  }
  if (problems.length) throw new ConfigError(problems);
  return config;
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
