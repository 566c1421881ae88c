import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { StaticSite } from './static-site';

describe('StaticSite', () => {
  const root = mkdtempSync(join(tmpdir(), 'psiform-site-'));
  const dist = join(root, 'dist');
  mkdirSync(join(dist, 'assets'), { recursive: true });
  writeFileSync(join(dist, 'render.html'), '<!doctype html><title>r</title>');
  writeFileSync(join(dist, 'assets', 'a.js'), 'export const a = 1;');
  writeFileSync(join(root, 'secret.txt'), 'not for the browser');
  const site = new StaticSite(dist);
  afterAll(() => site.close());

  it('serves the build on 127.0.0.1 with module-script content types, and nothing outside it', async () => {
    const page = await fetch(await site.url('/render.html'));
    expect(page.status).toBe(200);
    expect(page.headers.get('content-type')).toMatch(/^text\/html/);
    const js = await fetch(await site.url('/assets/a.js'));
    expect(js.headers.get('content-type')).toMatch(/^text\/javascript/);
    expect(await site.url('/')).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/$/);
    expect((await fetch(await site.url('/%2e%2e/secret.txt'))).status).toBe(404);
    expect((await fetch(await site.url('/nope.js'))).status).toBe(404);
  });

  it('serves a blob until it is removed', async () => {
    const blob = await site.addBlob(new Uint8Array([1, 2, 3]), 'model/gltf-binary');
    const res = await fetch(blob.url);
    expect(res.headers.get('content-type')).toBe('model/gltf-binary');
    expect(new Uint8Array(await res.arrayBuffer())).toEqual(new Uint8Array([1, 2, 3]));
    blob.remove();
    expect((await fetch(blob.url)).status).toBe(404);
  });

  it('names the missing render page and WEB_DIST', () => {
    expect(() => site.checkBuilt()).not.toThrow();
    expect(() => new StaticSite(join(root, 'nowhere')).checkBuilt()).toThrow(/render\.html does not exist .*WEB_DIST/);
  });
});
