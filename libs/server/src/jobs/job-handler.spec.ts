import { checkHandlers, type JobHandler } from './job-handler';
import { CAPPED_BACKOFF_MAX_MS, JOB_OPTIONS, NOTICE_JOB_OPTIONS, cappedBackoffMs, totalBackoffMs } from './job-options';

const plain = (name: string) => ({ kind: 'plain', name, run: async () => null }) as unknown as JobHandler;
const all = () => ['ping', 'mesh', 'render', 'export', 'notice'].map(plain);

describe('the start-up check of the job handlers (after immich)', () => {
  it('passes when every job of the contract has exactly one handler (a disabled one counts)', () => {
    expect(() => checkHandlers(all())).not.toThrow();
    expect(() => checkHandlers([...all().slice(0, 4), { ...plain('notice'), enabled: false } as JobHandler])).not.toThrow();
  });

  it('refuses a job with no handler, a job with two, and a handler of no job, naming each', () => {
    expect(() => checkHandlers(all().filter((h) => h.name !== 'render'))).toThrow('job handlers: job "render" has no handler');
    expect(() => checkHandlers([...all(), plain('mesh')])).toThrow('job "mesh" has 2 handlers');
    expect(() => checkHandlers([...all(), plain('tiff')])).toThrow('handler for "tiff", which is not a job of the contract');
  });
});

describe('job retries', () => {
  it('a capped backoff doubles from the first delay and then waits at most a minute', () => {
    expect([1, 2, 3, 6, 7, 20].map((n) => cappedBackoffMs(n, 1000))).toEqual([1000, 2000, 4000, 32000, CAPPED_BACKOFF_MAX_MS, CAPPED_BACKOFF_MAX_MS]);
  });

  it('notices outlast a mail server that is down for an hour; figure jobs keep 3 quick tries', () => {
    // 1+2+4+…+32 s, then 63 tries a minute apart: 63 + 3780 = 3843 s.
    expect(totalBackoffMs(NOTICE_JOB_OPTIONS)).toBe(3_843_000);
    expect(totalBackoffMs(NOTICE_JOB_OPTIONS)).toBeGreaterThan(3_600_000);
    expect(JOB_OPTIONS.notice).toBe(NOTICE_JOB_OPTIONS);
    expect(JOB_OPTIONS.mesh).toMatchObject({ attempts: 3, backoff: { type: 'exponential', delay: 1000 } });
    expect(totalBackoffMs(JOB_OPTIONS.mesh)).toBe(3000);
  });
});
