import { resolve } from 'node:path';

/**
 * Start-up configuration of both apps: read once from the environment, validated into a typed object (AppConfig for
 * the api, WorkerConfig for the worker; the sections they share are read by the same functions). A bad or missing
 * value raises ConfigError naming the variable (every bad variable at once); entry points print it and exit 1.
 * A new variable: a field here, its reader line in loadConfig/loadWorkerConfig, a case in config.spec.ts, and the
 * "Environment" table of DEVELOPERS.md.
 */
export interface DatabaseConfig {
  url: string;
}
/**
 * The api's database: requestTimeoutMs (DB_REQUEST_TIMEOUT_MS, default 1500) is how long one statement of a request
 * may run, lock waits included, before the request answers 503 (db/schema.ts REQUEST_DB_TIMEOUTS).
 */
export interface ApiDatabaseConfig extends DatabaseConfig {
  requestTimeoutMs: number;
}
export interface RedisConfig {
  url: string;
}
export interface S3Config {
  endpoint: string;
  bucket: string;
  accessKeyId: string;
  secretAccessKey: string;
  region: string;
}
export interface SmtpConfig {
  url: string;
  from: string;
}

export interface AppConfig {
  database: ApiDatabaseConfig;
  redis: RedisConfig;
  s3: S3Config;
  /** outboxFile: MAIL_OUTBOX_FILE, set only while the local mail fake is in use (GET /api/dev/outbox). */
  smtp: SmtpConfig & { outboxFile?: string };
  jwt: { secret: string; ttl: string };
  /**
   * trustProxy: Express's `trust proxy` (TRUST_PROXY: unset/false = the socket address is the client; true, a hop
   * count, or a comma list of addresses/CIDRs/loopback|linklocal|uniquelocal). Only with it set does sign-in
   * throttling also count per client address, since only then is that address the client's and not a proxy's.
   * publicBaseUrl: PUBLIC_BASE_URL, where people open the client (links in mail: proofs, invitations, password
   * resets); no trailing slash. Default http://HOST:PORT (127.0.0.1 for a wildcard HOST, 3000 for PORT 0).
   */
  http: { port: number; host: string; webDist: string | undefined; trustProxy: TrustProxy; publicBaseUrl: string };
  /**
   * Largest accepted cube file of POST /api/uploads, in bytes (UPLOAD_MAX_BYTES); orphanAgeSeconds: after how long
   * the leftovers of an upload whose API process died (temporary objects, unfinished multipart uploads, cubes no
   * asset refers to) are swept (UPLOAD_ORPHAN_AGE_SECONDS).
   */
  uploads: { maxBytes: number; orphanAgeSeconds: number };
  /** requestsPerMinute: general rate limit per signed-in account or client address (RATE_LIMIT_PER_MINUTE; 0 = off). */
  limits: { requestsPerMinute: number };
}

export type Env = Record<string, string | undefined>;
export type TrustProxy = false | true | number | string[];

export class ConfigError extends Error {
  constructor(readonly problems: string[]) {
    super(`Invalid configuration: ${problems.join('; ')}`);
    this.name = 'ConfigError';
  }
}

/** Worker start-up configuration. */
export interface WorkerConfig {
  redis: RedisConfig;
  database: DatabaseConfig;
  s3: S3Config;
  concurrency: number;
  /**
   * BullMQ lock of an active job (WORKER_LOCK_MS). A worker that dies stops renewing it; after it expires
   * the stalled-job check of another worker puts the job back in the queue. The stalled check runs every
   * lockMs too.
   */
  lockMs: number;
  /** Mail notices (SMTP_URL, MAIL_FROM as in the api). Without SMTP_URL notices stay queued for a worker that has it. */
  smtp?: SmtpConfig;
  /**
   * Render/export jobs: the built client whose render.html draws figures (WEB_DIST, default apps/web/dist), the browser
   * (CHROMIUM_PATH, default /usr/bin/chromium), thumbnails after mesh jobs (THUMBNAILS=on|off, default on) and the time
   * one page call may take (RENDER_TIMEOUT_MS, default 120000).
   */
  render: { webDist: string; chromiumPath: string; thumbnails: boolean; timeoutMs: number };
  /** The outbox sweeper: how often it runs (OUTBOX_SWEEP_MS, 30000) and when a row counts as stuck (OUTBOX_STALE_MS, 60000). */
  outbox: { sweepMs: number; staleMs: number };
}

/** apps/web/dist of this repository (libs/server/{src,dist}/config -> ../../../../apps/web/dist). */
export const DEFAULT_WEB_DIST = resolve(__dirname, '..', '..', '..', '..', 'apps', 'web', 'dist');

export const DEFAULTS = {
  S3_REGION: 'us-east-1',
  MAIL_FROM: 'Psiform <no-reply@psiform.test>',
  JWT_TTL: '8h',
  PORT: '3000',
  HOST: '127.0.0.1',
  UPLOAD_MAX_BYTES: '536870912',
  WORKER_CONCURRENCY: '2',
  WORKER_LOCK_MS: '30000',
  CHROMIUM_PATH: '/usr/bin/chromium',
  RENDER_TIMEOUT_MS: '120000',
  OUTBOX_SWEEP_MS: '30000',
  OUTBOX_STALE_MS: '60000',
  UPLOAD_ORPHAN_AGE_SECONDS: '21600',
  RATE_LIMIT_PER_MINUTE: '1200',
  DB_REQUEST_TIMEOUT_MS: '1500',
} as const;

export const MIN_JWT_SECRET_LENGTH = 32;

/** Collects problems so one run reports every bad variable at once. */
class Reader {
  readonly problems: string[] = [];
  constructor(private readonly env: Env) {}

  private raw(name: string, fallback?: string): string | undefined {
    const v = this.env[name];
    if (v === undefined || v.trim() === '') return fallback;
    return v.trim();
  }

  url(name: string, protocols: string[], what: string): string {
    const v = this.raw(name);
    if (v === undefined) return this.fail(`${name} is required (${what})`);
    let parsed: URL;
    try {
      parsed = new URL(v);
    } catch {
      return this.fail(`${name} must be ${what}`);
    }
    if (!protocols.includes(parsed.protocol) || parsed.hostname === '') return this.fail(`${name} must be ${what}`);
    return v;
  }

  string(name: string, fallback?: string, minLength = 1): string {
    const v = this.raw(name, fallback);
    if (v === undefined) return this.fail(`${name} is required`);
    if (v.length < minLength) return this.fail(`${name} must be at least ${minLength} characters`);
    return v;
  }

  optional(name: string): string | undefined {
    return this.raw(name);
  }

  int(name: string, fallback: string, min: number, max: number): number {
    const v = this.raw(name, fallback)!;
    const n = /^\d+$/.test(v) ? Number(v) : NaN;
    if (!Number.isInteger(n) || n < min || n > max) {
      this.fail(`${name} must be an integer from ${min} to ${max}`);
      return 0;
    }
    return n;
  }

  trustProxy(name: string): TrustProxy {
    const v = this.raw(name);
    if (v === undefined || v === 'false') return false;
    if (v === 'true') return true;
    if (/^\d+$/.test(v)) return Number(v);
    const parts = v.split(',').map((p) => p.trim()).filter(Boolean);
    const ok = parts.every((p) => ['loopback', 'linklocal', 'uniquelocal'].includes(p) || /^[0-9a-fA-F.:]+(\/\d{1,3})?$/.test(p));
    if (!parts.length || !ok) {
      this.fail(`${name} must be false, true, a hop count, or a comma list of addresses, CIDR ranges or loopback/linklocal/uniquelocal`);
      return false;
    }
    return parts;
  }

  duration(name: string, fallback: string): string {
    const v = this.raw(name, fallback)!;
    // Format understood by jsonwebtoken's expiresIn (the `ms` package): number + optional unit.
    if (!/^\d+(ms|s|m|h|d|w|y)?$/.test(v)) return this.fail(`${name} must be a duration like 900s, 30m, 8h or 1d`);
    return v;
  }

  /** An http(s) origin with an optional path: no query, fragment or credentials; the trailing slash is dropped. */
  baseUrl(name: string, fallback: string): string {
    const v = this.raw(name, fallback)!;
    let parsed: URL;
    try {
      parsed = new URL(v);
    } catch {
      return this.fail(`${name} must be an http:// or https:// URL such as https://figures.example.org`);
    }
    if (!['http:', 'https:'].includes(parsed.protocol) || parsed.hostname === '') return this.fail(`${name} must be an http:// or https:// URL such as https://figures.example.org`);
    if (parsed.search || parsed.hash || v.includes('#') || v.includes('?')) return this.fail(`${name} must not have a query or fragment`);
    if (parsed.username || parsed.password) return this.fail(`${name} must not contain credentials`);
    return `${parsed.origin}${parsed.pathname.replace(/\/+$/, '')}`;
  }

  oneOf<T extends string>(name: string, choices: readonly T[], fallback: T): T {
    const v = (this.raw(name, fallback) ?? fallback).toLowerCase();
    if (!(choices as readonly string[]).includes(v)) {
      this.fail(`${name} must be ${choices.join(' or ')}`);
      return fallback;
    }
    return v as T;
  }

  private fail(problem: string): string {
    this.problems.push(problem);
    return '';
  }

  done(): void {
    if (this.problems.length > 0) throw new ConfigError(this.problems);
  }
}

function readDatabase(r: Reader): DatabaseConfig {
  return { url: r.url('DATABASE_URL', ['postgres:', 'postgresql:'], 'a postgres:// URL') };
}

function readRedis(r: Reader): RedisConfig {
  return { url: r.url('REDIS_URL', ['redis:', 'rediss:'], 'a redis:// URL') };
}

function readS3(r: Reader): S3Config {
  return {
    endpoint: r.url('S3_ENDPOINT', ['http:', 'https:'], 'an http:// or https:// URL'),
    bucket: r.string('S3_BUCKET'),
    accessKeyId: r.string('S3_ACCESS_KEY_ID'),
    secretAccessKey: r.string('S3_SECRET_ACCESS_KEY'),
    region: r.string('S3_REGION', DEFAULTS.S3_REGION),
  };
}

function readSmtp(r: Reader): SmtpConfig {
  return { url: r.url('SMTP_URL', ['smtp:'], 'an smtp://host:port URL'), from: r.string('MAIL_FROM', DEFAULTS.MAIL_FROM) };
}

/** Only what the migration and seed scripts need. */
export function loadDatabaseConfig(env: Env): DatabaseConfig {
  const r = new Reader(env);
  const db = readDatabase(r);
  r.done();
  return db;
}

export function loadConfig(env: Env): AppConfig {
  const r = new Reader(env);
  const config: AppConfig = {
    database: { ...readDatabase(r), requestTimeoutMs: r.int('DB_REQUEST_TIMEOUT_MS', DEFAULTS.DB_REQUEST_TIMEOUT_MS, 100, 600_000) },
    redis: readRedis(r),
    s3: readS3(r),
    smtp: { ...readSmtp(r), outboxFile: r.optional('MAIL_OUTBOX_FILE') },
    jwt: {
      secret: r.string('JWT_SECRET', undefined, MIN_JWT_SECRET_LENGTH),
      ttl: r.duration('JWT_TTL', DEFAULTS.JWT_TTL),
    },
    http: {
      port: r.int('PORT', DEFAULTS.PORT, 0, 65535),
      host: r.string('HOST', DEFAULTS.HOST),
      webDist: r.optional('WEB_DIST'),
      trustProxy: r.trustProxy('TRUST_PROXY'),
      publicBaseUrl: '',
    },
    uploads: {
      maxBytes: r.int('UPLOAD_MAX_BYTES', DEFAULTS.UPLOAD_MAX_BYTES, 1, 17179869184),
      orphanAgeSeconds: r.int('UPLOAD_ORPHAN_AGE_SECONDS', DEFAULTS.UPLOAD_ORPHAN_AGE_SECONDS, 1, 31_536_000),
    },
    limits: { requestsPerMinute: r.int('RATE_LIMIT_PER_MINUTE', DEFAULTS.RATE_LIMIT_PER_MINUTE, 0, 1_000_000) },
  };
  config.http.publicBaseUrl = r.baseUrl('PUBLIC_BASE_URL', defaultPublicBaseUrl(config.http.host, config.http.port));
  r.done();
  return config;
}

function defaultPublicBaseUrl(host: string, port: number): string {
  const h = host === '0.0.0.0' || host === '::' || host === '' ? '127.0.0.1' : host.includes(':') ? `[${host}]` : host;
  return `http://${h}:${port || Number(DEFAULTS.PORT)}`;
}

export function loadWorkerConfig(env: Env): WorkerConfig {
  const r = new Reader(env);
  const config: WorkerConfig = {
    redis: readRedis(r),
    database: readDatabase(r),
    s3: readS3(r),
    concurrency: r.int('WORKER_CONCURRENCY', DEFAULTS.WORKER_CONCURRENCY, 1, 64),
    lockMs: r.int('WORKER_LOCK_MS', DEFAULTS.WORKER_LOCK_MS, 1000, 600000),
    render: {
      webDist: r.optional('WEB_DIST') ?? DEFAULT_WEB_DIST,
      chromiumPath: r.string('CHROMIUM_PATH', DEFAULTS.CHROMIUM_PATH),
      thumbnails: r.oneOf('THUMBNAILS', ['on', 'off'], 'on') === 'on',
      timeoutMs: r.int('RENDER_TIMEOUT_MS', DEFAULTS.RENDER_TIMEOUT_MS, 5000, 3600000),
    },
    outbox: { sweepMs: r.int('OUTBOX_SWEEP_MS', DEFAULTS.OUTBOX_SWEEP_MS, 100, 3600000), staleMs: r.int('OUTBOX_STALE_MS', DEFAULTS.OUTBOX_STALE_MS, 100, 86400000) },
  };
  // Optional for the worker: without it this worker leaves the mail queue alone.
  if (r.optional('SMTP_URL') !== undefined) config.smtp = readSmtp(r);
  r.done();
  return config;
}

/** Entry-point helper: on a ConfigError print the message (naming the variable) and exit 1. */
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
