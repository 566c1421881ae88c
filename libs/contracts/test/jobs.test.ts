import { describe, expect, it } from 'vitest';
import { JOB_NAMES, JOB_QUEUE, QUEUES, TRACKED_JOBS, isJobName, isTrackedJob, parseJob, type JobOf } from '../src';

const ID = '3f2a1b0c-9d8e-4f7a-8b6c-5d4e3f2a1b0c';

describe('the job contract', () => {
  it('names every job once, each on a queue; the tracked ones are the jobs table types', () => {
    expect([...JOB_NAMES].sort()).toEqual(['export', 'mesh', 'notice', 'ping', 'render']);
    expect(JOB_NAMES.map((n) => JOB_QUEUE[n]).sort()).toEqual(Object.values(QUEUES).sort());
    expect(TRACKED_JOBS.filter(isTrackedJob)).toEqual(['mesh', 'render', 'export']);
    expect(isJobName('notice')).toBe(true);
    expect(isJobName('toString')).toBe(false); // not fooled by Object.prototype
  });

  it('accepts each payload it declares, typed by JobOf', () => {
    const render: JobOf<'render'> = { jobId: ID, params: { format: 'png', widthPx: 1051, heightPx: 709, dpi: 300, transparent: null } };
    expect(parseJob('render', render)).toEqual({ ok: true, data: render });
    const svg: JobOf<'export'> = { jobId: ID, params: { format: 'svg', kind: 'section', plane: 'xz', offset: 0, levels: 4, widthMm: 89, heightMm: 60 } };
    expect(parseJob('export', svg).ok).toBe(true);
    expect(parseJob('mesh', { jobId: ID, params: {} }).ok).toBe(true);
    expect(parseJob('notice', { to: ['ed@x.test'], subject: 's', text: 't', html: '<p>t</p>' }).ok).toBe(true);
  });

  it('refuses a malformed payload with one message naming each bad field', () => {
    const bad = parseJob('render', { jobId: 'j1', params: { format: 'png', widthPx: 0, heightPx: 709.5, dpi: 300, extra: 1 } });
    expect(bad.ok).toBe(false);
    if (bad.ok) return;
    expect(bad.message).toMatch(/^malformed render job: /);
    for (const field of ['jobId: must be a UUID', 'params.widthPx', 'params.heightPx', 'params']) expect(bad.message).toContain(field);
    expect(parseJob('export', { jobId: ID, params: { format: 'tiff' } }).ok).toBe(false);
    expect(parseJob('notice', { to: [], subject: 's', text: 't', html: '' })).toMatchObject({ ok: false, message: expect.stringContaining('to: ') });
    expect(parseJob('mesh', { jobId: ID })).toMatchObject({ ok: false, message: expect.stringContaining('params') });
  });
});
