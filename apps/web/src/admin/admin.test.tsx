import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { MemberDto, Page, PublicationAdminDto, UserAdminDto } from '@psiform/contracts';
import { json, mockFetch, renderApp, signedInRoutes, storeSession, user } from '../test/utils';
import { messagesByField, queryString } from './adminApi';
import { passwordProblem, tokenFromHash } from '../pages/SetPasswordPage';

const admin = user('admin', { id: 'u-admin' });

const person = (over: Partial<UserAdminDto>): UserAdminDto => ({
  id: 'u1',
  email: 'nell@example.test',
  displayName: 'Nell Ashgrove',
  role: 'illustrator',
  createdAt: '2025-02-01T00:00:00.000Z',
  state: 'active',
  lastLinkSentAt: null,
  memberships: [],
  ...over,
});

const page = <T,>(items: T[], total = items.length): Page<T> => ({ items, total, page: 1, pageSize: 25 });

describe('admin helpers', () => {
  it('messagesByField puts "field: …" and "field must …" messages under their field, the rest under ""', () => {
    expect(messagesByField(['email: a@b.c is already registered', 'role must be one of: x', 'something else'], ['email', 'displayName', 'role'])).toEqual({
      email: ['a@b.c is already registered'],
      role: ['role must be one of: x'],
      '': ['something else'],
    });
  });
  it('queryString leaves out empty values and keeps the order given', () => {
    expect(queryString({ page: 2, pageSize: 25, q: ' nell ', role: '', state: undefined, sort: 'email', order: 'desc' })).toBe('?page=2&pageSize=25&q=nell&sort=email&order=desc');
  });
  it('the link token is read from the fragment; passwords follow the server rule', () => {
    expect(tokenFromHash('#token=abc_DEF-1')).toBe('abc_DEF-1');
    expect(tokenFromHash('')).toBe('');
    expect(passwordProblem('short', 'short')).toBe('Use at least 10 characters.');
    expect(passwordProblem('long-enough-1', 'long-enough-2')).toBe('The two passwords differ.');
    expect(passwordProblem('long-enough-1', 'long-enough-1')).toBeNull();
    expect(passwordProblem('é'.repeat(40), 'é'.repeat(40))).toBe('Use at most 72 characters.'); // 80 bytes in UTF-8
  });
});

describe('People page', () => {
  it('sorts, filters and pages through the server; the signed-in admin cannot demote or deactivate themselves', async () => {
    const rows = [person({}), person({ id: 'u-admin', email: 'admin@example.test', displayName: 'Test admin', role: 'admin' })];
    const { calls } = mockFetch({ ...signedInRoutes(admin), 'GET /api/users': () => json(200, page(rows, 60)) });
    storeSession(admin);
    renderApp('/people');
    const table = await screen.findByTestId('people-table');
    expect(within(table).getAllByTestId('person-row')).toHaveLength(2);
    expect(screen.getByTestId('people-page-info').textContent).toBe('1–25 of 60 · page 1 of 3');
    const ev = userEvent.setup();
    await ev.click(screen.getByTestId('sort-email'));
    await waitFor(() => expect(calls.at(-1)!.url).toContain('sort=email&order=asc'));
    await ev.click(screen.getByTestId('sort-email'));
    await waitFor(() => expect(calls.at(-1)!.url).toContain('sort=email&order=desc'));
    await ev.selectOptions(screen.getByTestId('people-state'), 'invited');
    await waitFor(() => expect(calls.at(-1)!.url).toContain('state=invited'));
    await ev.click(screen.getByTestId('people-next'));
    await waitFor(() => expect(calls.at(-1)!.url).toContain('page=2'));
    const self = screen.getAllByTestId('person-row').find((r) => r.dataset.userId === 'u-admin')!;
    expect((within(self).getByTestId('person-role') as HTMLSelectElement).disabled).toBe(true);
    expect(within(self).queryByTestId('person-deactivate')).toBeNull();
  });

  it('invites someone: inline messages for bad input, the server’s duplicate message under the e-mail field, then success', async () => {
    let invites = 0;
    const { calls } = mockFetch({
      ...signedInRoutes(admin),
      'GET /api/users': () => json(200, page([])),
      'POST /api/users/invitations': ({ body }) => {
        invites++;
        const b = body as { email: string };
        if (b.email === 'taken@example.test') return json(409, { statusCode: 409, error: 'Conflict', message: 'email: taken@example.test is already registered' });
        return json(201, person({ email: b.email, state: 'invited' }));
      },
    });
    storeSession(admin);
    renderApp('/people');
    const ev = userEvent.setup();
    await ev.click(await screen.findByTestId('invite-open'));
    await ev.click(screen.getByTestId('invite-submit'));
    expect(screen.getByTestId('invite-email-error').textContent).toBe('Enter an e-mail address.');
    expect(screen.getByTestId('invite-name-error').textContent).toBe('Enter the name to show for this person.');
    await ev.type(screen.getByTestId('invite-email'), 'not-an-address');
    await ev.type(screen.getByTestId('invite-name'), 'Nell Ashgrove');
    await ev.click(screen.getByTestId('invite-submit'));
    expect(screen.getByTestId('invite-email-error').textContent).toBe('This does not look like an e-mail address.');
    expect(invites).toBe(0);
    await ev.clear(screen.getByTestId('invite-email'));
    await ev.type(screen.getByTestId('invite-email'), 'taken@example.test');
    await ev.click(screen.getByTestId('invite-submit'));
    expect((await screen.findByTestId('invite-email-error')).textContent).toBe('taken@example.test is already registered');
    await ev.clear(screen.getByTestId('invite-email'));
    await ev.type(screen.getByTestId('invite-email'), 'new@example.test');
    await ev.selectOptions(screen.getByTestId('invite-role'), 'editor');
    await ev.click(screen.getByTestId('invite-submit'));
    expect((await screen.findByTestId('invite-done')).textContent).toContain('new@example.test');
    expect(calls.filter((c) => c.method === 'POST').at(-1)!.body).toEqual({ email: 'new@example.test', displayName: 'Nell Ashgrove', role: 'editor' });
  });

  it('deactivation asks first, then sends active: false and says what happened', async () => {
    const { calls } = mockFetch({
      ...signedInRoutes(admin),
      'GET /api/users': () => json(200, page([person({})])),
      'PATCH /api/users/u1': () => json(200, person({ state: 'deactivated' })),
    });
    storeSession(admin);
    renderApp('/people');
    const ev = userEvent.setup();
    await ev.click(await screen.findByTestId('person-deactivate'));
    expect(screen.getByTestId('person-confirm').textContent).toContain('signed out everywhere at once');
    expect(calls.filter((c) => c.method === 'PATCH')).toHaveLength(0);
    await ev.click(screen.getByTestId('person-confirm-deactivate'));
    expect((await screen.findByTestId('person-message')).textContent).toBe('Deactivated: their sessions have ended.');
    expect(calls.find((c) => c.method === 'PATCH')!.body).toEqual({ active: false });
  });
});

describe('set-password page', () => {
  it('reads the link, refuses a mismatch inline, sets the password and lands on sign-in with the address filled in', async () => {
    const { calls } = mockFetch({
      'POST /api/auth/link': () => json(200, { purpose: 'invite', email: 'nell@example.test', displayName: 'Nell', expiresAt: '2030-01-01T00:00:00.000Z' }),
      'POST /api/auth/set-password': () => json(200, { email: 'nell@example.test', message: 'ok' }),
    });
    renderApp('/set-password#token=tok_ABC');
    expect((await screen.findByText('Welcome, Nell')).tagName).toBe('H1');
    const ev = userEvent.setup();
    await ev.type(screen.getByTestId('set-password-password'), 'nodal-planes-42');
    await ev.type(screen.getByTestId('set-password-again'), 'nodal-planes-43');
    await ev.click(screen.getByTestId('set-password-submit'));
    expect(screen.getByTestId('set-password-error').textContent).toBe('The two passwords differ.');
    await ev.clear(screen.getByTestId('set-password-again'));
    await ev.type(screen.getByTestId('set-password-again'), 'nodal-planes-42');
    await ev.click(screen.getByTestId('set-password-submit'));
    await waitFor(() => expect(screen.getByTestId('location').textContent).toBe('/sign-in'));
    expect((screen.getByTestId('signin-email') as HTMLInputElement).value).toBe('nell@example.test');
    expect(screen.getByTestId('signin-arrived').textContent).toContain('Your password is set');
    expect(calls.find((c) => c.url.endsWith('/set-password'))!.body).toEqual({ token: 'tok_ABC', password: 'nodal-planes-42' });
    // The token was sent in bodies only, never in a URL.
    expect(calls.every((c) => !c.url.includes('tok_ABC'))).toBe(true);
  });

  it('a used or expired link says so and offers a new one', async () => {
    mockFetch({ 'POST /api/auth/link': () => json(400, { statusCode: 400, error: 'Bad Request', message: ['token: this link is not valid, has expired or was already used; ask for a new one'] }) });
    renderApp('/set-password#token=old');
    expect((await screen.findByTestId('set-password-bad-link')).textContent).toContain('has expired or was already used');
  });
});

describe('Publications admin', () => {
  const pub: PublicationAdminDto = { id: 'p9', title: 'Field Guide to Nodes', publisher: 'Harrowgate Press', kind: 'book', description: '', lengthUnit: 'bohr', memberCount: 1, createdAt: '2025-03-01T00:00:00.000Z' };
  const member: MemberDto = { ...person({}), publicationRole: 'editor', state: 'active', addedAt: '2025-03-02T00:00:00.000Z' };

  it('creates a publication with its length unit; empty fields get inline messages', async () => {
    const { calls } = mockFetch({
      ...signedInRoutes(admin),
      'GET /api/publications/directory': () => json(200, page([pub])),
      'POST /api/publications': ({ body }) => json(201, { ...pub, ...(body as object), id: 'p10', memberCount: 0 }),
    });
    storeSession(admin);
    renderApp('/manage/publications');
    expect((await screen.findAllByTestId('pub-row'))[0].textContent).toContain('a₀');
    const ev = userEvent.setup();
    await ev.click(screen.getByTestId('pubs-new'));
    await ev.click(screen.getByTestId('pub-submit'));
    expect(screen.getByTestId('pub-title-error').textContent).toBe('Enter a title.');
    expect(screen.getByTestId('pub-publisher-error').textContent).toBe('Enter the publisher.');
    await ev.type(screen.getByTestId('pub-title'), 'Ledger of Shells');
    await ev.type(screen.getByTestId('pub-publisher'), 'Quill & Slate');
    await ev.selectOptions(screen.getByTestId('pub-kind'), 'journal_volume');
    await ev.click(screen.getByText('Bohr radius (a₀)'));
    await ev.click(screen.getByTestId('pub-submit'));
    expect((await screen.findByTestId('pubs-created')).textContent).toContain('Ledger of Shells');
    expect(calls.find((c) => c.method === 'POST')!.body).toEqual({ title: 'Ledger of Shells', publisher: 'Quill & Slate', kind: 'journal_volume', lengthUnit: 'bohr', description: '' });
  });

  it('edits members: change the role here, remove, and add someone found by name with a role', async () => {
    const { calls } = mockFetch({
      ...signedInRoutes(admin),
      'GET /api/publications/p9': () => json(200, pub),
      'GET /api/publications/p9/members': () => json(200, [member]),
      'GET /api/audit': () => json(200, page([])),
      'GET /api/users': () => json(200, page([person({ id: 'u2', email: 'odile@example.test', displayName: 'Odile Marsh' }), person({})])),
      'PUT /api/publications/p9/members/u1': () => json(200, { publicationId: 'p9', userId: 'u1', role: 'art_director' }),
      'DELETE /api/publications/p9/members/u1': () => new Response(null, { status: 204 }),
      'POST /api/publications/p9/members': () => json(201, { publicationId: 'p9', userId: 'u2', role: 'art_director' }),
    });
    storeSession(admin);
    renderApp('/manage/publications/p9');
    const ev = userEvent.setup();
    const row = await screen.findByTestId('member-row');
    await ev.selectOptions(within(row).getByTestId('member-role'), 'art_director');
    await waitFor(() => expect(calls.find((c) => c.method === 'PUT')!.body).toEqual({ role: 'art_director' }));
    await ev.click(within(row).getByTestId('member-remove'));
    await waitFor(() => expect(calls.some((c) => c.method === 'DELETE')).toBe(true));
    await ev.type(screen.getByTestId('add-member-search'), 'marsh');
    const candidates = await screen.findAllByTestId('add-member-candidate');
    expect(within(candidates[1]).getByText('already a member')).toBeTruthy();
    await ev.selectOptions(within(candidates[0]).getByTestId('add-member-role'), 'art_director');
    await ev.click(within(candidates[0]).getByTestId('add-member-submit'));
    await waitFor(() => expect(calls.find((c) => c.method === 'POST')!.body).toEqual({ userId: 'u2', role: 'art_director' }));
  });
});
