import { Callout, Spinner } from '@blueprintjs/core';
import { describeError } from '../api/client';
import { formatDate, statusLabel } from '../figures/model';
import { useFigureAudit } from './DecisionBar';
import { auditWords } from './format';

/** Compact timeline of what happened to the figure: who, when, from -> to, note (in the order written). */
export function AuditTrail({ figureId }: { figureId: string }) {
  const audit = useFigureAudit(figureId);
  if (audit.isPending) return <Spinner size={20} />;
  if (audit.isError)
    return (
      <Callout intent="danger" data-testid="audit-error">
        The history could not be loaded: {describeError(audit.error)}
      </Callout>
    );
  if (audit.data.length === 0) return <p className="pf-muted" data-testid="audit-empty">Nothing recorded yet.</p>;
  return (
    <ol className="pf-timeline" data-testid="audit-trail">
      {audit.data.map((e) => {
        const moved = e.fromStatus && e.toStatus && e.fromStatus !== e.toStatus;
        return (
          <li key={e.id} data-testid="audit-entry" data-action={e.action}>
            <span className="pf-timeline-when">{formatDate(e.at)}</span>
            <span className="pf-timeline-what">
              <strong>{e.actorName ?? 'Psiform'}</strong> {auditWords(e.action)}
              {moved && (
                <span className="pf-muted" data-testid="audit-move">
                  {' '}
                  · {statusLabel(e.fromStatus!)} → {statusLabel(e.toStatus!)}
                </span>
              )}
            </span>
            {e.note && <span className="pf-timeline-note">{e.note}</span>}
          </li>
        );
      })}
    </ol>
  );
}
