import { act, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { vi } from 'vitest';
import type { FigureVersionSummaryDto, ReviewDeskItemDto, VersionComparisonDto } from '@psiform/contracts';
import { json, mockFetch, renderApp, signedInRoutes, storeSession, user, type Handler } from '../test/utils';
import { figure, PROOF_IMAGE, versionSummary } from '../test/figures';
import { BLINK_MS, defaultPair } from './ComparePanel';
import { onePixelWidth } from './ProofImage';
import { printFacts, reviewDeskPath } from './proofApi';
import { filterFromSearch } from './ReviewDeskPage';

vi.mock('../viewport/FigureViewport', () => ({ default: () => <div data-testid="viewport-probe" /> }));

const v1 = versionSummary(1, { image: { ...PROOF_IMAGE, assetId: 'png-1' } });
const v2 = versionSummary(2, { current: true, image: null });
const comparison = (a: FigureVersionSummaryDto, b: FigureVersionSummaryDto): VersionComparisonDto => ({
  figureId: 'f1',
  from: a,
  to: b,
  changes: [
    { path: 'surface', what: 'surface', from: '90%', to: '95%' },
    { path: 'stage.lights.key.intensity', what: 'key light', from: '2.2', to: '2.7' },
  ],
  summary: 'surface 90% → 95%; key light 2.2 → 2.7',
});

function routes(versions: FigureVersionSummaryDto[], extra: Record<string, Handler> = {}) {
  const me = user('editor');
  storeSession(me);
  return mockFetch({
    ...signedInRoutes(me),
    'GET /api/figures/f1': () => json(200, figure({ status: 'in_review' })),
    'GET /api/figures/f1/comments': () => json(200, []),
    'GET /api/figures/f1/audit': () => json(200, []),
    'GET /api/figures/f1/versions': () => json(200, versions),
    'GET /api/figures/f1/compare': ({ url }) => {
      const q = new URL(url, 'http://x').searchParams;
      const pick = (n: string | null) => versions.find((v) => String(v.number) === n)!;
      return json(200, comparison(pick(q.get('from')), pick(q.get('to'))));
    },
    'GET /api/assets/png-1/link': () => json(200, { url: 'http://storage.test/v1.png', expiresAt: '2030-01-01T00:00:00Z' }),
    'GET /api/assets/png-2/link': () => json(200, { url: 'http://storage.test/v2.png', expiresAt: '2030-01-01T00:00:00Z' }),
    ...extra,
  });
}

describe('compare helpers', () => {
  it('default pair is the version before the newest against the newest; one version compares with itself', () => {
    expect(defaultPair([v2, v1])).toEqual([1, 2]);
    expect(defaultPair([versionSummary(1, { current: true })])).toEqual([1, 1]);
  });
  it('print facts and 1:1 pixel width', () => {
    expect(printFacts(PROOF_IMAGE)).toBe('89 × 60 mm at 300 dpi (1051 × 709 px)');
    expect(onePixelWidth(1051, 2)).toBe(525.5);
    expect(onePixelWidth(1051, 0)).toBe(1051);
  });
  it('desk filters: URL in, API path out', () => {
    const f = filterFromSearch(new URLSearchParams('publication=p2&state=approved&age=72'));
    expect(f).toEqual({ publicationId: 'p2', state: 'approved', minAgeHours: 72 });
    expect(reviewDeskPath(f)).toBe('/api/review-desk?publicationId=p2&state=approved&minAgeHours=72');
    expect(filterFromSearch(new URLSearchParams('state=draft&age=5'))).toEqual({ publicationId: undefined, state: 'in_review', minAgeHours: undefined });
    expect(reviewDeskPath({ state: 'in_review' })).toBe('/api/review-desk');
  });
});

describe('proof page: compare versions', () => {
  it('lists the recipe changes in words and shows the two versions side by side; a missing image can be rendered', async () => {
    const api = routes([v2, v1], { 'POST /api/figures/f1/versions/2/render': () => json(201, { jobId: 'j1' }) });
    renderApp('/figures/f1/proof');
    const panel = await screen.findByTestId('compare-panel');
    const changes = await within(panel).findAllByTestId('compare-change');
    expect(changes.map((c) => c.textContent)).toEqual(['surface 90% → 95%', 'key light 2.2 → 2.7']);
    expect(api.calls.some((c) => c.url.endsWith('/api/figures/f1/compare?from=1&to=2'))).toBe(true);
    expect((await within(panel).findByTestId('compare-img-a')).getAttribute('src')).toBe('http://storage.test/v1.png');
    expect(within(panel).getByTestId('compare-missing-b').textContent).toContain('Version 2 has no print image yet.');
    await userEvent.setup().click(within(panel).getByTestId('compare-render-b'));
    await waitFor(() => expect(api.callsTo('POST', '/api/figures/f1/versions/2/render')).toHaveLength(1));
  });

  it('swaps the versions, and the overlay modes need both images', async () => {
    const api = routes([v2, v1]);
    renderApp('/figures/f1/proof');
    const ev = userEvent.setup();
    await screen.findAllByTestId('compare-change');
    await ev.click(screen.getByTestId('compare-swap'));
    await waitFor(() => expect(api.calls.some((c) => c.url.endsWith('/compare?from=2&to=1'))).toBe(true));
    await ev.click(screen.getByTestId('compare-mode-slider'));
    expect((await screen.findByTestId('compare-overlay-needs-images')).textContent).toContain('needs a print image of both versions');
  });

  it('slider uncovers the later version; blink alternates the two and can hold', async () => {
    routes([versionSummary(2, { current: true, image: { ...PROOF_IMAGE, assetId: 'png-2' } }), v1]);
    renderApp('/figures/f1/proof');
    const ev = userEvent.setup();
    await screen.findAllByTestId('compare-change');
    await ev.click(screen.getByTestId('compare-mode-slider'));
    const top = await screen.findByTestId('compare-slider-top');
    expect(top.getAttribute('src')).toBe('http://storage.test/v2.png');
    expect(top.style.clipPath).toBe('inset(0 50% 0 0)');
    const range = screen.getByTestId('compare-slider-range');
    await act(async () => {
      const setter = Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, 'value')!.set!;
      setter.call(range, '80');
      range.dispatchEvent(new Event('input', { bubbles: true }));
    });
    expect(top.style.clipPath).toBe('inset(0 20% 0 0)');

    vi.useFakeTimers({ shouldAdvanceTime: true });
    try {
      await ev.click(screen.getByTestId('compare-mode-blink'));
      const img = await screen.findByTestId('compare-blink-img');
      expect(img.getAttribute('src')).toBe('http://storage.test/v1.png');
      await act(async () => void vi.advanceTimersByTime(BLINK_MS + 10));
      expect(screen.getByTestId('compare-blink-img').getAttribute('src')).toBe('http://storage.test/v2.png');
      expect(screen.getByTestId('compare-blink-label').textContent).toBe('Version 2');
      fireClick(screen.getByTestId('compare-blink-toggle'));
      await act(async () => void vi.advanceTimersByTime(BLINK_MS * 3));
      expect(screen.getByTestId('compare-blink-img').getAttribute('src')).toBe('http://storage.test/v2.png');
    } finally {
      vi.useRealTimers();
    }
  });

  it('a colour override on the figure is shown on its proof', async () => {
    routes([v2, v1], {
      'GET /api/figures/f1/audit': () =>
        json(200, [{ id: 'a1', figureId: 'f1', actorId: 'u', actorName: 'Ada Vane', action: 'colour_override', fromStatus: 'in_review', toStatus: 'in_review', note: 'colour checks overridden: duotone print', at: '2025-03-01T10:00:00.000Z' }]),
    });
    renderApp('/figures/f1/proof');
    const note = await screen.findByTestId('proof-colour-override');
    expect(note.textContent).toContain('Colour checks overridden');
    expect(note.textContent).toContain('Ada Vane');
    expect(note.textContent).toContain('colour checks overridden: duotone print');
  });

  it('states print size, dpi and colour mode of the image under review and zooms to 1:1 print pixels', async () => {
    routes([versionSummary(2, { current: true, image: { ...PROOF_IMAGE, assetId: 'png-2' } }), v1]);
    renderApp('/figures/f1/proof');
    expect((await screen.findByTestId('proof-print-size')).textContent).toBe('89 × 60 mm at 300 dpi (1051 × 709 px)');
    expect(screen.getByTestId('proof-colour-mode').textContent).toBe('RGB, sRGB (IEC 61966-2-1)');
    const img = await screen.findByTestId('proof-img');
    expect(img.style.width).toBe('');
    await userEvent.setup().click(screen.getByTestId('proof-zoom-pixels'));
    expect(screen.getByTestId('proof-scroll').dataset.zoom).toBe('pixels');
    expect(screen.getByTestId('proof-img').style.width).toBe(`${1051 / (window.devicePixelRatio || 1)}px`);
  });
});

function fireClick(el: HTMLElement) {
  act(() => el.click());
}

describe('review desk filters', () => {
  const item = (o: Partial<ReviewDeskItemDto>): ReviewDeskItemDto => ({
    figureId: 'f1',
    title: 'Plate 1',
    status: 'in_review',
    publicationId: 'p1',
    publicationTitle: 'Shapes of the Electron Cloud',
    versionNumber: 2,
    submittedBy: 'Ilse Marwick',
    submittedAt: '2025-02-01T10:00:00.000Z',
    ageHours: 30,
    editorApproved: false,
    colourSignedOff: false,
    requireColourSignOff: false,
    ...o,
  });

  it('sends publication, state and age to the server, keeps them in the URL, and says when nothing matches', async () => {
    const me = user('editor');
    storeSession(me);
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/review-desk': ({ url }) => (url.includes('state=changes_requested') ? json(200, []) : json(200, [item({})])),
    });
    renderApp('/review');
    expect((await screen.findByTestId('desk-state')).textContent).toBe('In review');
    const ev = userEvent.setup();
    await waitFor(() => expect(screen.getByTestId('desk-filter-publication').querySelectorAll('option')).toHaveLength(3));
    await ev.selectOptions(screen.getByTestId('desk-filter-publication'), 'p2');
    await ev.selectOptions(screen.getByTestId('desk-filter-age'), '24');
    await waitFor(() => expect(api.calls.at(-1)!.url).toContain('/api/review-desk?publicationId=p2&minAgeHours=24'));
    await ev.selectOptions(screen.getByTestId('desk-filter-state'), 'changes_requested');
    expect((await screen.findByTestId('review-desk-empty')).textContent).toContain('No proofs match');
    expect(api.calls.at(-1)!.url).toContain('publicationId=p2&state=changes_requested&minAgeHours=24');
  });
});
