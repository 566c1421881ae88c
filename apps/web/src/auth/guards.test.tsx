import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { SESSION_STORAGE_KEY } from './session';
import { json, mockFetch, renderApp, signedInRoutes, storeSession, user, openAs } from '../test/utils';

describe('route guards', () => {
  it('sends an unsigned visitor to /sign-in and fetches nothing private', async () => {
    const api = mockFetch({});
    renderApp('/publications');
    expect(await screen.findByTestId('signin-form')).toBeTruthy();
    expect(screen.getByTestId('location').textContent).toBe('/sign-in');
    expect(api.callsTo('GET', '/api/publications')).toHaveLength(0);
    expect(screen.queryByTestId('masthead')).toBeNull();
  });

  it('returns to the page first asked for after signing in', async () => {
    // /people (an admin page) proves we landed where we first asked: its invitation form shows.
    const me = user('admin');
    mockFetch({
      'POST /api/auth/login': () => json(201, { accessToken: 'tok-1', user: me }),
      ...signedInRoutes(me),
      'GET /api/users': () => json(200, { items: [], total: 0, page: 1, pageSize: 25 }),
    });
    renderApp('/people');
    const u = userEvent.setup();
    await u.type(await screen.findByLabelText('Email'), me.email);
    await u.type(screen.getByLabelText('Password'), 'a-long-password');
    await u.click(screen.getByRole('button', { name: 'Sign in' }));
    await waitFor(() => expect(screen.getByTestId('location').textContent).toBe('/people'));
    expect(await screen.findByTestId('people-page')).toBeTruthy();
  });

  it('shows a 403-style message when the role may not open the page, and keeps the URL', async () => {
    openAs('editor', '/swatchbooks');
    const forbidden = await screen.findByTestId('forbidden');
    expect(forbidden.textContent).toContain('Swatchbooks is not open to your role');
    expect(forbidden.textContent).toContain('for the art director role');
    expect(forbidden.textContent).toContain('403');
    expect(screen.getByTestId('location').textContent).toBe('/swatchbooks');
    expect(screen.queryByTestId('coming-later')).toBeNull();
  });

  it('lets the right role through to the page', async () => {
    openAs('art_director', '/swatchbooks', { 'GET /api/swatchbooks': () => json(200, []) });
    expect((await screen.findByTestId('swatchbooks-page')).textContent).toContain('Swatchbooks');
    expect(screen.queryByTestId('forbidden')).toBeNull();
  });

  it('redirects a signed-in user away from /sign-in', async () => {
    openAs('admin', '/sign-in');
    await waitFor(() => expect(screen.getByTestId('location').textContent).toBe('/publications'));
    expect(screen.queryByTestId('signin-form')).toBeNull();
  });

  it('signs out and returns to sign-in when the API answers 401 to a token', async () => {
    const me = user('illustrator');
    const api = mockFetch({
      'GET /api/auth/me': () => json(401, { statusCode: 401, message: 'Unauthorized', error: 'Unauthorized' }),
      'GET /api/publications': () => json(401, { statusCode: 401, message: 'Unauthorized', error: 'Unauthorized' }),
    });
    storeSession(me, 'expired-token');
    renderApp('/publications');
    expect(await screen.findByTestId('signin-notice')).toBeTruthy();
    expect(screen.getByTestId('signin-notice').textContent).toContain('Your session has ended');
    expect(screen.getByTestId('location').textContent).toBe('/sign-in');
    expect(window.sessionStorage.getItem(SESSION_STORAGE_KEY)).toBeNull();
    const sent = api.calls.filter((c) => c.url.endsWith('/api/auth/me') || c.url.endsWith('/api/publications'));
    expect(sent.length).toBeGreaterThan(0);
    for (const c of sent) expect(c.headers.get('Authorization')).toBe('Bearer expired-token');
  });

  it('ignores a malformed stored session', async () => {
    mockFetch({});
    window.sessionStorage.setItem(SESSION_STORAGE_KEY, JSON.stringify({ accessToken: 'x', user: { role: 'wizard' } }));
    renderApp('/publications');
    expect(await screen.findByTestId('signin-form')).toBeTruthy();
    expect(window.sessionStorage.getItem(SESSION_STORAGE_KEY)).toBeNull();
  });
});
