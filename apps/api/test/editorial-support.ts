import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { join } from 'node:path';

const ROOT = join(__dirname, '..', '..', '..');

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

export interface OutboxEntry {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
}

/** Our own instance of the SMTP fake (scripts/fakes/mail.mjs) on our own port, stoppable and restartable. */
export class MailFake {
  private child: ChildProcess | undefined;
  constructor(
    readonly port: number,
    readonly outbox: string,
  ) {}

  get url(): string {
    return `smtp://127.0.0.1:${this.port}`;
  }

  async start(): Promise<void> {
    const child = spawn(process.execPath, [join(ROOT, 'scripts', 'fakes', 'mail.mjs'), '--port', String(this.port), '--outbox', this.outbox], { stdio: ['ignore', 'pipe', 'pipe'] });
    this.child = child;
    let out = '';
    child.stdout!.on('data', (d) => (out += d));
    child.stderr!.on('data', (d) => (out += d));
    await new Promise<void>((resolve, reject) => {
      const t0 = Date.now();
      const check = () => {
        if (out.includes('listening')) resolve();
        else if (child.exitCode !== null || Date.now() - t0 > 10000) reject(new Error(`mail fake did not start: ${out}`));
        else setTimeout(check, 25);
      };
      check();
    });
  }

  async stop(): Promise<void> {
    const c = this.child;
    this.child = undefined;
    if (!c || c.exitCode !== null) return;
    const exited = new Promise<void>((resolve) => c.once('exit', () => resolve()));
    c.kill('SIGTERM');
    const timer = setTimeout(() => c.kill('SIGKILL'), 3000);
    await exited;
    clearTimeout(timer);
  }

  messages(): OutboxEntry[] {
    if (!existsSync(this.outbox)) return [];
    return readFileSync(this.outbox, 'utf8')
      .split('\n')
      .filter((l) => l.trim())
      .map((l) => JSON.parse(l) as OutboxEntry);
  }
}
