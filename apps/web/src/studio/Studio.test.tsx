import { act, render, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { vi } from 'vitest';
import type { FigureDto } from '@psiform/contracts';
import { AppProviders, createQueryClient } from '../App';
import { json, mockFetch, renderApp, signedInRoutes, storeSession, user } from '../test/utils';
import { figure } from '../test/figures';
import type { PreviewRequest, PreviewResponse } from '../workers/preview-protocol';
import { ExportForm } from './ExportDialog';
import { previewWorker } from './usePreview';

// WebGL is missing in jsdom: the canvas is a probe of the props it would draw.
vi.mock('./StudioCanvas', () => ({
  default: (p: { stage: { camera: { view: string; projection: string } }; annotations: { axes: boolean }; surfaces: unknown[]; label: string }) => (
    <div data-testid="canvas-probe" data-view={p.stage.camera.view} data-projection={p.stage.camera.projection} data-axes={String(p.annotations.axes)} data-surfaces={p.surfaces.length} data-label={p.label} />
  ),
}));

/** Stands in for the module worker: answers like preview.worker.ts with one tiny triangle per phase. */
class FakeWorker {
  static last: FakeWorker | null = null;
  sent: PreviewRequest[] = [];
  onmessage: ((ev: MessageEvent<PreviewResponse>) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  constructor() {
    FakeWorker.last = this;
  }
  postMessage(req: PreviewRequest) {
    this.sent.push(req);
    const reply = (msg: PreviewResponse) => queueMicrotask(() => act(() => this.onmessage?.({ data: msg } as MessageEvent<PreviewResponse>)));
    if (req.type === 'sample') reply({ type: 'sampled', seq: req.seq, n: req.n, extent: 10, ms: 12 });
    else {
      const tri = () => ({ positions: new Float32Array([0, 0, 1, 1, 0, 1, 0, 1, 1]), normals: new Float32Array([0, 0, 1, 0, 0, 1, 0, 0, 1]), indices: new Uint32Array([0, 1, 2]) });
      reply({
        type: 'surface',
        seq: req.seq,
        sampleSeq: req.sampleSeq,
        surfaces: [
          { phase: '+', ...tri() },
          { phase: '-', ...tri() },
        ],
        isovalue: 0.02,
        enclosed: req.rule.rule === 'enclosed' ? req.rule.fraction : 0.5,
        triangles: 2,
        ms: { extract: 3, total: 4 },
      });
    }
  }
  terminate() {}
}

beforeEach(() => {
  FakeWorker.last = null;
  vi.spyOn(previewWorker, 'create').mockImplementation(() => new FakeWorker() as unknown as Worker);
});

const me = user('illustrator');

describe('Composer: quantum numbers as you type', () => {
  it('names the broken rule at once, keeps save disabled while invalid, and creates the figure once valid', async () => {
    const api = mockFetch({
      ...signedInRoutes(me),
      'POST /api/figures': ({ body }) => json(201, figure({ id: 'f9', currentVersion: { ...figure().currentVersion, recipe: (body as { recipe: FigureDto['currentVersion']['recipe'] }).recipe } })),
      'GET /api/figures/f9': () => json(200, figure({ id: 'f9' })),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/composer');
    await screen.findByTestId('studio-page');
    await ue.type(screen.getByTestId('studio-title'), 'Plate 7: 3d');
    await ue.click(screen.getByTestId('cmp-mode-nlm'));
    const save = () => screen.getByTestId('studio-save') as HTMLButtonElement;

    await ue.clear(screen.getByTestId('cmp-n'));
    await ue.type(screen.getByTestId('cmp-n'), '3');
    await ue.clear(screen.getByTestId('cmp-l'));
    await ue.type(screen.getByTestId('cmp-l'), '3');
    expect(screen.getByTestId('cmp-l-error').textContent).toBe('l must be less than n (got n=3, l=3): with n = 3, l can be 0, 1 or 2.');
    expect(save().disabled).toBe(true);

    await ue.clear(screen.getByTestId('cmp-l'));
    await ue.type(screen.getByTestId('cmp-l'), '2');
    expect(screen.queryByTestId('cmp-l-error')).toBeNull();
    await ue.clear(screen.getByTestId('cmp-m'));
    await ue.type(screen.getByTestId('cmp-m'), '-3');
    expect(screen.getByTestId('cmp-m-error').textContent).toBe('|m| must not exceed l (got l=2, m=-3): with l = 2, m can be −2, −1, 0, 1 or 2.');
    expect(save().disabled).toBe(true);

    await ue.clear(screen.getByTestId('cmp-n'));
    await ue.type(screen.getByTestId('cmp-n'), '13');
    expect(screen.getByTestId('cmp-n-error').textContent).toBe('n must be between 1 and 12 (got n=13).');

    await ue.clear(screen.getByTestId('cmp-n'));
    await ue.type(screen.getByTestId('cmp-n'), '3');
    await ue.clear(screen.getByTestId('cmp-m'));
    await ue.type(screen.getByTestId('cmp-m'), '-2');
    expect(screen.queryByTestId('cmp-m-error')).toBeNull();
    expect(screen.getByTestId('studio-model').textContent).toContain('3d_xy, Z = 1, one-electron hydrogen-like model');
    expect(screen.getByTestId('studio-model').textContent).toContain('many-electron orbitals differ');
    await waitFor(() => expect(save().disabled).toBe(false));

    await ue.click(save());
    await waitFor(() => expect(api.callsTo('POST', '/api/figures')).toHaveLength(1));
    const body = api.callsTo('POST', '/api/figures')[0].body as { title: string; recipe: { content: { terms: unknown[] } } };
    expect(body.title).toBe('Plate 7: 3d');
    expect(body.recipe.content.terms).toEqual([{ n: 3, l: 2, m: -2, basis: 'real', re: 1, im: 0 }]);
    await waitFor(() => expect(screen.getByTestId('location').textContent).toBe('/figures/f9/studio'));
  });

  it('shows a 400 from the server as its list of messages', async () => {
    mockFetch({
      ...signedInRoutes(me),
      'POST /api/figures': () => json(400, { statusCode: 400, message: ['recipe.grid.n must be at most 256 for this publication'], error: 'Bad Request' }),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/composer');
    await ue.type(await screen.findByTestId('studio-title'), 'Plate');
    await waitFor(() => expect((screen.getByTestId('studio-save') as HTMLButtonElement).disabled).toBe(false));
    await ue.click(screen.getByTestId('studio-save'));
    const err = await screen.findByTestId('studio-server-error');
    expect(within(err).getByText('recipe.grid.n must be at most 256 for this publication')).toBeTruthy();
  });
});

describe('Composer: superposition coefficients', () => {
  it('turns magnitude and phase into complex coefficients, shows Σ|c|² and normalises', async () => {
    const api = mockFetch({ ...signedInRoutes(me), 'POST /api/figures': () => json(201, figure({ id: 'f2' })), 'GET /api/figures/f2': () => json(200, figure({ id: 'f2' })) });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/composer');
    await ue.type(await screen.findByTestId('studio-title'), 'Plate 3: 2p(m=+1) by hand');
    await ue.click(screen.getByTestId('cmp-mode-superposition'));
    // Default rows: 2p_x with |c| = 1, phase 0°, and 2p_y with |c| = 1, phase 90°: c = 1 and c = i.
    // 2p_x and 2p_y are orthonormal, so Σ|c|² = 1 + 1 = 2 and each normalised |c| = 1/√2 ≈ 0.7071 (by hand).
    expect(screen.getByTestId('cmp-sumsq').textContent).toBe('Σ|c|² = 2');
    const coefs = () => screen.getAllByTestId('cmp-norm-coef').map((li) => li.textContent);
    expect(coefs()).toEqual(['0.7071 · e^(i·0°) = 0.7071 + 0i', '0.7071 · e^(i·90°) = 0 + 0.7071i']);

    // A third term at |c| = 2, phase 180°: c = −2, Σ|c|² = 1 + 1 + 4 = 6.
    await ue.click(screen.getByTestId('cmp-add-row'));
    const rows = screen.getAllByTestId('cmp-row');
    const third = within(rows[2]);
    await ue.clear(third.getByTestId('cmp-row-m'));
    await ue.type(third.getByTestId('cmp-row-m'), '0');
    await ue.clear(third.getByTestId('cmp-row-mag'));
    await ue.type(third.getByTestId('cmp-row-mag'), '2');
    await ue.clear(third.getByTestId('cmp-row-phase'));
    await ue.type(third.getByTestId('cmp-row-phase'), '180');
    expect(screen.getByTestId('cmp-sumsq').textContent).toBe('Σ|c|² = 6');
    // 1/√6 = 0.408248..., 2/√6 = 0.816497...
    expect(coefs()[2]).toBe('0.8165 · e^(i·180°) = -0.8165 + 0i');

    // A negative magnitude is refused with a message and save stays off.
    await ue.clear(third.getByTestId('cmp-row-mag'));
    await ue.type(third.getByTestId('cmp-row-mag'), '-1');
    expect(screen.getByTestId('cmp-row-error').textContent).toBe('Term 3: |c| cannot be negative (use the phase).');
    expect((screen.getByTestId('studio-save') as HTMLButtonElement).disabled).toBe(true);
    await ue.click(within(rows[2]).getByTestId('cmp-row-remove'));

    await ue.click(screen.getByTestId('cmp-normalise'));
    expect(screen.getAllByTestId('cmp-row-mag').map((i) => (i as HTMLInputElement).value)).toEqual(['0.707107', '0.707107']);
    expect(screen.getByTestId('cmp-sumsq').textContent).toBe('Σ|c|² = 1');

    await waitFor(() => expect((screen.getByTestId('studio-save') as HTMLButtonElement).disabled).toBe(false));
    await ue.click(screen.getByTestId('studio-save'));
    await waitFor(() => expect(api.callsTo('POST', '/api/figures')).toHaveLength(1));
    const terms = (api.callsTo('POST', '/api/figures')[0].body as { recipe: { content: { terms: { m: number; re: number; im: number }[] } } }).recipe.content.terms;
    expect(terms.map((t) => t.m)).toEqual([1, -1]);
    expect(terms[0].re).toBeCloseTo(0.707107, 6);
    expect(terms[0].im).toBe(0);
    expect(terms[1].re).toBe(0); // 90° is exact, not cos(π/2) ≈ 6e-17
    expect(terms[1].im).toBeCloseTo(0.707107, 6);
  });

  it('samples once per state and only re-extracts when the enclosed fraction moves', async () => {
    mockFetch(signedInRoutes(me));
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/composer');
    await screen.findByTestId('canvas-probe');
    const w = FakeWorker.last!;
    const samples = () => w.sent.filter((m) => m.type === 'sample');
    const surfaces = () => w.sent.filter((m) => m.type === 'surface');
    expect(samples()).toHaveLength(1);
    expect(samples()[0]).toMatchObject({ n: 112, state: { Z: 1, terms: [{ n: 2, l: 1, m: 0 }] } }); // recipe grid 128, preview capped at 112
    await ue.clear(screen.getByTestId('cmp-fraction'));
    await ue.type(screen.getByTestId('cmp-fraction'), '75');
    await waitFor(() => expect(surfaces().at(-1)).toMatchObject({ rule: { rule: 'enclosed', fraction: 0.75 } }));
    expect(samples()).toHaveLength(1);
    await waitFor(() => expect(screen.getByTestId('preview-status').textContent).toContain('encloses 75.0%'));
    expect(screen.getByTestId('preview-ms')).toBeTruthy();
    await ue.clear(screen.getByTestId('cmp-z'));
    await ue.type(screen.getByTestId('cmp-z'), '3');
    expect(screen.getByTestId('cmp-ion').textContent).toBe('Li²⁺');
    await waitFor(() => expect(samples()).toHaveLength(2));
    expect(samples()[1]).toMatchObject({ state: { Z: 3 } });
  });
});

describe('Stage shortcuts', () => {
  it('1/2/3/4/0 choose the view, O the projection, A the axes; typing in a field does not; the stage is saved', async () => {
    let current = figure();
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/figures/f1': () => json(200, current),
      'PATCH /api/figures/f1': ({ body }) => {
        current = figure({ currentVersion: { ...current.currentVersion, id: 'v2', number: 2, recipe: (body as { recipe: FigureDto['currentVersion']['recipe'] }).recipe } });
        return json(200, current);
      },
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/figures/f1/studio');
    const probe = await screen.findByTestId('canvas-probe');
    expect(probe.getAttribute('data-view')).toBe('three_quarter');
    expect((screen.getByTestId('studio-save') as HTMLButtonElement).disabled).toBe(true); // nothing changed yet

    await ue.keyboard('1');
    expect(screen.getByTestId('canvas-probe').getAttribute('data-view')).toBe('axis_x');
    expect(screen.getByTestId('view-axis_x').getAttribute('aria-pressed')).toBe('true');
    await ue.keyboard('3');
    expect(screen.getByTestId('canvas-probe').getAttribute('data-view')).toBe('axis_z');
    await ue.keyboard('0');
    expect(screen.getByTestId('canvas-probe').getAttribute('data-view')).toBe('free');
    await ue.keyboard('2');
    expect(screen.getByTestId('canvas-probe').getAttribute('data-view')).toBe('axis_y');
    await ue.keyboard('o');
    expect(screen.getByTestId('canvas-probe').getAttribute('data-projection')).toBe('orthographic');
    await ue.keyboard('a');
    expect(screen.getByTestId('canvas-probe').getAttribute('data-axes')).toBe('true');

    // Typing a 4 into the grid field is not a shortcut.
    await ue.click(screen.getByTestId('cmp-grid'));
    await ue.keyboard('4');
    expect(screen.getByTestId('canvas-probe').getAttribute('data-view')).toBe('axis_y');
    expect((screen.getByTestId('cmp-grid') as HTMLInputElement).value).toBe('484');
    await ue.clear(screen.getByTestId('cmp-grid'));
    await ue.type(screen.getByTestId('cmp-grid'), '48');

    expect(screen.getByTestId('studio-dirty')).toBeTruthy();
    await ue.click(screen.getByTestId('studio-save'));
    await waitFor(() => expect(api.callsTo('PATCH', '/api/figures/f1')).toHaveLength(1));
    const recipe = (api.callsTo('PATCH', '/api/figures/f1')[0].body as { recipe: FigureDto['currentVersion']['recipe'] }).recipe;
    expect(recipe.stage.camera.view).toBe('axis_y');
    expect(recipe.stage.camera.projection).toBe('orthographic');
    expect(recipe.annotations.axes).toBe(true);
    expect(recipe.content.terms).toEqual([{ n: 2, l: 1, m: 0, basis: 'real', re: 1, im: 0 }]);
    await waitFor(() => expect(screen.getByTestId('studio-version').textContent).toBe('Version 2'));
  });
});

describe('Export dialog: size arithmetic', () => {
  function renderForm() {
    mockFetch({ ...signedInRoutes(me) });
    storeSession(me);
    const client = createQueryClient();
    const f = figure();
    return render(
      <AppProviders client={client}>
        <ExportForm figure={f} canvas={{ widthMm: 120, heightMm: 80, dpi: 300 }} transparentDefault={false} />
      </AppProviders>,
    );
  }

  it('89 × 60 mm at 300 dpi is 1051 × 709 px; inches convert; dpi and presets update it live', async () => {
    const ue = userEvent.setup();
    renderForm();
    const px = () => screen.getByTestId('exp-pixels').textContent;
    // 120 mm / 25.4 × 300 = 1417.3 -> 1417; 80 mm -> 944.9 -> 945.
    expect(px()).toBe('1417 × 945 px (1.34 megapixels) at 300 dpi');
    await ue.clear(screen.getByTestId('exp-width'));
    await ue.type(screen.getByTestId('exp-width'), '89');
    await ue.clear(screen.getByTestId('exp-height'));
    await ue.type(screen.getByTestId('exp-height'), '60');
    // 89 / 25.4 × 300 = 1051.18 -> 1051; 60 / 25.4 × 300 = 708.66 -> 709.
    expect(px()).toBe('1051 × 709 px (0.75 megapixels) at 300 dpi');

    await ue.click(screen.getByTestId('exp-unit-in'));
    expect((screen.getByTestId('exp-width') as HTMLInputElement).value).toBe('3.504');
    expect((screen.getByTestId('exp-height') as HTMLInputElement).value).toBe('2.362');
    expect(px()).toBe('1051 × 709 px (0.75 megapixels) at 300 dpi');
    await ue.clear(screen.getByTestId('exp-width'));
    await ue.type(screen.getByTestId('exp-width'), '3.5');
    // 3.5 in × 300 dpi = 1050 px exactly.
    expect(px()).toMatch(/^1050 × 709 px/);

    await ue.selectOptions(screen.getByTestId('exp-dpi'), '600');
    expect(px()).toMatch(/^2100 × 1417 px/); // 2.362 in × 600 = 1417.2 -> 1417

    await ue.click(screen.getByTestId('exp-unit-mm'));
    await ue.click(screen.getByTestId('exp-preset-double'));
    expect((screen.getByTestId('exp-width') as HTMLInputElement).value).toBe('178');
    expect(px()).toMatch(/^4205 × /); // 178 / 25.4 × 600 = 4204.7 -> 4205

    await ue.clear(screen.getByTestId('exp-width'));
    await ue.type(screen.getByTestId('exp-width'), '5');
    expect(screen.getByTestId('exp-width-error').textContent).toBe('The width must be between 10 mm and 1000 mm.');
    expect(screen.queryByTestId('exp-submit')).toBeNull();
  });

  it('posts the PNG export, follows the job and offers the new file; a missing route reads plainly', async () => {
    const { sseStream, job } = await import('../test/figures');
    const stream = sseStream();
    const api = mockFetch({
      ...signedInRoutes(me),
      'POST /api/figures/f1/exports': () => json(202, { jobId: 'j7' }),
      'GET /api/jobs/j7/events': () => stream.response,
    });
    storeSession(me);
    const ue = userEvent.setup();
    render(
      <AppProviders client={createQueryClient()}>
        <ExportForm figure={figure()} canvas={{ widthMm: 89, heightMm: 60, dpi: 300 }} transparentDefault={false} />
      </AppProviders>,
    );
    await ue.click(screen.getByTestId('exp-transparent'));
    await ue.click(screen.getByTestId('exp-submit'));
    await waitFor(() => expect(api.callsTo('POST', '/api/figures/f1/exports')).toHaveLength(1));
    expect(api.callsTo('POST', '/api/figures/f1/exports')[0].body).toEqual({ format: 'png', widthMm: 89, heightMm: 60, dpi: 300, transparent: true });
    await screen.findByTestId('export-progress');
    stream.send(job({ id: 'j7', type: 'export', stage: 'rendering', progress: 40 }));
    await waitFor(() => expect(screen.getByTestId('export-stage').textContent).toBe('Drawing the figure'));
    const png = { id: 'a-png', kind: 'png' as const, bytes: 2048, sha256: 'ef'.repeat(32), stats: null, createdAt: '2025-02-01T10:09:00.000Z' };
    stream.send(job({ id: 'j7', type: 'export', state: 'completed', stage: 'done', progress: 100, assets: [png] }));
    stream.close();
    const dl = await screen.findByTestId('export-download');
    expect(dl.getAttribute('data-asset-id')).toBe('a-png');
    expect(dl.textContent).toBe('Download PNG · 2.0 kB');
  });

  it('says plainly when the server has no export route', async () => {
    mockFetch({ ...signedInRoutes(me) }); // unknown route -> 404 "No mock for …"
    storeSession(me);
    const ue = userEvent.setup();
    render(
      <AppProviders client={createQueryClient()}>
        <ExportForm figure={figure()} canvas={{ widthMm: 89, heightMm: 60, dpi: 300 }} transparentDefault={false} />
      </AppProviders>,
    );
    await ue.selectOptions(screen.getByTestId('exp-format'), 'bundle');
    await ue.click(screen.getByTestId('exp-submit'));
    expect((await screen.findByTestId('exp-server-error')).textContent).toContain('No mock for POST /api/figures/f1/exports');
  });
});
