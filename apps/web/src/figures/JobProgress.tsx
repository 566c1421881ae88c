import { useEffect, useRef, useState } from 'react';
import { Callout, ProgressBar } from '@blueprintjs/core';
import type { JobDto } from '@psiform/contracts';
import { describeError } from '../api/client';
import { isTerminal, streamJob } from '../api/jobStream';
import { useApi } from '../auth/AuthProvider';

/** Our words for the mesh pipeline's stages (MESH_STAGES); unknown stages are shown as sent. */
export const STAGE_WORDS: Record<string, string> = {
  queued: 'Waiting in the queue',
  sampling: 'Sampling ψ on the grid',
  threshold: 'Finding the isovalue for the enclosed fraction',
  extracting: 'Extracting isosurfaces (marching cubes)',
  encoding: 'Writing the mesh files',
  storing: 'Storing the files',
  done: 'Done',
};

export function stageWords(stage: string): string {
  return STAGE_WORDS[stage] ?? stage;
}

/** A failure message a person can read: the worker's own words, framed. */
export function failureText(job: JobDto): string {
  const said = job.error?.trim();
  const where = job.stage && job.stage !== 'done' ? ` while ${stageWords(job.stage).toLowerCase()}` : '';
  return said ? `The mesh job failed${where}: ${said}` : `The mesh job failed${where}, without a message from the worker.`;
}

/**
 * Follows one job over its event stream: the latest JobDto and, if the stream broke, a readable reason.
 * Calls onFinished once with the terminal job (completed or failed). Shared by every progress bar of jobs.
 */
export function useFollowJob(jobId: string, onFinished?: (job: JobDto) => void): { job: JobDto | null; streamError: string | null } {
  const api = useApi();
  const [job, setJob] = useState<JobDto | null>(null);
  const [streamError, setStreamError] = useState<string | null>(null);
  const finished = useRef(onFinished);
  finished.current = onFinished;

  useEffect(() => {
    const ctrl = new AbortController();
    setJob(null);
    setStreamError(null);
    streamJob(api, jobId, { signal: ctrl.signal, onJob: (j) => setJob(j) })
      .then((last) => {
        if (last && isTerminal(last)) finished.current?.(last);
      })
      .catch((err: unknown) => {
        if (!ctrl.signal.aborted) setStreamError(describeError(err));
      });
    return () => ctrl.abort();
  }, [api, jobId]);
  return { job, streamError };
}

/**
 * A progress bar with the stage name for one job, the one view of every kind of job (meshes, renders, exports).
 * `words` names the stages, `failure` words a failed job, `connecting` shows before the first snapshot. Test ids:
 * `<testId>-progress` (with data-state), `-stage`, `-percent`, `-progress-bar`, `-error`, `-stream-error`.
 */
export function JobProgress({
  jobId,
  onFinished,
  testId = 'job',
  words = STAGE_WORDS,
  connecting = 'Connecting to the job…',
  failure = failureText,
}: {
  jobId: string;
  onFinished?(job: JobDto): void;
  testId?: string;
  words?: Record<string, string>;
  connecting?: string;
  failure?(job: JobDto): string;
}) {
  const { job, streamError } = useFollowJob(jobId, onFinished);

  const state = job?.state ?? 'queued';
  const value = job ? Math.max(0, Math.min(100, job.progress)) / 100 : 0;
  const running = state === 'queued' || state === 'active';

  return (
    <div className="pf-job" data-testid={`${testId}-progress`} data-state={state} aria-live="polite">
      <div className="pf-job-line">
        <span data-testid={`${testId}-stage`}>{job ? (words[job.stage] ?? job.stage) : connecting}</span>
        <span className="pf-muted" data-testid={`${testId}-percent`}>
          {Math.round(value * 100)}%
        </span>
      </div>
      <ProgressBar
        value={value}
        intent={state === 'failed' ? 'danger' : state === 'completed' ? 'success' : 'primary'}
        animate={running}
        stripes={running}
        data-testid={`${testId}-progress-bar`}
      />
      {job?.state === 'failed' && (
        <Callout intent="danger" className="pf-job-msg" data-testid={`${testId}-error`}>
          {failure(job)}
        </Callout>
      )}
      {streamError && (
        <Callout intent="warning" className="pf-job-msg" data-testid={`${testId}-stream-error`}>
          Progress could not be followed: {streamError}
        </Callout>
      )}
    </div>
  );
}
