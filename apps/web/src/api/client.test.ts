import { ApiError, createApiClient, describeError } from './client';
import { json, mockFetch } from '../test/utils';

describe('api client', () => {
  it('adds the Bearer token and calls onUnauthorized on a 401 to a token', async () => {
    const api = mockFetch({ 'GET /api/publications': () => json(401, { statusCode: 401, message: 'Unauthorized', error: 'Unauthorized' }) });
    const onUnauthorized = vi.fn();
    const client = createApiClient({ getToken: () => 'abc', onUnauthorized });
    await expect(client.publications()).rejects.toMatchObject({ status: 401, kind: 'http' });
    expect(onUnauthorized).toHaveBeenCalledTimes(1);
    expect(api.calls[0].headers.get('Authorization')).toBe('Bearer abc');
  });

  it('does not treat a failed sign-in as an ended session', async () => {
    mockFetch({ 'POST /api/auth/login': () => json(401, { statusCode: 401, message: 'Bad credentials', error: 'Unauthorized' }) });
    const onUnauthorized = vi.fn();
    const client = createApiClient({ getToken: () => 'abc', onUnauthorized });
    const err = await client.login({ email: 'a@b.test', password: 'x' }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ApiError);
    expect(describeError(err)).toBe('Bad credentials');
    expect(onUnauthorized).not.toHaveBeenCalled();
  });

  it('reports a non-JSON success body instead of returning garbage', async () => {
    mockFetch({ 'GET /api/publications': () => new Response('<!doctype html>', { status: 200 }) });
    const client = createApiClient({ getToken: () => 't', onUnauthorized: () => {} });
    const err = await client.publications().catch((e: unknown) => e);
    expect(err).toMatchObject({ kind: 'invalid-response' });
    expect(describeError(err)).toContain('/api/publications');
  });

  it('describes errors for people', () => {
    expect(describeError(new ApiError('network', 0, 'Failed to fetch'))).toMatch(/Could not reach/);
    expect(describeError(new ApiError('http', 500, 'HTTP 500'))).toBe(
      'The Psiform server could not complete the request (HTTP 500). Try again shortly.',
    );
    expect(describeError(new ApiError('http', 429, 'HTTP 429'))).toBe(
      'Too many attempts in a short time. Wait a minute, then try again.',
    );
    expect(
      describeError(new ApiError('http', 400, 'x', { statusCode: 400, error: 'Bad Request', message: ['a is wrong', 'b is missing'] })),
    ).toBe('a is wrong; b is missing');
  });
});
