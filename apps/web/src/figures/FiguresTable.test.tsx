import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { json, mockFetch, PUBLICATIONS, renderApp, signedInRoutes, storeSession, user } from '../test/utils';
import { page, summary } from '../test/figures';

function query(url: string): Record<string, string> {
  return Object.fromEntries(new URL(url, 'http://x').searchParams.entries());
}

describe('library: the figures table', () => {
  it('renders the rows of the first publication with our proof-state words', async () => {
    const me = user('illustrator');
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/figures': () =>
        json(
          200,
          page(
            [
              summary(1, { title: 'Plate 1: 2p_z', label: '2p_z', status: 'in_review', versionNumber: 3, ownerName: 'Ada Quill' }),
              summary(2, { title: 'Plate 2: 3d_xy', label: '3d_xy', status: 'changes_requested', ownerName: undefined, ownerId: 'u-9' }),
            ],
            2,
          ),
        ),
    });
    storeSession(me);
    renderApp('/library');

    const rows = await screen.findAllByTestId('figure-row');
    expect(rows).toHaveLength(2);
    const r1 = within(rows[0]);
    expect(r1.getByTestId('figure-title').textContent).toBe('Plate 1: 2p_z');
    expect(r1.getByTestId('figure-title').getAttribute('href')).toBe('/figures/f1');
    expect(r1.getByTestId('figure-label').textContent).toBe('2pz'); // typeset: 2p with a subscript z
    expect(r1.getByTestId('figure-label').querySelector('sub')?.textContent).toBe('z');
    expect(r1.getByTestId('figure-status').textContent).toBe('In review');
    expect(r1.getByTestId('figure-owner').textContent).toBe('Ada Quill');
    expect(r1.getByTestId('figure-version').textContent).toBe('v3');
    const r2 = within(rows[1]);
    expect(r2.getByTestId('figure-status').textContent).toBe('Changes requested');
    expect(r2.getByTestId('figure-owner').textContent).toBe('u-9'); // no name sent: the id, not a blank

    const [call, ...more] = api.calls.filter((c) => c.url.startsWith('/api/figures?'));
    expect(more).toEqual([]);
    expect(query(call.url)).toEqual({ publicationId: 'p1', page: '1', pageSize: '25', sort: 'updatedAt', order: 'desc' });
    expect(call.headers.get('Authorization')).toBe('Bearer tok-1');
    // Two publications: the chooser is offered; the library names the current one.
    expect(screen.getByTestId('library-publication').textContent).toBe(PUBLICATIONS[0].title);
    expect(screen.getByTestId('publication-chooser')).toBeTruthy();
  });

  it('pages, searches, filters and sorts through the query string', async () => {
    const me = user('editor');
    const seen: Record<string, string>[] = [];
    mockFetch({
      ...signedInRoutes(me),
      'GET /api/figures': ({ url }) => {
        const q = query(url);
        seen.push(q);
        const p = Number(q.page);
        const total = q.q ? 1 : 60;
        const count = q.q ? 1 : Math.min(25, total - (p - 1) * 25);
        return json(200, page(Array.from({ length: count }, (_, i) => summary((p - 1) * 25 + i + 1)), total, p));
      },
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/library');

    await screen.findAllByTestId('figure-row');
    expect(screen.getByTestId('figures-page-info').textContent).toBe('1–25 of 60 · page 1 of 3');
    expect((screen.getByTestId('figures-prev') as HTMLButtonElement).disabled).toBe(true);

    await ue.click(screen.getByTestId('figures-next'));
    await waitFor(() => expect(screen.getByTestId('figures-page-info').textContent).toBe('26–50 of 60 · page 2 of 3'));
    expect(seen.at(-1)).toMatchObject({ page: '2', pageSize: '25', publicationId: 'p1' });
    expect(within(screen.getAllByTestId('figure-row')[0]).getByTestId('figure-title').textContent).toBe('Plate 26');

    await ue.click(screen.getByTestId('figures-next'));
    await waitFor(() => expect(screen.getByTestId('figures-page-info').textContent).toBe('51–60 of 60 · page 3 of 3'));
    expect((screen.getByTestId('figures-next') as HTMLButtonElement).disabled).toBe(true);

    // Search: sent once typing pauses, and back on page 1.
    await ue.type(screen.getByTestId('figures-search'), 'dxy');
    await waitFor(() => expect(seen.at(-1)).toMatchObject({ q: 'dxy', page: '1' }));
    expect(seen.filter((q) => q.q && q.q !== 'dxy')).toEqual([]); // no request per keystroke
    await waitFor(() => expect(screen.getByTestId('figures-page-info').textContent).toBe('1–1 of 1 · page 1 of 1'));

    // Status filter.
    await ue.selectOptions(screen.getByTestId('figures-status'), 'approved');
    await waitFor(() => expect(seen.at(-1)).toMatchObject({ q: 'dxy', status: 'approved', page: '1' }));

    // Sorting: a new column starts ascending, a second click flips it.
    await ue.click(screen.getByTestId('sort-title'));
    await waitFor(() => expect(seen.at(-1)).toMatchObject({ sort: 'title', order: 'asc' }));
    await ue.click(screen.getByTestId('sort-title'));
    await waitFor(() => expect(seen.at(-1)).toMatchObject({ sort: 'title', order: 'desc' }));
    expect(screen.getByTestId('sort-title').closest('th')?.getAttribute('aria-sort')).toBe('descending');
  });

  it('switches publication with the chooser', async () => {
    const me = user('illustrator');
    const seen: string[] = [];
    mockFetch({
      ...signedInRoutes(me),
      'GET /api/figures': ({ url }) => {
        seen.push(query(url).publicationId);
        return json(200, page([summary(1, { title: `Figure of ${query(url).publicationId}` })], 1));
      },
    });
    storeSession(me);
    renderApp('/library');
    await screen.findAllByTestId('figure-row');
    await userEvent.setup().selectOptions(screen.getByTestId('publication-chooser'), 'p2');
    await waitFor(() => expect(screen.getByTestId('figure-title').textContent).toBe('Figure of p2'));
    expect(seen).toEqual(['p1', 'p2']);
    expect(screen.getByTestId('library-publication').textContent).toBe(PUBLICATIONS[1].title);
  });

  it('opens from a publication card at /publications/:id/figures', async () => {
    const me = user('art_director');
    mockFetch({
      ...signedInRoutes(me),
      'GET /api/figures': ({ url }) => json(200, page([summary(7, { publicationId: query(url).publicationId })], 1)),
    });
    storeSession(me);
    renderApp('/publications');
    const links = await screen.findAllByTestId('publication-figures');
    await userEvent.setup().click(links[1]);
    expect(screen.getByTestId('location').textContent).toBe('/publications/p2/figures');
    await screen.findAllByTestId('figure-row');
    expect(screen.getByTestId('library-publication').textContent).toBe(PUBLICATIONS[1].title);
    expect(screen.queryByTestId('library-new-figure')).toBeNull(); // only illustrators create
  });

  it('shows the empty and the error states', async () => {
    const me = user('illustrator');
    let fail = true;
    mockFetch({
      ...signedInRoutes(me, [PUBLICATIONS[0]]),
      'GET /api/figures': () =>
        fail
          ? json(500, { statusCode: 500, message: 'Internal server error', error: 'Internal Server Error' })
          : json(200, page([], 0)),
    });
    storeSession(me);
    renderApp('/library');
    const err = await screen.findByTestId('figures-error');
    expect(err.textContent).toContain('could not complete the request (HTTP 500)');
    expect(screen.queryByTestId('publication-chooser')).toBeNull(); // one publication: nothing to choose
    fail = false;
    await userEvent.setup().click(within(err).getByRole('button', { name: /Try again/ }));
    const empty = await screen.findByTestId('figures-empty');
    expect(empty.textContent).toContain('No figures yet');
  });

  it('shows the thumbnail (lazy, sized, alt text from title and label) when the row has a link, a placeholder otherwise', async () => {
    const me = user('editor');
    mockFetch({
      ...signedInRoutes(me),
      'GET /api/figures': () =>
        json(
          200,
          page(
            [
              summary(1, { title: 'Plate 1: 2p_z', label: '2p_z', thumbnailAssetId: 'a-7', thumbnailUrl: 'http://store.test/psiform/thumbs/a-7.png?X-Amz-Signature=ab' }),
              summary(2, { title: 'Plate 2: 3s', label: '3s', thumbnailAssetId: null, thumbnailUrl: null }),
            ],
            2,
          ),
        ),
    });
    storeSession(me);
    renderApp('/library');

    const rows = await screen.findAllByTestId('figure-row');
    const img = within(rows[0]).getByRole('img') as HTMLImageElement;
    expect(img.tagName).toBe('IMG');
    expect(img.getAttribute('src')).toBe('http://store.test/psiform/thumbs/a-7.png?X-Amz-Signature=ab');
    expect(img.getAttribute('alt')).toBe('Plate 1: 2p_z (2pz)'); // the label in plain text, no underscore
    expect(img.getAttribute('loading')).toBe('lazy');
    expect([img.getAttribute('width'), img.getAttribute('height')]).toEqual(['64', '48']);
    expect(within(rows[0]).queryByTestId('figure-thumb-none')).toBeNull();

    const r2 = within(rows[1]);
    expect(r2.queryByTestId('figure-thumb')).toBeNull();
    expect(r2.getByTestId('figure-thumb-none').getAttribute('aria-label')).toBe('No preview yet');
    expect(r2.queryByRole('img', { name: /Plate 2/ })).toBeNull();
  });
});
