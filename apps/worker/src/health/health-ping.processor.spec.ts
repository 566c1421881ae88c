import { hostname } from 'node:os';
import { HealthPingProcessor } from './health-ping.processor';

describe('HealthPingProcessor', () => {
  const p = new HealthPingProcessor();

  it('listens on psiform-health and answers ping with this process', async () => {
    expect(p.queue).toBe('psiform-health');
    await expect(p.process({ name: 'ping' })).resolves.toEqual({ pong: true, worker: `${hostname()}/${process.pid}` });
  });

  it('rejects other job names', async () => {
    await expect(p.process({ name: 'render' })).rejects.toThrow('unknown job name "render" on queue psiform-health');
  });
});
