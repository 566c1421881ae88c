import { act, render, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { vi } from 'vitest';
import { DEFAULT_DELIVERY_PROFILE, parseRecipe, type FigureDto } from '@psiform/contracts';
import { AppProviders, createQueryClient } from '../App';
import { json, mockFetch, renderApp, signedInRoutes, storeSession, user, retype, type Handler } from '../test/utils';
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
  /** A box-cuts-surface warning the fake reports while the sampled box is narrower than its suggestion. */
  static boxWarning: { message: string; suggestedExtent: number } | null = null;
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
        maxAbs: 0.05,
        warnings: this.warningsNow(),
      });
    }
  }
  terminate() {}
  private warningsNow() {
    const w = FakeWorker.boxWarning;
    const sample = this.sent.filter((m) => m.type === 'sample').at(-1);
    const extent = sample?.type === 'sample' ? sample.extent : 'auto';
    if (!w || extent === 'auto' || extent >= w.suggestedExtent) return [];
    return [{ code: 'box-cuts-surface' as const, message: w.message, suggestedExtent: w.suggestedExtent }];
  }
}

// These tests type field by field through userEvent; on a shared 2-core machine under load that alone can pass
// the default 20 s. The limit only stops a hung test: nothing here measures speed.
vi.setConfig({ testTimeout: 90_000 });

beforeEach(() => {
  FakeWorker.last = null;
  FakeWorker.boxWarning = null;
  vi.spyOn(previewWorker, 'create').mockImplementation(() => new FakeWorker() as unknown as Worker);
});

const me = user('illustrator');

/** The export form alone for a signed-in illustrator, for a `widthMm` × 60 mm canvas at 300 dpi; returns the user-event driver. */
function openExportForm(widthMm: number) {
  storeSession(me);
  const ue = userEvent.setup();
  render(
    <AppProviders client={createQueryClient()}>
      <ExportForm figure={figure()} canvas={{ widthMm, heightMm: 60, dpi: 300 }} transparentDefault={false} />
    </AppProviders>,
  );
  return ue;
}

/** GET and PATCH of figure f1 over one stored figure: a PATCH stores version 2 with the recipe sent, as the server does. */
function savedFigureRoutes(initial: FigureDto): Record<string, Handler> {
  let current = initial;
  return {
    'GET /api/figures/f1': () => json(200, current),
    'PATCH /api/figures/f1': ({ body }) => {
      current = figure({ currentVersion: { ...current.currentVersion, id: 'v2', number: 2, recipe: (body as { recipe: FigureDto['currentVersion']['recipe'] }).recipe } });
      return json(200, current);
    },
  };
}

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

    await retype(ue, screen.getByTestId('cmp-n'), '3');
    await retype(ue, screen.getByTestId('cmp-l'), '3');
    expect(screen.getByTestId('cmp-l-error').textContent).toBe('l must be less than n (got n=3, l=3): with n = 3, l can be 0, 1 or 2.');
    expect(save().disabled).toBe(true);

    await retype(ue, screen.getByTestId('cmp-l'), '2');
    expect(screen.queryByTestId('cmp-l-error')).toBeNull();
    await retype(ue, screen.getByTestId('cmp-m'), '-3');
    expect(screen.getByTestId('cmp-m-error').textContent).toBe('|m| must not exceed l (got l=2, m=-3): with l = 2, m can be −2, −1, 0, 1 or 2.');
    expect(save().disabled).toBe(true);

    await retype(ue, screen.getByTestId('cmp-n'), '13');
    expect(screen.getByTestId('cmp-n-error').textContent).toBe('n must be between 1 and 12 (got n=13).');

    await retype(ue, screen.getByTestId('cmp-n'), '3');
    await retype(ue, screen.getByTestId('cmp-m'), '-2');
    expect(screen.queryByTestId('cmp-m-error')).toBeNull();
    expect(screen.getByTestId('studio-model').textContent).toContain('3dxy, Z = 1, one-electron hydrogen-like model'); // typeset: 3d with a subscript xy
    expect(screen.getByTestId('studio-model').querySelector('sub')?.textContent).toBe('xy');
    expect(screen.getByTestId('studio-model').textContent).toContain('many-electron orbitals differ');
    await waitFor(() => expect(save().disabled).toBe(false));

    await ue.click(save());
    await waitFor(() => expect(api.callsTo('POST', '/api/figures')).toHaveLength(1));
    const body = api.callsTo('POST', '/api/figures')[0].body as { title: string; recipe: { content: { terms: unknown[] } } };
    expect(body.title).toBe('Plate 7: 3d');
    expect(body.recipe.content.terms).toEqual([{ n: 3, l: 2, m: -2, basis: 'real', re: 1, im: 0 }]);
    expect((body.recipe as unknown as { grid: { n: unknown } }).grid.n).toBe('auto'); // the engine's state-aware grid
    await waitFor(() => expect(screen.getByTestId('location').textContent).toBe('/figures/f9/studio'), { timeout: 15_000 });
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
    // The view shows the current state exactly: the default 2p_z as one row, |c| = 1, phase 0°.
    expect(screen.getAllByTestId('cmp-row')).toHaveLength(1);
    expect(screen.getByTestId('cmp-sumsq').textContent).toBe('Σ|c|² = 1');
    const coefs = () => screen.getAllByTestId('cmp-norm-coef').map((li) => li.textContent);
    // Make it 2p_x (m = +1) and add 2p_y (m = −1) at phase 90°: c = 1 and c = i.
    await retype(ue, screen.getByTestId('cmp-row-m'), '1');
    await ue.click(screen.getByTestId('cmp-add-row'));
    expect(screen.getByTestId('cmp-sumsq').textContent).toBe('Σ|c|² = 1'); // a new row starts at |c| = 0: ψ unchanged
    const second = within(screen.getAllByTestId('cmp-row')[1]);
    await retype(ue, second.getByTestId('cmp-row-m'), '-1');
    await retype(ue, second.getByTestId('cmp-row-mag'), '1');
    await retype(ue, second.getByTestId('cmp-row-phase'), '90');
    // 2p_x and 2p_y are orthonormal, so Σ|c|² = 1 + 1 = 2 and each normalised |c| = 1/√2 ≈ 0.7071 (by hand).
    expect(screen.getByTestId('cmp-sumsq').textContent).toBe('Σ|c|² = 2');
    expect(coefs()).toEqual(['0.7071 · e^(i·0°) = 0.7071 + 0i', '0.7071 · e^(i·90°) = 0 + 0.7071i']);

    // A third term at |c| = 2, phase 180°: c = −2, Σ|c|² = 1 + 1 + 4 = 6.
    await ue.click(screen.getByTestId('cmp-add-row'));
    const rows = screen.getAllByTestId('cmp-row');
    const third = within(rows[2]);
    await retype(ue, third.getByTestId('cmp-row-m'), '0');
    await retype(ue, third.getByTestId('cmp-row-mag'), '2');
    await retype(ue, third.getByTestId('cmp-row-phase'), '180');
    expect(screen.getByTestId('cmp-sumsq').textContent).toBe('Σ|c|² = 6');
    // 1/√6 = 0.408248..., 2/√6 = 0.816497...
    expect(coefs()[2]).toBe('0.8165 · e^(i·180°) = -0.8165 + 0i');

    // A negative magnitude is refused with a message and save stays off.
    await retype(ue, third.getByTestId('cmp-row-mag'), '-1');
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
    // A real state (2p_z): the sign legend, no phase key.
    expect(screen.getByTestId('phase-legend').textContent).toContain('ψ > 0');
    expect(screen.queryByTestId('phase-key')).toBeNull();
    const w = FakeWorker.last!;
    const samples = () => w.sent.filter((m) => m.type === 'sample');
    const surfaces = () => w.sent.filter((m) => m.type === 'surface');
    expect(samples()).toHaveLength(1);
    // A new figure starts on the engine's own grid (contracts RECIPE_DEFAULTS 'auto'): the preview asks for it too.
    expect(samples()[0]).toMatchObject({ n: 'auto', state: { Z: 1, terms: [{ n: 2, l: 1, m: 0 }] } });
    expect((screen.getByTestId('cmp-grid') as HTMLInputElement).value).toBe('auto');
    await retype(ue, screen.getByTestId('cmp-fraction'), '75');
    await waitFor(() => expect(surfaces().at(-1)).toMatchObject({ rule: { rule: 'enclosed', fraction: 0.75 } }));
    expect(samples()).toHaveLength(1);
    await waitFor(() => expect(screen.getByTestId('preview-status').textContent).toContain('encloses 75.0%'));
    expect(screen.getByTestId('preview-ms')).toBeTruthy();
    await retype(ue, screen.getByTestId('cmp-z'), '3');
    expect(screen.getByTestId('cmp-ion').textContent).toBe('Li2+'); // Li with a typeset superscript 2+
    expect(screen.getByTestId('cmp-ion').querySelector('sup')?.textContent).toBe('2+');
    await waitFor(() => expect(samples()).toHaveLength(2));
    expect(samples()[1]).toMatchObject({ state: { Z: 3 } });
  });
});

describe('Studio: what the figure cannot show', () => {
  it('says when the box cuts the surface, offers to widen it, and saves the wider box', async () => {
    const first = figure();
    const api = mockFetch({
      ...signedInRoutes(me),
      ...savedFigureRoutes(figure({ currentVersion: { ...first.currentVersion, recipe: { ...first.currentVersion.recipe, grid: { n: 48, extent: 3 } } } })),
    });
    FakeWorker.boxWarning = { message: 'The box (±3 a0) cuts the surface: the figure draws 31% of the 90% it encloses.', suggestedExtent: 7.1234 };
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/figures/f1/studio');
    await screen.findByTestId('canvas-probe', {}, { timeout: 15000 });
    const w = FakeWorker.last!;
    expect(w.sent.find((m) => m.type === 'sample')).toMatchObject({ extent: 3 });
    const callout = await screen.findByTestId('studio-warnings');
    expect(within(callout).getByTestId('studio-warning').getAttribute('data-code')).toBe('box-cuts-surface');
    expect(callout.textContent).toContain('cuts the surface');
    // Rounded UP to 3 significant digits, so the offered box really holds the surface.
    expect(screen.getByTestId('studio-widen-box').textContent).toBe('Widen the box to ±7.13 a0');
    await ue.click(screen.getByTestId('studio-widen-box'));
    await waitFor(() => expect(w.sent.filter((m) => m.type === 'sample').at(-1)).toMatchObject({ extent: 7.13 }));
    await waitFor(() => expect(screen.queryByTestId('studio-warnings')).toBeNull());
    await ue.click(screen.getByTestId('studio-save'));
    await waitFor(() => expect(api.callsTo('PATCH', '/api/figures/f1')).toHaveLength(1));
    const recipe = (api.callsTo('PATCH', '/api/figures/f1')[0].body as { recipe: FigureDto['currentVersion']['recipe'] }).recipe;
    expect(recipe.grid).toEqual({ n: 48, extent: 7.13 });
  });
});

describe('Opening a saved figure', () => {
  it('a complex 2p(m=+1) made through the API opens clean, and no view switch changes its terms or enables Save', async () => {
    const stored = parseRecipe({ version: 1, label: '2p(m=+1)', content: { Z: 1, terms: [{ n: 2, l: 1, m: 1, basis: 'complex', re: 1, im: 0 }] }, grid: { n: 64 }, surface: { rule: 'enclosed', fraction: 0.9 } });
    if (!stored.ok) throw new Error('bad test recipe');
    const f = figure({ currentVersion: { ...figure().currentVersion, recipe: stored.recipe } });
    mockFetch({ ...signedInRoutes(me), 'GET /api/figures/f1': () => json(200, f) });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/figures/f1/studio');
    await screen.findByTestId('canvas-probe', {}, { timeout: 15000 });
    const save = () => screen.getByTestId('studio-save') as HTMLButtonElement;
    expect(save().disabled).toBe(true);
    expect(screen.queryByTestId('studio-dirty')).toBeNull();
    // Coloured by arg ψ: the phase key (a ring marked 0, π/2, π, 3π/2), not the ψ > 0 / ψ < 0 legend of real states.
    const key = screen.getByTestId('phase-key');
    expect(Array.from(key.querySelectorAll('.phase-key-mark')).map((t) => t.textContent)).toEqual(['0', 'π/2', 'π', '3π/2']);
    expect(key.querySelectorAll('path')).toHaveLength(72);
    expect(screen.getByTestId('phase-legend').textContent).not.toContain('ψ > 0');
    for (const mode of ['superposition', 'label', 'hybrid', 'nlm', 'superposition']) {
      await ue.click(screen.getByTestId(`cmp-mode-${mode}`));
      expect({ mode, dirty: screen.queryByTestId('studio-dirty'), disabled: save().disabled }).toEqual({ mode, dirty: null, disabled: true });
    }
    // The superposition view shows the one stored term, not a default pair.
    const rows = screen.getAllByTestId('cmp-row');
    expect(rows).toHaveLength(1);
    expect(['n', 'l', 'm', 'mag', 'phase'].map((k) => (within(rows[0]).getByTestId(`cmp-row-${k}`) as HTMLInputElement).value)).toEqual(['2', '1', '1', '1', '0']);
    expect(screen.getByTestId('cmp-sumsq').textContent).toBe('Σ|c|² = 1');
    // The hybrid view cannot show it: it says so and offers an explicit replacement.
    await ue.click(screen.getByTestId('cmp-mode-hybrid'));
    expect(screen.getByTestId('cmp-current-state').textContent).toContain('cannot show the current state exactly');
    expect(screen.getByTestId('cmp-replace').textContent).toBe('Replace with a hybrid…');
    // The sampled state sent to the preview is the stored one every time.
    const samples = FakeWorker.last!.sent.filter((m) => m.type === 'sample');
    expect(samples.every((m) => m.type === 'sample' && JSON.stringify(m.state.terms) === JSON.stringify([{ n: 2, l: 1, m: 1, basis: 'complex', re: 1, im: 0 }]))).toBe(true);
  });
});

describe('Stage shortcuts', () => {
  it('1/2/3/4/0 choose the view, O the projection, A the axes; typing in a field does not; the stage is saved', async () => {
    const api = mockFetch({ ...signedInRoutes(me), ...savedFigureRoutes(figure()) });
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
    await retype(ue, screen.getByTestId('cmp-grid'), '48');

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

/** A publication's delivery profile for the export dialog: PNG first at 300 dpi (what these tests measure), RGB. */
const pngProfile = { ...DEFAULT_DELIVERY_PROFILE, rasterFormats: ['png', 'tiff'], minDpi: 300, colourMode: 'rgb', publicationId: 'p1', isDefault: false, updatedAt: null, updatedBy: null };
const profileRoute = (profile: object = pngProfile) => ({ 'GET /api/publications/p1/delivery-profile': () => json(200, profile) });

describe('Export dialog: size arithmetic', () => {
  function renderForm() {
    mockFetch({ ...signedInRoutes(me), ...profileRoute() });
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
    expect(await screen.findByTestId('exp-pixels')).toBeTruthy();
    expect(px()).toBe('1417 × 945 px (1.34 megapixels) at 300 dpi');
    await retype(ue, screen.getByTestId('exp-width'), '89');
    await retype(ue, screen.getByTestId('exp-height'), '60');
    // 89 / 25.4 × 300 = 1051.18 -> 1051; 60 / 25.4 × 300 = 708.66 -> 709.
    expect(px()).toBe('1051 × 709 px (0.75 megapixels) at 300 dpi');

    await ue.click(screen.getByTestId('exp-unit-in'));
    expect((screen.getByTestId('exp-width') as HTMLInputElement).value).toBe('3.504');
    expect((screen.getByTestId('exp-height') as HTMLInputElement).value).toBe('2.362');
    expect(px()).toBe('1051 × 709 px (0.75 megapixels) at 300 dpi');
    await retype(ue, screen.getByTestId('exp-width'), '3.5');
    // 3.5 in × 300 dpi = 1050 px exactly.
    expect(px()).toMatch(/^1050 × 709 px/);

    await ue.selectOptions(screen.getByTestId('exp-dpi'), '600');
    expect(px()).toMatch(/^2100 × 1417 px/); // 2.362 in × 600 = 1417.2 -> 1417

    await ue.click(screen.getByTestId('exp-unit-mm'));
    await ue.click(screen.getByTestId('exp-preset-double'));
    expect((screen.getByTestId('exp-width') as HTMLInputElement).value).toBe('178');
    expect(px()).toMatch(/^4205 × /); // 178 / 25.4 × 600 = 4204.7 -> 4205

    await retype(ue, screen.getByTestId('exp-width'), '5');
    expect(screen.getByTestId('exp-width-error').textContent).toBe('The width must be between 10 mm and 1000 mm.');
    // The Export button stays where it was, disabled, and says why.
    expect((screen.getByTestId('exp-submit') as HTMLButtonElement).disabled).toBe(true);
    expect(screen.getByTestId('exp-blocked').textContent).toBe('Export waits for a valid width and height (see the fields above).');

    // Too many pixels: the limit of libs/contracts, in the server's words, before anything is sent.
    await retype(ue, screen.getByTestId('exp-width'), '1000');
    await retype(ue, screen.getByTestId('exp-height'), '1000');
    await ue.selectOptions(screen.getByTestId('exp-dpi'), '1200');
    expect(screen.getByTestId('exp-blocked').textContent).toBe(
      'Cannot export: 1000 × 1000 mm at 1200 dpi is 47244 × 47244 px; the largest raster export is 20000 px a side and 64 megapixels (choose a lower dpi or a smaller size).',
    );
    expect((screen.getByTestId('exp-submit') as HTMLButtonElement).disabled).toBe(true);
    await retype(ue, screen.getByTestId('exp-width'), '120');
    await retype(ue, screen.getByTestId('exp-height'), '80');
    expect(screen.queryByTestId('exp-blocked')).toBeNull();
    // The button names what it makes: kind, size and dpi, and the preflight's failures (this figure has no mesh yet,
    // so no alt text: one rule fails).
    expect(screen.getByTestId('exp-submit').textContent).toBe('Export PNG · 120 × 80 mm · 1200 dpi (preflight: 1 failing)');
  }, 60_000);

  it('posts the PNG export, follows the job and offers the new file; a missing route reads plainly', async () => {
    const { sseStream, job } = await import('../test/figures');
    const stream = sseStream();
    const api = mockFetch({
      ...signedInRoutes(me),
      'POST /api/figures/f1/exports': () => json(202, { jobId: 'j7' }),
      'GET /api/jobs/j7/events': () => stream.response,
      ...profileRoute(),
    });
    const ue = openExportForm(89);
    await ue.click(await screen.findByTestId('exp-transparent'));
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
    const ue = openExportForm(89);
    // No delivery-profile route either: the dialog says so and offers the default profile's choices.
    expect((await screen.findByTestId('exp-profile-error')).textContent).toContain('default profile');
    await ue.selectOptions(screen.getByTestId('exp-format'), 'bundle');
    await ue.click(screen.getByTestId('exp-submit'));
    expect((await screen.findByTestId('exp-server-error')).textContent).toContain('No mock for POST /api/figures/f1/exports');
  });
});

describe('Export dialog: the delivery profile first, the preflight before export', () => {
  it('offers the profile\'s formats, columns, dpi, colour and press condition first; the planned file is preflighted before anything is sent', async () => {
    const api = mockFetch({
      ...signedInRoutes(me),
      ...profileRoute({ ...DEFAULT_DELIVERY_PROFILE, publicationId: 'p1', isDefault: false, updatedAt: null, updatedBy: null, pressCondition: 'gracol', columnWidthsMm: [{ name: 'text', widthMm: 84 }, { name: 'full page', widthMm: 174 }] }),
      'POST /api/figures/f1/exports': () => json(202, { jobId: 'j9' }),
    });
    const ue = openExportForm(84);
    const format = (await screen.findByTestId('exp-format')) as HTMLSelectElement;
    // The profile lists TIFF, PNG, then PDF and SVG: in that order, TIFF chosen.
    expect(Array.from(format.options).map((o) => o.value).slice(0, 6)).toEqual(['tiff', 'png', 'pdf-radial', 'pdf-section', 'svg-radial', 'svg-section']);
    expect(format.value).toBe('tiff');
    expect((screen.getByTestId('exp-colour') as HTMLSelectElement).value).toBe('cmyk');
    expect((screen.getByTestId('exp-press') as HTMLSelectElement).value).toBe('gracol');
    expect(screen.getByTestId('exp-preset-text').textContent).toBe('text 84 mm');
    expect(screen.getByTestId('exp-preset-full-page').textContent).toBe('full page 174 mm');
    // The canvas asks 300 dpi, the profile at least 600: the dialog starts at 600. 84 mm / 25.4 × 600 = 1984.25 -> 1984.
    expect((screen.getByTestId('exp-dpi') as HTMLSelectElement).value).toBe('600');
    expect(screen.getByTestId('exp-pixels').textContent).toMatch(/^1984 × 1417 px/);

    // Preflight of the planned file: every rule, each with its verdict; the figure has no mesh yet, so no alt text.
    const pf = screen.getByTestId('exp-preflight');
    const rows = () => Object.fromEntries(within(screen.getByTestId('exp-preflight')).getAllByTestId('preflight-row').map((r) => [r.getAttribute('data-rule'), r.getAttribute('data-status')]));
    expect(Object.keys(rows())).toHaveLength(10);
    expect(rows()).toMatchObject({ format: 'pass', size: 'pass', resolution: 'pass', column_width: 'pass', colour_mode: 'pass', icc_profile: 'pass', fonts_embedded: 'pass', alt_text: 'fail' });
    expect(pf.textContent).toContain('compute the mesh first');

    // 300 dpi and 200 mm: below the profile's minimum and wider than its widest column; the button says so.
    await ue.selectOptions(screen.getByTestId('exp-dpi'), '300');
    await retype(ue, screen.getByTestId('exp-width'), '200');
    expect(rows()).toMatchObject({ resolution: 'fail', column_width: 'fail' });
    expect(within(screen.getByTestId('exp-preflight')).getByText(/wider than every column: it would be reduced to 174 mm \(87%\)/)).toBeTruthy();
    expect(screen.getByTestId('exp-submit').textContent).toMatch(/^Export TIFF · 200 × 60 mm · 300 dpi · CMYK GRACOL \(preflight: \d+ failing\)$/);

    // RGB instead: the colour-mode rule now fails against this CMYK profile.
    await ue.selectOptions(screen.getByTestId('exp-colour'), 'rgb');
    expect(rows()).toMatchObject({ colour_mode: 'fail', icc_profile: 'fail' });
    await ue.selectOptions(screen.getByTestId('exp-colour'), 'cmyk');
    await ue.click(screen.getByTestId('exp-submit'));
    await waitFor(() => expect(api.callsTo('POST', '/api/figures/f1/exports')).toHaveLength(1));
    expect(api.callsTo('POST', '/api/figures/f1/exports')[0].body).toEqual({ format: 'tiff', widthMm: 200, heightMm: 60, dpi: 300, colour: 'cmyk', pressCondition: 'gracol' });

    // A PDF companion: its page and text sizes come from the very plot it will draw.
    await ue.selectOptions(screen.getByTestId('exp-format'), 'pdf-section');
    expect(screen.getByTestId('exp-preflight').getAttribute('data-passed')).not.toBeNull();
    expect(rows()).toMatchObject({ size: 'pass', fonts_embedded: 'pass', colour_mode: 'pass', alt_text: 'pass' });
  }, 60_000);
});
