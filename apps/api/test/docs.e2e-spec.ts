import { startTestApp, type TestApp } from './support';

interface RouterLayer {
  route?: { path: string; methods: Record<string, boolean> };
}

/**
 * GET /api/docs (the UI) and /api/docs-json (the OpenAPI document built from the controllers, the DTO classes'
 * validation rules and the contracts' recipe schema): every route the app serves is in the document.
 */
describe('OpenAPI document (e2e)', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp();
  });
  afterAll(async () => {
    await t?.close();
  });

  /** The routes Express really serves, as "METHOD /api/path/{param}". */
  function servedRoutes(): string[] {
    const express = t.app.getHttpAdapter().getInstance() as { router: { stack: RouterLayer[] } };
    const out: string[] = [];
    for (const layer of express.router.stack) {
      const r = layer.route;
      if (!r || !r.path.startsWith('/api/') || r.path.startsWith('/api/docs')) continue;
      for (const [method, on] of Object.entries(r.methods)) if (on && method !== '_all') out.push(`${method.toUpperCase()} ${r.path.replace(/:(\w+)/g, '{$1}')}`);
    }
    return [...new Set(out)].sort();
  }

  it('lists every route the app serves, and nothing it does not', async () => {
    const doc = (await t.http().get('/api/docs-json').expect(200)).body;
    expect(doc.openapi).toMatch(/^3\./);
    const documented: string[] = [];
    for (const [path, ops] of Object.entries(doc.paths as Record<string, Record<string, unknown>>)) {
      for (const method of Object.keys(ops)) if (['get', 'post', 'put', 'patch', 'delete'].includes(method)) documented.push(`${method.toUpperCase()} ${path}`);
    }
    const served = servedRoutes();
    expect(served.length).toBeGreaterThan(40);
    expect(documented.sort()).toEqual(served);
    for (const r of ['POST /api/auth/login', 'PATCH /api/figures/{id}', 'POST /api/figures/{id}/exports', 'GET /api/jobs/{id}/events', 'POST /api/publications/{id}/rerender']) {
      expect(documented).toContain(r);
    }
  });

  it('describes bodies from the DTOs\' validation rules and the recipe from its zod schema', async () => {
    const doc = (await t.http().get('/api/docs-json').expect(200)).body;
    const create = doc.paths['/api/figures'].post.requestBody.content['application/json'].schema;
    expect(create).toEqual({ $ref: '#/components/schemas/CreateFigureBody' });
    const body = doc.components.schemas.CreateFigureBody;
    expect(body.properties.title).toMatchObject({ type: 'string', maxLength: 200 });
    expect(body.properties.publicationId).toMatchObject({ format: 'uuid' });
    expect(body.properties.recipe).toEqual({ $ref: '#/components/schemas/Recipe' });
    const recipe = doc.components.schemas.Recipe;
    expect(Object.keys(recipe.properties)).toEqual(expect.arrayContaining(['version', 'content', 'grid', 'surface', 'palette', 'stage', 'annotations', 'canvas']));
    const term = recipe.properties.content.properties.terms.items;
    expect(term.properties.l.description).toBe('angular momentum quantum number: an integer, 0 ≤ l < n');
    // grid.n: 'auto' (the engine chooses) or an integer within the recipe's limits.
    expect(recipe.properties.grid.properties.n.anyOf).toEqual(expect.arrayContaining([expect.objectContaining({ type: 'string', enum: ['auto'] }), expect.objectContaining({ type: 'integer', minimum: 16, maximum: 384 })]));
  });

  it('serves the document browser at /api/docs without a sign-in', async () => {
    const res = await t.http().get('/api/docs').redirects(1).expect(200);
    expect(res.headers['content-type']).toMatch(/text\/html/);
    expect(res.text).toContain('swagger-ui');
  });
});
