import { render } from '@testing-library/react';
import { MemoryRouter, useLocation } from 'react-router-dom';
import { vi } from 'vitest';
import type { HealthResponse, PublicationDto, Role, UserDto } from '@psiform/contracts';
import { AppProviders, AppRoutes, createQueryClient } from '../App';
import { saveSession } from '../auth/session';

export function json(status: number, body: unknown, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { 'Content-Type': 'application/json', ...headers },
  });
}

export type Handler = (req: { url: string; method: string; headers: Headers; body: unknown }) => Response | Promise<Response>;

export const HEALTH_OK: HealthResponse = {
  status: 'ok',
  services: { database: 'ok', redis: 'ok', storage: 'ok', mail: 'ok' },
};

export function user(role: Role, overrides: Partial<UserDto> = {}): UserDto {
  return {
    id: `u-${role}`,
    email: `${role}@example.test`,
    displayName: `Test ${role}`,
    role,
    createdAt: '2025-01-01T00:00:00.000Z',
    ...overrides,
  };
}

export const PUBLICATIONS: PublicationDto[] = [
  {
    id: 'p1',
    title: 'Shapes of the Electron Cloud',
    publisher: 'Quillmere Press',
    kind: 'book',
    description: 'A first-year text with full-page orbital plates.',
    lengthUnit: 'angstrom',
    createdAt: '2025-01-02T00:00:00.000Z',
  },
  {
    id: 'p2',
    title: 'Annals of Light and Matter, Vol. 7',
    publisher: 'Fenwright Society',
    kind: 'journal_volume',
    description: '',
    lengthUnit: 'bohr',
    createdAt: '2025-01-03T00:00:00.000Z',
  },
];

/**
 * Replaces global fetch with a router over "METHOD /path" keys. Unknown routes answer 404 so a
 * test notices calls it did not expect (they are also recorded in `calls`).
 */
export function mockFetch(routes: Record<string, Handler>) {
  const calls: { method: string; url: string; headers: Headers; body: unknown }[] = [];
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init: RequestInit = {}) => {
    const url = typeof input === 'string' ? input : input instanceof URL ? input.href : input.url;
    const method = (init.method ?? 'GET').toUpperCase();
    const headers = new Headers(init.headers);
    const body = typeof init.body === 'string' ? (JSON.parse(init.body) as unknown) : undefined;
    const req = { url, method, headers, body };
    calls.push(req);
    const path = url.replace(/^https?:\/\/[^/]+/, '').split('?')[0];
    const handler =
      routes[`${method} ${path}`] ??
      (path === '/api/health' ? () => json(200, HEALTH_OK) : undefined);
    if (!handler) return json(404, { statusCode: 404, message: `No mock for ${method} ${path}`, error: 'Not Found' });
    return handler(req);
  });
  vi.stubGlobal('fetch', fetchMock);
  return { fetchMock, calls, callsTo: (method: string, path: string) => calls.filter((c) => c.method === method && c.url.endsWith(path)) };
}

/** Handlers for a signed-in user: /me echoes the user, /publications returns the given list. */
export function signedInRoutes(u: UserDto, publications: PublicationDto[] = PUBLICATIONS): Record<string, Handler> {
  return {
    'GET /api/auth/me': ({ headers }) =>
      headers.get('Authorization') === 'Bearer tok-1'
        ? json(200, u)
        : json(401, { statusCode: 401, message: 'Unauthorized', error: 'Unauthorized' }),
    'GET /api/publications': ({ headers }) =>
      headers.get('Authorization') === 'Bearer tok-1'
        ? json(200, publications)
        : json(401, { statusCode: 401, message: 'Unauthorized', error: 'Unauthorized' }),
  };
}

export function storeSession(u: UserDto, accessToken = 'tok-1') {
  saveSession({ accessToken, user: u });
}

function LocationProbe() {
  const location = useLocation();
  return <output data-testid="location">{location.pathname}</output>;
}

export function renderApp(route = '/') {
  const client = createQueryClient();
  client.setDefaultOptions({ queries: { retry: false, refetchOnWindowFocus: false }, mutations: { retry: false } });
  return render(
    <AppProviders client={client}>
      <MemoryRouter initialEntries={[route]}>
        <AppRoutes />
        <LocationProbe />
      </MemoryRouter>
    </AppProviders>,
  );
}

/**
 * A signed-in `role` opening the app at `route`: the session stored, /me and /publications answered (signedInRoutes)
 * plus `routes`. Returns the signed-in user and the fetch mock (calls, callsTo).
 */
export function openAs(role: Role, route: string, routes: Record<string, Handler> = {}) {
  const me = user(role);
  const api = mockFetch({ ...signedInRoutes(me), ...routes });
  storeSession(me);
  renderApp(route);
  return { me, ...api };
}

/** Replaces what a field holds, as a user would: clears it, then types `text` (userEvent, so every key fires). */
export async function retype(ue: { clear(el: Element): Promise<void>; type(el: Element, text: string): Promise<void> }, field: HTMLElement, text: string) {
  await ue.clear(field);
  await ue.type(field, text);
}

export function deferred<T>() {
  let resolve!: (value: T) => void;
  let reject!: (err: unknown) => void;
  const promise = new Promise<T>((res, rej) => {
    resolve = res;
    reject = rej;
  });
  return { promise, resolve, reject };
}
