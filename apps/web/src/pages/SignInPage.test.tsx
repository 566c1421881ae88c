import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { SESSION_STORAGE_KEY } from '../auth/session';
import { deferred, json, mockFetch, PUBLICATIONS, renderApp, signedInRoutes, user } from '../test/utils';

async function fillAndSubmit(email: string, password: string) {
  const u = userEvent.setup();
  await u.type(screen.getByLabelText('Email'), email);
  await u.type(screen.getByLabelText('Password'), password);
  await u.click(screen.getByRole('button', { name: 'Sign in' }));
}

describe('sign-in form', () => {
  it('shows the message from a 401 body and stores nothing', async () => {
    const api = mockFetch({
      'POST /api/auth/login': () =>
        json(401, { statusCode: 401, message: 'Email or password is not right', error: 'Unauthorized' }),
    });
    renderApp('/sign-in');
    await fillAndSubmit('someone@example.test', 'wrong-password');

    const alert = await screen.findByTestId('signin-error');
    expect(alert.textContent).toContain('Email or password is not right');
    expect(screen.getByTestId('location').textContent).toBe('/sign-in');
    expect(window.sessionStorage.getItem(SESSION_STORAGE_KEY)).toBeNull();
    // The sign-in call carries the credentials and no token.
    const [login] = api.callsTo('POST', '/api/auth/login');
    expect(login.body).toEqual({ email: 'someone@example.test', password: 'wrong-password' });
    expect(login.headers.get('Authorization')).toBeNull();
  });

  it('disables submit while the request is pending, then signs in and opens Publications', async () => {
    const pending = deferred<Response>();
    const me = user('illustrator', { displayName: 'Ada Penrose' });
    mockFetch({ 'POST /api/auth/login': () => pending.promise, ...signedInRoutes(me) });
    renderApp('/sign-in');
    await fillAndSubmit('ada@example.test', 'a-long-password');

    const submit = screen.getByTestId('signin-submit') as HTMLButtonElement;
    await waitFor(() => expect(submit.disabled).toBe(true));
    expect((screen.getByLabelText('Email') as HTMLInputElement).disabled).toBe(true);

    pending.resolve(json(201, { accessToken: 'tok-1', user: me }));

    expect(await screen.findByText(PUBLICATIONS[0].title)).toBeTruthy();
    expect(screen.getByTestId('location').textContent).toBe('/publications');
    const stored = JSON.parse(window.sessionStorage.getItem(SESSION_STORAGE_KEY) ?? 'null');
    expect(stored).toEqual({ accessToken: 'tok-1', user: me });
  });

  it('explains throttling (429) in the server words plus the Retry-After wait', async () => {
    mockFetch({
      'POST /api/auth/login': () =>
        json(
          429,
          { statusCode: 429, message: 'Too many sign-in attempts', error: 'Too Many Requests' },
          { 'Retry-After': '42' },
        ),
    });
    renderApp('/sign-in');
    await fillAndSubmit('someone@example.test', 'whatever-pass');
    const alert = await screen.findByTestId('signin-error');
    expect(alert.textContent).toBe('Too many sign-in attempts. Try again in 42 seconds.');
  });

  it('says the server could not be reached when fetch itself fails', async () => {
    mockFetch({
      'POST /api/auth/login': () => {
        throw new TypeError('Failed to fetch');
      },
    });
    renderApp('/sign-in');
    await fillAndSubmit('someone@example.test', 'whatever-pass');
    const alert = await screen.findByTestId('signin-error');
    expect(alert.textContent).toMatch(/Could not reach the Psiform server/);
    // The button is usable again for a retry.
    expect((screen.getByTestId('signin-submit') as HTMLButtonElement).disabled).toBe(false);
  });

  it('joins a list of validation messages from a 400 body', async () => {
    mockFetch({
      'POST /api/auth/login': () =>
        json(400, { statusCode: 400, message: ['email must be an email', 'password should not be empty'], error: 'Bad Request' }),
    });
    renderApp('/sign-in');
    await fillAndSubmit('not-an-email', 'x');
    const alert = await screen.findByTestId('signin-error');
    expect(alert.textContent).toBe('email must be an email; password should not be empty');
  });

  it('asks for the missing field and sends nothing when the form is empty', async () => {
    const api = mockFetch({});
    renderApp('/sign-in');
    const u = userEvent.setup();
    await u.click(screen.getByRole('button', { name: 'Sign in' }));
    expect((await screen.findByTestId('signin-error')).textContent).toBe('Enter your email address.');
    await u.type(screen.getByLabelText('Email'), 'a@example.test');
    await u.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(screen.getByTestId('signin-error').textContent).toBe('Enter your password.');
    expect(api.callsTo('POST', '/api/auth/login')).toHaveLength(0);
  });
});
