import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { BatchDto, HouseStyleDto, HouseStyleImpactDto, HouseStyleImpactFigureDto } from '@psiform/contracts';
import { json, mockFetch, renderApp, signedInRoutes, storeSession, user } from '../test/utils';

import { batchFraction } from './BatchProgress';

const HOUSE: HouseStyleDto = { publicationId: 'p1', swatchbookId: 's1', swatchbookName: 'Quillmere plates', requireColourSignOff: false, allowOverride: false, updatedAt: '2025-01-01T00:00:00Z', colourOverride: null };
const BOOKS = [
  { id: 's1', name: 'Quillmere plates', ownerId: 'u', publicationId: 'p1', publisher: null, colors: { positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#222222' }, locked: true, version: 4, createdAt: '', updatedAt: '' },
  { id: 's2', name: 'Fenwright journal', ownerId: 'u', publicationId: 'p1', publisher: null, colors: { positive: '#b5452f', negative: '#2f6690', background: '#ffffff', label: '#222222' }, locked: false, version: 1, createdAt: '', updatedAt: '' },
];

function batch(completed: number, o: Partial<BatchDto> = {}): BatchDto {
  return {
    batchId: 'b1',
    publicationId: 'p1',
    swatchbookId: 's1',
    swatchbookVersion: 4,
    total: 2,
    completed,
    failed: 0,
    state: completed === 2 ? 'completed' : 'running',
    jobs: [
      { figureId: 'f1', title: 'Plate 1', status: 'queued', jobState: completed >= 1 ? 'completed' : 'active' },
      { figureId: 'f3', title: 'Plate 3', status: 'queued', jobState: completed >= 2 ? 'completed' : 'queued' },
    ],
    skipped: [],
    overrideReason: null,
    createdAt: '2025-02-01T00:00:00Z',
    ...o,
  };
}

const impactFigure = (i: number, o: Partial<HouseStyleImpactFigureDto>): HouseStyleImpactFigureDto => ({
  figureId: `f${i}`,
  title: `Plate ${i}`,
  status: 'draft',
  versionNumber: 1,
  usesSwatchbook: true,
  changes: [],
  effect: 'kept',
  reason: '',
  affected: true,
  ...o,
});

const FAILURE = 'positive and negative phases differ by ΔE00 2.9 under simulated deuteranopia (Machado et al. 2009)';

function impact(mode: 'pin' | 'rerender', figures: HouseStyleImpactFigureDto[], failures: string[] = []): HouseStyleImpactDto {
  return { publicationId: 'p1', for: mode, swatchbook: { id: 's2', name: 'Fenwright journal', version: 1 }, gate: { name: 'colour checks', failures, warnings: [], blocks: failures.length > 0 }, figures };
}

/** Signs `me` in, opens the house-style page and clicks "Re-render affected figures" once it is enabled. */
async function openRerender(me: ReturnType<typeof user>) {
  storeSession(me);
  const ue = userEvent.setup();
  renderApp('/publications/p1/house-style');
  const button = await screen.findByTestId('rerender');
  await waitFor(() => expect((button as HTMLButtonElement).disabled).toBe(false));
  await ue.click(button);
  return ue;
}

describe('batchFraction', () => {
  it('counts finished (completed or failed) jobs; an empty batch is complete', () => {
    expect(batchFraction({ total: 4, completed: 1, failed: 1 })).toBe(0.5);
    expect(batchFraction({ total: 0, completed: 0, failed: 0 })).toBe(1);
  });
});

describe('house style panel', () => {
  it('art director pins a swatchbook and sets the sign-off rule', async () => {
    const me = user('art_director');
    let saved: HouseStyleDto | null = null;
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/swatchbooks': () => json(200, BOOKS),
      'GET /api/publications/p1/house-style/impact': () =>
        json(200, impact('pin', [impactFigure(1, { effect: 'next_save', changes: [{ path: 'palette.positive', what: 'positive phase colour', from: '#c8553d', to: '#b5452f' }], reason: 'Draft: takes these colours at its next save' }), impactFigure(2, { status: 'approved', reason: 'Approved: keeps the colours it has until a new version' })])),
      'PUT /api/publications/p1/house-style': ({ body }) => {
        const b = body as HouseStyleDto;
        saved = { ...HOUSE, ...b, swatchbookName: 'Fenwright journal' };
        return json(200, saved);
      },
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/publications/p1/house-style');
    expect(await screen.findByTestId('house-style-none')).toBeTruthy();
    expect((screen.getByTestId('rerender') as HTMLButtonElement).disabled).toBe(true); // nothing pinned yet
    await waitFor(() => expect(within(screen.getByTestId('hs-swatchbook')).getAllByRole('option')).toHaveLength(3));
    await ue.selectOptions(screen.getByTestId('hs-swatchbook'), 's2');
    await ue.click(screen.getByText("Require an art director's colour sign-off before approval"));
    await ue.click(screen.getByTestId('hs-save'));
    // A confirmation first, listing the figures the pin affects.
    const confirm = await screen.findByTestId('pin-confirm');
    expect(within(confirm).getAllByTestId('impact-figure').map((li) => li.textContent)).toEqual(['Plate 1 (Draft, v1) — positive phase colour #c8553d → #b5452f']);
    expect(within(screen.getByTestId('impact-kept')).getByRole('listitem').textContent).toBe('Plate 2 — Approved: keeps the colours it has until a new version');
    expect(api.calls.some((c) => c.url.endsWith('/impact?for=pin&swatchbookId=s2'))).toBe(true);
    expect(api.callsTo('PUT', '/api/publications/p1/house-style')).toHaveLength(0);
    await ue.click(screen.getByTestId('pin-confirm-submit'));
    await waitFor(() => expect(api.callsTo('PUT', '/api/publications/p1/house-style')).toHaveLength(1));
    expect(api.callsTo('PUT', '/api/publications/p1/house-style')[0].body).toEqual({ swatchbookId: 's2', requireColourSignOff: true, allowOverride: false });
    await waitFor(() => expect(screen.queryByTestId('house-style-none')).toBeNull());
  });

  it('an editor reads the house style without controls', async () => {
    const me = user('editor');
    mockFetch({ ...signedInRoutes(me), 'GET /api/publications/p1/house-style': () => json(200, { ...HOUSE, requireColourSignOff: true }), 'GET /api/swatchbooks': () => json(200, BOOKS) });
    storeSession(me);
    renderApp('/publications/p1/house-style');
    const s = await screen.findByTestId('house-style-summary');
    expect(s.textContent).toContain('Quillmere plates');
    expect(s.textContent).toContain('colour sign-off');
    expect(screen.queryByTestId('rerender')).toBeNull();
  });

  it('confirms what a re-render changes and skips, then follows the batch to 100%', async () => {
    const me = user('art_director');
    let polls = 0;
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/publications/p1/house-style': () => json(200, HOUSE),
      'GET /api/swatchbooks': () => json(200, BOOKS),
      'GET /api/publications/p1/house-style/impact': () =>
        json(
          200,
          impact('rerender', [
            impactFigure(1, { effect: 'rerender' }),
            impactFigure(2, { status: 'approved', reason: 'status is approved: only draft and changes_requested figures are re-rendered' }),
            impactFigure(3, { status: 'changes_requested', effect: 'rerender' }),
            impactFigure(4, { usesSwatchbook: false, reason: 'does not use the pinned swatchbook' }),
          ]),
        ),
      'POST /api/publications/p1/rerender': () => json(201, batch(0)),
      'GET /api/batches/b1': () => json(200, batch(Math.min(2, ++polls))),
    });
    const ue = await openRerender(me);

    const change = await screen.findByTestId('rerender-change');
    expect(within(change).getAllByRole('listitem').map((li) => li.textContent)).toEqual(['Plate 1 (Draft, v1)', 'Plate 3 (Changes requested, v1)']);
    const skipped = within(screen.getByTestId('rerender-skipped')).getAllByRole('listitem').map((li) => li.textContent);
    expect(skipped).toEqual(['Plate 2 — status is approved: only draft and changes_requested figures are re-rendered', 'Plate 4 — does not use the pinned swatchbook']);
    expect(api.callsTo('POST', '/api/publications/p1/rerender')).toHaveLength(0);

    await ue.click(screen.getByTestId('rerender-confirm'));
    const progress = await screen.findByTestId('batch-progress');
    await waitFor(() => expect(progress.getAttribute('data-state')).toBe('completed'), { timeout: 8000 });
    expect(screen.getByTestId('batch-progress-bar').getAttribute('aria-valuenow')).toBe('100');
    expect(screen.getByTestId('batch-percent').textContent).toBe('100%');
    expect(screen.getByTestId('batch-counts').textContent).toBe('2 of 2 re-rendered');
    expect(screen.getByTestId('batch-done')).toBeTruthy();
    expect(api.callsTo('POST', '/api/publications/p1/rerender')).toHaveLength(1);
    const afterDone = api.callsTo('GET', '/api/batches/b1').length;
    expect(afterDone).toBeGreaterThanOrEqual(2); // polled through 50% to 100%
    await new Promise((r) => setTimeout(r, 1800));
    expect(api.callsTo('GET', '/api/batches/b1').length).toBe(afterDone); // stops polling once done
  }, 15_000);

  it('a failing swatchbook: the pin is blocked until the art director writes a reason; the reason is sent as override and shown', async () => {
    const me = user('art_director');
    const failing = impact('pin', [impactFigure(1, { effect: 'next_save', reason: 'Draft: takes these colours at its next save' })], [FAILURE]);
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/swatchbooks': () => json(200, BOOKS),
      'GET /api/publications/p1/house-style/impact': () => json(200, failing),
      'PUT /api/publications/p1/house-style': ({ body }) =>
        json(200, { ...HOUSE, swatchbookId: 's2', swatchbookName: 'Fenwright journal', colourOverride: { reason: (body as { override: { reason: string } }).override.reason, byName: 'Test art_director', at: '2025-03-01T10:00:00Z', failures: [FAILURE], swatchbookVersion: 1 } }),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/publications/p1/house-style');
    await waitFor(() => expect(within(screen.getByTestId('hs-swatchbook')).getAllByRole('option')).toHaveLength(3));
    await ue.selectOptions(screen.getByTestId('hs-swatchbook'), 's2');
    await ue.click(screen.getByTestId('hs-save'));
    expect((await screen.findByTestId('impact-blocked')).textContent).toContain('Pinning is blocked by failing colour checks');
    expect(screen.getByTestId('colour-override-failures').textContent).toContain('under simulated deuteranopia');
    expect(screen.queryByTestId('pin-confirm-submit')).toBeNull(); // no way round it without a reason
    const submit = screen.getByTestId('colour-override-submit') as HTMLButtonElement;
    expect(submit.disabled).toBe(true);
    await ue.type(screen.getByTestId('colour-override-reason'), 'too short');
    expect(screen.getByTestId('colour-override-short').textContent).toContain('At least 10 characters');
    await ue.clear(screen.getByTestId('colour-override-reason'));
    await ue.type(screen.getByTestId('colour-override-reason'), 'Printed as a duotone with hatching');
    await ue.click(submit);
    await waitFor(() => expect(api.callsTo('PUT', '/api/publications/p1/house-style')).toHaveLength(1));
    expect(api.callsTo('PUT', '/api/publications/p1/house-style')[0].body).toEqual({ swatchbookId: 's2', requireColourSignOff: false, allowOverride: false, override: { reason: 'Printed as a duotone with hatching' } });
    expect((await screen.findByTestId('house-style-override')).textContent).toContain('“Printed as a duotone with hatching”');
  });

  it('a 409 from the gate (checks changed meanwhile) opens the reason form for the re-render', async () => {
    const me = user('art_director');
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/publications/p1/house-style': () => json(200, HOUSE),
      'GET /api/swatchbooks': () => json(200, BOOKS),
      'GET /api/publications/p1/house-style/impact': () => json(200, impact('rerender', [impactFigure(1, { effect: 'rerender' })])),
      'POST /api/publications/p1/rerender': ({ body }) =>
        (body as { override?: unknown }).override
          ? json(201, batch(2, { overrideReason: 'ok' }))
          : json(409, { statusCode: 409, error: 'Conflict', gate: 'colour checks', message: `colour checks failed (1 failure): ${FAILURE}`, failures: [FAILURE], overridable: true }),
      'GET /api/batches/b1': () => json(200, batch(2)),
    });
    const ue = await openRerender(me);
    await ue.click(await screen.findByTestId('rerender-confirm'));
    expect((await screen.findByTestId('colour-override-failures')).textContent).toContain('deuteranopia');
    await ue.type(screen.getByTestId('colour-override-reason'), 'Screen-only edition of the plates');
    await ue.click(screen.getByTestId('colour-override-submit'));
    await screen.findByTestId('batch-progress');
    expect(api.callsTo('POST', '/api/publications/p1/rerender').map((c) => c.body)).toEqual([{}, { override: { reason: 'Screen-only edition of the plates' } }]);
  });
});
