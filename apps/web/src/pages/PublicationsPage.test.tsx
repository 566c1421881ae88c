import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { json, mockFetch, PUBLICATIONS, renderApp, signedInRoutes, storeSession, user } from '../test/utils';

describe('publications page', () => {
  it('renders the list fetched with the Bearer token', async () => {
    const me = user('illustrator');
    const api = mockFetch(signedInRoutes(me));
    storeSession(me);
    renderApp('/publications');

    expect(screen.getByTestId('publications-loading')).toBeTruthy();
    const cards = await screen.findAllByTestId('publication-card');
    expect(cards).toHaveLength(2);

    const first = within(cards[0]);
    expect(first.getByTestId('publication-title').textContent).toBe('Shapes of the Electron Cloud');
    expect(first.getByTestId('publication-publisher').textContent).toBe('Quillmere Press');
    expect(first.getByTestId('publication-kind').textContent).toBe('Book');
    expect(first.getByTestId('publication-description').textContent).toBe(
      'A first-year text with full-page orbital plates.',
    );
    const second = within(cards[1]);
    expect(second.getByTestId('publication-title').textContent).toBe(PUBLICATIONS[1].title);
    expect(second.getByTestId('publication-kind').textContent).toBe('Journal volume');
    expect(second.queryByTestId('publication-description')).toBeNull(); // empty description: no blank paragraph

    const [call] = api.callsTo('GET', '/api/publications');
    expect(call.headers.get('Authorization')).toBe('Bearer tok-1');
    expect(screen.queryByTestId('publications-loading')).toBeNull();
  });

  it('shows the empty state when the user belongs to no publication', async () => {
    const me = user('editor');
    mockFetch(signedInRoutes(me, []));
    storeSession(me);
    renderApp('/publications');
    const empty = await screen.findByTestId('publications-empty');
    expect(empty.textContent).toContain('No publications yet');
    expect(screen.queryByTestId('publication-card')).toBeNull();
  });

  it('shows a readable error and recovers on retry', async () => {
    const me = user('illustrator');
    let fail = true;
    mockFetch({
      ...signedInRoutes(me),
      'GET /api/publications': () =>
        fail
          ? json(503, { statusCode: 503, message: 'database unavailable', error: 'Service Unavailable' })
          : json(200, PUBLICATIONS.slice(0, 1)),
    });
    storeSession(me);
    renderApp('/publications');
    const error = await screen.findByTestId('publications-error');
    expect(error.textContent).toContain('Publications could not be loaded');
    expect(error.textContent).toContain('HTTP 503');
    fail = false;
    await userEvent.setup().click(within(error).getByRole('button', { name: /Try again/ }));
    expect(await screen.findAllByTestId('publication-card')).toHaveLength(1);
    expect(screen.queryByTestId('publications-error')).toBeNull();
  });
});
