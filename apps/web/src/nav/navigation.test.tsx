import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { ROLES, type Role } from '@psiform/contracts';
import { SESSION_STORAGE_KEY } from '../auth/session';
import { json, mockFetch, renderApp, signedInRoutes, storeSession, user, openAs } from '../test/utils';
import { navItemsFor } from './navigation';

const EXPECTED: Record<Role, string[]> = {
  illustrator: ['Publications', 'Library', 'Composer', 'Figure sets'],
  editor: ['Publications', 'Library', 'Review desk'],
  art_director: ['Publications', 'Library', 'Review desk', 'Swatchbooks'],
  admin: ['Publications', 'People', 'Manage publications'],
};

describe('role-based navigation', () => {
  it.each(ROLES)('navItemsFor(%s) lists exactly what the role can do', (role) => {
    expect(navItemsFor(role).map((i) => i.label)).toEqual(EXPECTED[role]);
  });

  it.each(ROLES)('the shell shows the %s links, name and role', async (role) => {
    const me = user(role, { displayName: `Rowan ${role}` });
    mockFetch(signedInRoutes(me));
    storeSession(me);
    renderApp('/publications');
    const nav = await screen.findByTestId('main-nav');
    const labels = within(nav)
      .getAllByRole('link')
      .map((a) => a.textContent?.replace(/later$/, '').trim());
    expect(labels).toEqual(EXPECTED[role]);
    expect(screen.getByTestId('user-name').textContent).toBe(`Rowan ${role}`);
    expect(screen.getByTestId('user-role').textContent).toBe(
      { illustrator: 'Illustrator', editor: 'Editor', art_director: 'Art director', admin: 'Administrator' }[role],
    );
    expect(screen.getByText('Psiform')).toBeTruthy();
  });

  it('marks places that are not built yet', async () => {
    openAs('illustrator', '/publications');
    const nav = await screen.findByTestId('main-nav');
    expect(within(nav).getByTestId('nav-publications').textContent).toBe('Publications');
    // The Composer is built (studio issue); People (admin) is still to come.
    expect(within(nav).getByTestId('nav-composer').textContent).toBe('Composer');
  });

  it('every place is built now: the admin places carry no "later" mark', async () => {
    openAs('admin', '/publications');
    const nav = await screen.findByTestId('main-nav');
    expect(within(nav).getByTestId('nav-people').textContent).toBe('People');
    expect(within(nav).getByTestId('nav-manage/publications').textContent).toBe('Manage publications');
  });

  it('follows the People link to the People page', async () => {
    openAs('admin', '/publications', { 'GET /api/users': () => json(200, { items: [], total: 0, page: 1, pageSize: 25 }) });
    await userEvent.setup().click(await screen.findByRole('link', { name: /People/ }));
    expect(await screen.findByTestId('people-page')).toBeTruthy();
    expect(screen.queryByTestId('coming-later')).toBeNull();
    expect(screen.getByTestId('location').textContent).toBe('/people');
  });

  it('sign-out clears the session and returns to sign-in', async () => {
    openAs('admin', '/people');
    await userEvent.setup().click(await screen.findByTestId('sign-out'));
    await waitFor(() => expect(screen.getByTestId('location').textContent).toBe('/sign-in'));
    expect(window.sessionStorage.getItem(SESSION_STORAGE_KEY)).toBeNull();
    expect(screen.queryByTestId('signin-notice')).toBeNull(); // a chosen sign-out is not "session ended"
  });

  it('refreshes the header from /api/auth/me when the stored user is stale', async () => {
    const stale = user('illustrator', { displayName: 'Old Name' });
    const fresh = { ...stale, displayName: 'New Name' };
    mockFetch(signedInRoutes(fresh));
    storeSession(stale);
    renderApp('/publications');
    await waitFor(() => expect(screen.getByTestId('user-name').textContent).toBe('New Name'));
    expect(JSON.parse(window.sessionStorage.getItem(SESSION_STORAGE_KEY) ?? '{}').user.displayName).toBe('New Name');
  });
});
