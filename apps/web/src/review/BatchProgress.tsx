import { Callout, ProgressBar, Tag } from '@blueprintjs/core';
import { useQuery } from '@tanstack/react-query';
import type { BatchDto } from '@psiform/contracts';
import { describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { batch } from './reviewApi';

export const BATCH_POLL_MS = 1500;

/** Share of the batch's jobs that have finished (completed or failed), 0..1; an empty batch is done. */
export function batchFraction(b: Pick<BatchDto, 'total' | 'completed' | 'failed'>): number {
  if (b.total <= 0) return 1;
  return Math.min(1, (b.completed + b.failed) / b.total);
}

/** Overall progress of a re-render batch, polling GET /api/batches/:id until it is no longer running. */
export function BatchProgress({ initial, pollMs = BATCH_POLL_MS }: { initial: BatchDto; pollMs?: number }) {
  const api = useApi();
  const q = useQuery({
    queryKey: ['batch', initial.batchId],
    queryFn: ({ signal }) => batch(api, initial.batchId, signal),
    initialData: initial,
    initialDataUpdatedAt: 0, // fetch at once; the POST answer is only the starting point
    refetchInterval: (query) => (query.state.data?.state === 'running' ? pollMs : false),
  });
  const b = q.data;
  const fraction = batchFraction(b);
  const pct = Math.round(fraction * 100);
  return (
    <div className="pf-job" data-testid="batch-progress" data-state={b.state}>
      <div className="pf-job-line">
        <span data-testid="batch-counts">
          {b.completed} of {b.total} re-rendered{b.failed > 0 ? `, ${b.failed} failed` : ''}
        </span>
        <span data-testid="batch-percent">{pct}%</span>
      </div>
      <ProgressBar
        value={fraction}
        animate={b.state === 'running'}
        stripes={b.state === 'running'}
        intent={b.state === 'failed' ? 'danger' : b.state === 'completed' ? 'success' : 'primary'}
        data-testid="batch-progress-bar"
      />
      {b.state === 'completed' && (
        <Tag minimal intent="success" data-testid="batch-done">
          Done
        </Tag>
      )}
      {b.state === 'failed' && (
        <Callout intent="danger" compact data-testid="batch-failed">
          {b.failed} figure{b.failed === 1 ? '' : 's'} could not be re-rendered:{' '}
          {b.jobs
            .filter((j) => j.jobState === 'failed')
            .map((j) => j.title)
            .join(', ')}
          . Open each figure to see the job's error.
        </Callout>
      )}
      {q.isError && (
        <Callout intent="warning" compact data-testid="batch-poll-error">
          Progress could not be refreshed: {describeError(q.error)}
        </Callout>
      )}
    </div>
  );
}
