import { randomBytes } from 'node:crypto';
import { createReadStream, existsSync, statSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { extname, join, normalize, resolve, sep } from 'node:path';

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.woff2': 'font/woff2',
  '.woff': 'font/woff',
  '.wasm': 'application/wasm',
  '.glb': 'model/gltf-binary',
  '.map': 'application/json',
};

/**
 * The built client (WEB_DIST) on 127.0.0.1 at a random port, for the headless browser: module scripts do not
 * load from file://. Besides the files it serves short-lived in-memory blobs (a figure's GLB) under
 * /__blob/<random>, so the page loads meshes from its own origin without presigned URLs or CORS.
 */
export class StaticSite {
  private server: Server | undefined;
  private origin: string | undefined;
  private readonly blobs = new Map<string, { bytes: Uint8Array; type: string }>();
  private readonly root: string;

  constructor(webDist: string) {
    this.root = resolve(webDist);
  }

  /** Throws a message naming WEB_DIST when the build (render.html) is missing. */
  checkBuilt(): void {
    if (!existsSync(join(this.root, 'render.html'))) {
      throw new Error(`the render page is missing: ${join(this.root, 'render.html')} does not exist (build apps/web: npm run build -w @psiform/web, or point WEB_DIST at a build)`);
    }
  }

  async url(path: string): Promise<string> {
    return `${await this.start()}${path}`;
  }

  /** Serves bytes at a fresh URL until the returned function is called. */
  async addBlob(bytes: Uint8Array, type: string): Promise<{ url: string; remove: () => void }> {
    const id = randomBytes(12).toString('hex');
    this.blobs.set(id, { bytes, type });
    return { url: await this.url(`/__blob/${id}`), remove: () => this.blobs.delete(id) };
  }

  private async start(): Promise<string> {
    if (this.origin) return this.origin;
    const server = createServer((req, res) => {
      const path = decodeURIComponent((req.url ?? '/').split('?')[0]);
      if (req.method !== 'GET' && req.method !== 'HEAD') {
        res.writeHead(405).end();
        return;
      }
      if (path.startsWith('/__blob/')) {
        const blob = this.blobs.get(path.slice('/__blob/'.length));
        if (!blob) {
          res.writeHead(404).end();
          return;
        }
        res.writeHead(200, { 'content-type': blob.type, 'content-length': blob.bytes.byteLength, 'cache-control': 'no-store' });
        res.end(req.method === 'HEAD' ? undefined : blob.bytes);
        return;
      }
      const file = normalize(join(this.root, path === '/' ? 'index.html' : path));
      if (!file.startsWith(this.root + sep) || !existsSync(file) || !statSync(file).isFile()) {
        res.writeHead(404, { 'content-type': 'text/plain' }).end('not found');
        return;
      }
      res.writeHead(200, { 'content-type': TYPES[extname(file)] ?? 'application/octet-stream', 'content-length': statSync(file).size });
      if (req.method === 'HEAD') res.end();
      else createReadStream(file).pipe(res);
    });
    await new Promise<void>((ok, fail) => {
      server.once('error', fail);
      server.listen(0, '127.0.0.1', () => ok());
    });
    this.server = server;
    this.origin = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    return this.origin;
  }

  async close(): Promise<void> {
    const s = this.server;
    this.server = undefined;
    this.origin = undefined;
    this.blobs.clear();
    if (!s) return;
    const closed = new Promise<void>((ok) => s.close(() => ok()));
    s.closeAllConnections(); // the browser keeps connections alive
    await closed;
  }
}
