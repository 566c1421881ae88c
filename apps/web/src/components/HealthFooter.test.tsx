import { screen } from '@testing-library/react';
import { json, mockFetch, renderApp } from '../test/utils';

describe('health footer', () => {
  it('shows each service in the words the API used, flagging those not ok', async () => {
    mockFetch({
      'GET /api/health': () =>
        json(503, { status: 'degraded', services: { database: 'ok', redis: 'down', storage: 'ok', mail: 'ok' } }),
    });
    renderApp('/sign-in');
    expect((await screen.findByTestId('health-database')).textContent).toBe('Database: ok');
    const queue = screen.getByTestId('health-redis');
    expect(queue.textContent).toBe('Queue: down');
    expect(queue.querySelector('.pf-status-bad')?.textContent).toBe('down');
    expect(screen.getByTestId('health-database').querySelector('.pf-status-bad')).toBeNull();
  });

  it('says status is unavailable when the health route cannot be read', async () => {
    mockFetch({ 'GET /api/health': () => new Response('<html>bad gateway</html>', { status: 502 }) });
    renderApp('/sign-in');
    expect((await screen.findByTestId('health-footer')).textContent).toContain('Checking services');
    expect(await screen.findByText('Service status unavailable')).toBeTruthy();
  });
});
