import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { BatchDto, HouseStyleDto } from '@psiform/contracts';
import { json, mockFetch, renderApp, signedInRoutes, storeSession, user } from '../test/utils';
import { figure, page, recipe2pz, summary } from '../test/figures';
import { batchFraction } from './BatchProgress';

const HOUSE: HouseStyleDto = { publicationId: 'p1', swatchbookId: 's1', swatchbookName: 'Quillmere plates', requireColourSignOff: false, allowOverride: false, updatedAt: '2025-01-01T00:00:00Z' };
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
    createdAt: '2025-02-01T00:00:00Z',
    ...o,
  };
}

const withBook = (id: string, swatchbookId: string | null) => {
  const r = recipe2pz();
  return figure({ id, currentVersion: { ...figure().currentVersion, figureId: id, recipe: { ...r, palette: { ...r.palette, swatchbookId } } } });
};

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
      'GET /api/figures': () =>
        json(
          200,
          page(
            [
              summary(1, { status: 'draft' }),
              summary(2, { status: 'approved' }),
              summary(3, { status: 'changes_requested' }),
              summary(4, { status: 'draft' }),
              summary(5, { status: 'released' }),
              summary(6, { status: 'in_review' }),
            ],
            6,
            1,
            100,
          ),
        ),
      'GET /api/figures/f1': () => json(200, withBook('f1', 's1')),
      'GET /api/figures/f3': () => json(200, withBook('f3', 's1')),
      'GET /api/figures/f4': () => json(200, withBook('f4', null)),
      'POST /api/publications/p1/rerender': () => json(201, batch(0)),
      'GET /api/batches/b1': () => json(200, batch(Math.min(2, ++polls))),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/publications/p1/house-style');
    const button = await screen.findByTestId('rerender');
    await waitFor(() => expect((button as HTMLButtonElement).disabled).toBe(false));
    await ue.click(button);

    const change = await screen.findByTestId('rerender-change');
    expect(within(change).getAllByRole('listitem').map((li) => li.textContent)).toEqual(['Plate 1', 'Plate 3']);
    const skipped = within(screen.getByTestId('rerender-skipped')).getAllByRole('listitem').map((li) => li.textContent);
    expect(skipped).toEqual([
      'Plate 2 — Approved: approved and released figures never change silently',
      'Plate 5 — Released: approved and released figures never change silently',
      'Plate 6 — In review: a proof in review stays as it was submitted',
      'Plate 4 — does not use the pinned swatchbook',
    ]);
    // Approved and released figures are never even opened for the preview.
    expect(api.callsTo('GET', '/api/figures/f2')).toHaveLength(0);
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
});
