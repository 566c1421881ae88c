import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { e2eConfig } from './support';

const dist = join(__dirname, '..', 'dist');

interface Run {
  code: number | null;
  stdout: string;
  stderr: string;
}

function runNode(script: string, env: NodeJS.ProcessEnv, timeoutMs = 15000): Promise<Run> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [join(dist, script)], { env, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d) => (stdout += d));
    child.stderr.on('data', (d) => (stderr += d));
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`${script} did not exit within ${timeoutMs} ms; stderr: ${stderr}`));
    }, timeoutMs);
    child.on('exit', (code) => {
      clearTimeout(timer);
      resolve({ code, stdout, stderr });
    });
  });
}

describe('start-up (compiled entry points)', () => {
  beforeAll(() => {
    if (!existsSync(join(dist, 'main.js'))) throw new Error('apps/api/dist is missing: run `npm run build -w @psiform/api` first');
  });

  const base = (): NodeJS.ProcessEnv => ({ PATH: process.env.PATH, ...pickServiceEnv() });

  it('main.js exits 1 naming DATABASE_URL when it is not a postgres URL', async () => {
    const r = await runNode('main.js', { ...base(), DATABASE_URL: 'mysql://127.0.0.1/psiform' });
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('Invalid configuration: DATABASE_URL must be a postgres:// URL');
  });

  it('main.js exits 1 naming JWT_SECRET when it is missing or short', async () => {
    const missing = await runNode('main.js', { ...base(), JWT_SECRET: '' });
    expect(missing.code).toBe(1);
    expect(missing.stderr).toContain('JWT_SECRET is required');
    const short = await runNode('main.js', { ...base(), JWT_SECRET: 'too-short' });
    expect(short.code).toBe(1);
    expect(short.stderr).toContain('JWT_SECRET must be at least 32 characters');
  });

  it('migrate.js and seed/run.js exit 1 naming DATABASE_URL when it is missing', async () => {
    for (const script of ['db/migrate.js', 'seed/run.js']) {
      const r = await runNode(script, { PATH: process.env.PATH });
      expect(r.code).toBe(1);
      expect(r.stderr).toContain('DATABASE_URL is required');
    }
  });

  it('main.js serves /api and the WEB_DIST client with an SPA fallback, and shuts down gracefully on SIGTERM', async () => {
    const web = mkdtempSync(join(tmpdir(), 'psiform-web-'));
    mkdirSync(join(web, 'assets'));
    writeFileSync(join(web, 'index.html'), '<!doctype html><title>Psiform test shell</title>');
    writeFileSync(join(web, 'assets', 'app.js'), 'console.log("psiform");');
    const child = spawn(process.execPath, [join(dist, 'main.js')], { env: { ...base(), PORT: '0', WEB_DIST: web }, stdio: ['ignore', 'pipe', 'pipe'] });
    try {
      const port = await new Promise<number>((resolve, reject) => {
        let out = '';
        const timer = setTimeout(() => reject(new Error(`no listening line; output: ${out}`)), 20000);
        const onData = (d: Buffer) => {
          out += d;
          const m = /API listening on http:\/\/[^:]+:(\d+)\/api/.exec(out);
          if (m) {
            clearTimeout(timer);
            resolve(Number(m[1]));
          }
        };
        child.stdout.on('data', onData);
        child.stderr.on('data', onData);
        child.on('exit', (code) => reject(new Error(`exited early with ${code}: ${out}`)));
      });
      const base = `http://127.0.0.1:${port}`;
      const asset = await fetch(`${base}/assets/app.js`);
      expect(asset.status).toBe(200);
      expect(await asset.text()).toBe('console.log("psiform");');
      for (const path of ['/', '/publications/123/figures']) {
        const page = await fetch(base + path);
        expect(page.status).toBe(200);
        expect(await page.text()).toContain('Psiform test shell');
      }
      const apiMissing = await fetch(`${base}/api/no-such-route`);
      expect(apiMissing.status).toBe(404);
      expect(await apiMissing.json()).toMatchObject({ statusCode: 404, error: 'Not Found' });
      expect((await fetch(`${base}/api/health`)).status).toBe(200);
      let output = '';
      child.stdout.on('data', (d) => (output += d));
      const exited = new Promise<NodeJS.Signals | null>((resolve) => child.on('exit', (_code, signal) => resolve(signal)));
      child.kill('SIGTERM');
      // Nest runs the shutdown hooks, then re-raises the signal (conventional exit by SIGTERM).
      expect(await exited).toBe('SIGTERM');
      expect(output).toContain('API stopped (SIGTERM)');
    } finally {
      if (child.exitCode === null) child.kill('SIGKILL');
      rmSync(web, { recursive: true, force: true });
    }
  });
});

/** The service variables from the environment (validated), so only the one under test is bad. */
function pickServiceEnv(): NodeJS.ProcessEnv {
  e2eConfig(); // fail loudly if the environment is missing
  const names = ['DATABASE_URL', 'REDIS_URL', 'S3_ENDPOINT', 'S3_BUCKET', 'S3_ACCESS_KEY_ID', 'S3_SECRET_ACCESS_KEY', 'S3_REGION', 'SMTP_URL', 'MAIL_FROM', 'JWT_SECRET', 'JWT_TTL', 'HOST'];
  return Object.fromEntries(names.filter((n) => process.env[n] !== undefined).map((n) => [n, process.env[n]]));
}
