import { fetchEventSource, EventStreamContentType } from '@microsoft/fetch-event-source';
import type { JobDto } from '@psiform/contracts';
import { ApiError, isErrorBody, serverMessage, type ApiClient } from './client';

export function isTerminal(job: Pick<JobDto, 'state'>): boolean {
  return job.state === 'completed' || job.state === 'failed';
}

/** Thrown from the stream callbacks to stop fetch-event-source retrying. */
class FatalStreamError extends Error {}
/** The stream ended before the job did (proxy timeout, server restart): open it again. */
class EndedEarly extends Error {}

export interface StreamJobOptions {
  onJob(job: JobDto): void;
  signal: AbortSignal;
  /** Reconnects allowed after a dropped stream before giving up (default 5). */
  maxRetries?: number;
  /** Wait between reconnects in ms (default 1500). */
  retryMs?: number;
}

/**
 * Follows `GET /api/jobs/:id/events` until the job is completed or failed. EventSource cannot send the
 * Authorization header, so the stream is read with fetch (@microsoft/fetch-event-source) and the Bearer token.
 * Resolves with the last job seen (terminal), or undefined when aborted; rejects with an ApiError on an
 * HTTP error or when the stream keeps dropping.
 */
export function streamJob(api: ApiClient, jobId: string, opts: StreamJobOptions): Promise<JobDto | undefined> {
  let last: JobDto | undefined;
  let retries = 0;
  const maxRetries = opts.maxRetries ?? 5;
  const path = `/api/jobs/${encodeURIComponent(jobId)}/events`;
  const token = api.token();
  // Our own controller too: once a terminal event arrives we stop reading, whether or not the server closes.
  const done = new AbortController();
  const onAbort = () => done.abort();
  opts.signal.addEventListener('abort', onAbort);

  return fetchEventSource(api.url(path), {
    signal: done.signal,
    // A background tab keeps following the job; the default would close and reopen the stream.
    openWhenHidden: true,
    headers: token ? { Authorization: `Bearer ${token}` } : {},
    // Looked up per call so tests can replace the global fetch.
    fetch: (input, init) => globalThis.fetch(input, init),
    async onopen(res) {
      const type = res.headers.get('content-type') ?? '';
      if (res.ok && type.startsWith(EventStreamContentType)) {
        retries = 0;
        return;
      }
      let body: unknown;
      try {
        body = JSON.parse(await res.text());
      } catch {
        body = null;
      }
      const errBody = isErrorBody(body) ? body : null;
      if (res.status === 401) api.unauthorized();
      const msg = res.ok
        ? `The progress stream for job ${jobId} answered ${type || 'no content type'}, not an event stream.`
        : (serverMessage(errBody) ?? `HTTP ${res.status}`);
      throw new FatalStreamError(msg, { cause: new ApiError(res.ok ? 'invalid-response' : 'http', res.status, msg, errBody) });
    },
    onmessage(ev) {
      if (!ev.data) return; // comments / keep-alives
      let job: JobDto;
      try {
        job = JSON.parse(ev.data) as JobDto;
      } catch {
        throw new FatalStreamError(`The progress stream sent an unreadable event: ${ev.data.slice(0, 80)}`);
      }
      last = job;
      opts.onJob(job);
      if (isTerminal(job)) done.abort();
    },
    onclose() {
      if (!last || !isTerminal(last)) throw new EndedEarly('stream ended before the job finished');
    },
    onerror(err) {
      if (err instanceof FatalStreamError) throw err.cause instanceof ApiError ? err.cause : new ApiError('invalid-response', 0, err.message);
      retries += 1;
      if (retries > maxRetries) {
        throw new ApiError('network', 0, err instanceof Error ? err.message : 'The progress stream dropped');
      }
      return opts.retryMs ?? 1500;
    },
  })
    .then(() => (opts.signal.aborted ? undefined : last))
    .finally(() => opts.signal.removeEventListener('abort', onAbort));
}
