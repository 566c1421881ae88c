import type { ReactNode } from 'react';
import { Callout, Spinner } from '@blueprintjs/core';
import type { UseQueryResult } from '@tanstack/react-query';
import { describeError } from '../api/client';
import { formatDate } from '../figures/model';
import { auditWords } from '../review/format';

/** What every history shows of one audit entry. */
export interface TimelineEntry {
  id: string;
  at: string;
  action: string;
  actorName?: string | null;
  note?: string | null;
}

/**
 * A history as a timeline, the same for a figure and for a user, publication or house style: a spinner while it
 * loads, the server's reason when it cannot, "Nothing recorded yet." when empty, else who did what and when (in the
 * order given). Test ids: `<testId>-error`, `<testId>-empty`, `<testId>-entry` (with data-action), and the list
 * `listTestId` (default `testId`). `detail` adds words after the action (e.g. a status change).
 */
export function AuditTimeline<D, E extends TimelineEntry>({
  query,
  entries,
  testId,
  listTestId = testId,
  detail,
}: {
  query: UseQueryResult<D>;
  entries: (data: D) => E[];
  testId: string;
  listTestId?: string;
  detail?: (entry: E) => ReactNode;
}) {
  if (query.isPending) return <Spinner size={20} />;
  if (query.isError)
    return (
      <Callout intent="danger" data-testid={`${testId}-error`}>
        The history could not be loaded: {describeError(query.error)}
      </Callout>
    );
  const items = entries(query.data);
  if (items.length === 0) return <p className="pf-muted" data-testid={`${testId}-empty`}>Nothing recorded yet.</p>;
  return (
    <ol className="pf-timeline" data-testid={listTestId}>
      {items.map((e) => (
        <li key={e.id} data-testid={`${testId}-entry`} data-action={e.action}>
          <span className="pf-timeline-when">{formatDate(e.at)}</span>
          <span className="pf-timeline-what">
            <strong>{e.actorName ?? 'Psiform'}</strong> {auditWords(e.action)}
            {detail?.(e)}
          </span>
          {e.note && <span className="pf-timeline-note">{e.note}</span>}
        </li>
      ))}
    </ol>
  );
}
