import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Logger } from '@nestjs/common';
import { chromium, type Browser, type Page } from 'playwright-core';
import { CHROMIUM_FLAGS } from '@psiform/contracts';


/**
 * One Chromium per worker process, launched on first use with a fresh profile, reused across jobs, relaunched
 * when it crashed or was closed, closed (profile deleted) on shutdown. Pages are handed out one at a time:
 * software rendering already uses the cores, so parallel renders would only slow each other down.
 */
export class HeadlessBrowser {
  private readonly log = new Logger('HeadlessBrowser');
  private browser: Browser | undefined;
  private page: Page | undefined;
  private launching: Promise<Browser> | undefined;
  private profile: string | undefined;
  private queue: Promise<unknown> = Promise.resolve();
  private closed = false;
  launches = 0;

  constructor(private readonly executablePath: string) {}

  /**
   * Runs fn with the browser's one page (kept between calls so the render page loads once; fn can tell a new page
   * by `fresh`). Calls are serialised. When fn throws, the page is closed, so the next call starts clean.
   */
  withPage<T>(fn: (page: Page, fresh: boolean) => Promise<T>): Promise<T> {
    const run = this.queue.then(async () => {
      const browser = await this.ensure();
      let fresh = false;
      if (!this.page || this.page.isClosed()) {
        const context = await browser.newContext({ viewport: { width: 800, height: 600 }, deviceScaleFactor: 1 });
        this.page = await context.newPage();
        fresh = true;
      }
      const page = this.page;
      try {
        return await fn(page, fresh);
      } catch (err) {
        this.page = undefined;
        await page.context().close().catch(() => undefined);
        throw err;
      }
    });
    this.queue = run.catch(() => undefined);
    return run;
  }

  private async ensure(): Promise<Browser> {
    if (this.closed) throw new Error('the worker is shutting down');
    if (this.browser?.isConnected()) return this.browser;
    this.launching ??= this.launch().finally(() => (this.launching = undefined));
    return this.launching;
  }

  private async launch(): Promise<Browser> {
    await this.dropProfile();
    this.profile = await mkdtemp(join(tmpdir(), 'psiform-render-'));
    const t0 = performance.now();
    try {
      const browser = await chromium.launch({
        executablePath: this.executablePath,
        ignoreDefaultArgs: true,
        args: [...CHROMIUM_FLAGS, `--user-data-dir=${this.profile}`, '--remote-debugging-pipe', '--no-startup-window'],
        timeout: 60_000,
      });
      browser.on('disconnected', () => {
        if (this.browser === browser) {
          this.browser = undefined;
          this.page = undefined;
        }
        if (!this.closed) this.log.warn('Chromium went away; the next render starts a new one');
      });
      this.browser = browser;
      this.launches++;
      this.log.log(`Chromium ${browser.version()} started in ${Math.round(performance.now() - t0)} ms`);
      return browser;
    } catch (err) {
      await this.dropProfile();
      throw new Error(`could not start Chromium at ${this.executablePath} (CHROMIUM_PATH): ${(err as Error).message.split('\n')[0]}`, { cause: err });
    }
  }

  private async dropProfile(): Promise<void> {
    if (this.profile) await rm(this.profile, { recursive: true, force: true }).catch(() => undefined);
    this.profile = undefined;
  }

  /** For tests: make the next call find a dead browser. */
  async crashForTest(): Promise<void> {
    await this.browser?.close();
  }

  async close(): Promise<void> {
    this.closed = true;
    await this.queue.catch(() => undefined);
    const b = this.browser ?? (await this.launching?.catch(() => undefined));
    this.browser = undefined;
    await b?.close().catch(() => undefined);
    await this.dropProfile();
  }
}
