import { hostname } from 'node:os';
import { lifecycle } from '../testing/lifecycle';
import { HealthPingProcessor } from './health-ping.processor';

describe('HealthPingProcessor', () => {
  const p = new HealthPingProcessor();
  const run = (name: string, data: unknown = {}) => lifecycle().process('psiform-health', name === p.name ? p : undefined, { id: '1', name, data, attemptsMade: 0, opts: {} });

  it('listens on psiform-health and answers ping with this process', async () => {
    await expect(run('ping')).resolves.toEqual({ pong: true, worker: `${hostname()}/${process.pid}` });
  });

  it('rejects other job names and a payload the contract does not allow', async () => {
    await expect(run('render')).rejects.toThrow('unknown job name "render" on queue psiform-health');
    await expect(run('ping', { extra: 1 })).rejects.toThrow('malformed ping job');
  });
});
