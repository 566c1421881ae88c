import { render, screen, waitFor } from '@testing-library/react';
import { vi } from 'vitest';
import type { JobDto } from '@psiform/contracts';
import { AppProviders, createQueryClient } from '../App';
import { createApiClient } from '../api/client';
import { streamJob } from '../api/jobStream';
import { json, mockFetch, signedInRoutes, storeSession, user } from '../test/utils';
import { job, sseStream } from '../test/figures';
import { JobProgress } from './JobProgress';

function renderProgress(onFinished: (j: JobDto) => void) {
  const client = createQueryClient();
  return render(
    <AppProviders client={client}>
      <JobProgress jobId="j1" onFinished={onFinished} />
    </AppProviders>,
  );
}

const bar = () => screen.getByTestId('job-progress-bar');

describe('job progress from the event stream', () => {
  it('moves the bar and names the stage as JobDto events arrive, then reports completion once', async () => {
    const me = user('illustrator');
    const stream = sseStream();
    const api = mockFetch({ ...signedInRoutes(me), 'GET /api/jobs/j1/events': () => stream.response });
    storeSession(me);
    const onFinished = vi.fn();
    renderProgress(onFinished);

    expect(screen.getByTestId('job-stage').textContent).toBe('Connecting to the job…');
    expect(bar().getAttribute('aria-valuenow')).toBe('0');

    stream.send(job({ state: 'queued', stage: 'queued', progress: 0 }));
    await waitFor(() => expect(screen.getByTestId('job-stage').textContent).toBe('Waiting in the queue'));

    stream.send(job({ stage: 'sampling', progress: 20 }));
    await waitFor(() => expect(bar().getAttribute('aria-valuenow')).toBe('20'));
    expect(screen.getByTestId('job-stage').textContent).toBe('Sampling ψ on the grid');
    expect(screen.getByTestId('job-percent').textContent).toBe('20%');

    stream.comment(); // keep-alives change nothing
    stream.send(job({ stage: 'extracting', progress: 65 }));
    await waitFor(() => expect(bar().getAttribute('aria-valuenow')).toBe('65'));
    expect(screen.getByTestId('job-stage').textContent).toBe('Extracting isosurfaces (marching cubes)');
    expect(screen.getByTestId('job-progress').getAttribute('data-state')).toBe('active');
    expect(onFinished).not.toHaveBeenCalled();

    stream.send(job({ state: 'completed', stage: 'done', progress: 100 }));
    await waitFor(() => expect(onFinished).toHaveBeenCalledTimes(1));
    expect(onFinished.mock.calls[0][0]).toMatchObject({ state: 'completed', progress: 100 });
    expect(bar().getAttribute('aria-valuenow')).toBe('100');
    expect(screen.getByTestId('job-stage').textContent).toBe('Done');
    expect(screen.queryByTestId('job-error')).toBeNull();

    // Read with fetch and the Bearer token (EventSource could not send it).
    const [call] = api.callsTo('GET', '/api/jobs/j1/events');
    expect(call.headers.get('Authorization')).toBe('Bearer tok-1');
    expect(call.headers.get('accept')).toBe('text/event-stream');
    stream.close();
  });

  it('shows the failure in words with the stage it happened in', async () => {
    const me = user('illustrator');
    const stream = sseStream();
    mockFetch({ ...signedInRoutes(me), 'GET /api/jobs/j1/events': () => stream.response });
    storeSession(me);
    const onFinished = vi.fn();
    renderProgress(onFinished);

    stream.send(job({ stage: 'sampling', progress: 30 }));
    await waitFor(() => expect(bar().getAttribute('aria-valuenow')).toBe('30'));
    stream.send(job({ state: 'failed', stage: 'sampling', progress: 30, error: 'grid 384³ needs 452.0 MB, more than the 256.0 MB budget' }));
    const err = await screen.findByTestId('job-error');
    expect(err.textContent).toBe(
      'The mesh job failed while sampling ψ on the grid: grid 384³ needs 452.0 MB, more than the 256.0 MB budget',
    );
    expect(bar().className).toContain('bp6-intent-danger');
    expect(onFinished).toHaveBeenCalledWith(expect.objectContaining({ state: 'failed' }));
    stream.close();
  });

  it("says why when the stream is refused (the server's message)", async () => {
    const me = user('illustrator');
    mockFetch({
      ...signedInRoutes(me),
      'GET /api/jobs/j1/events': () => json(404, { statusCode: 404, message: 'No job j1 in your publications', error: 'Not Found' }),
    });
    storeSession(me);
    renderProgress(vi.fn());
    const err = await screen.findByTestId('job-stream-error');
    expect(err.textContent).toBe('Progress could not be followed: No job j1 in your publications');
  });

  it('reopens a stream that ends before the job does', async () => {
    const first = sseStream();
    const second = sseStream();
    const responses = [first, second];
    let opened = 0;
    mockFetch({ 'GET /api/jobs/j1/events': () => responses[opened++].response });
    const api = createApiClient({ getToken: () => 'tok-1', onUnauthorized: () => {} });
    const seen: number[] = [];
    const done = streamJob(api, 'j1', { signal: new AbortController().signal, onJob: (j) => seen.push(j.progress), retryMs: 5 });

    first.send(job({ stage: 'sampling', progress: 10 }));
    await waitFor(() => expect(seen).toEqual([10]));
    first.close(); // e.g. a proxy timeout
    await waitFor(() => expect(opened).toBe(2));
    second.send(job({ stage: 'encoding', progress: 80 }));
    second.send(job({ state: 'completed', stage: 'done', progress: 100 }));
    await expect(done).resolves.toMatchObject({ state: 'completed' });
    expect(seen).toEqual([10, 80, 100]);
  });
});
