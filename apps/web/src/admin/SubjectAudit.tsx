import { Callout, Spinner } from '@blueprintjs/core';
import { useQuery } from '@tanstack/react-query';
import { describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { formatDate } from '../figures/model';
import { auditWords } from '../review/format';
import { subjectAudit } from './adminApi';

/** History of a user, publication or house style (newest first): who did what, when, in words. */
export function SubjectAudit({ kind, id }: { kind: 'user' | 'publication' | 'house_style'; id: string }) {
  const api = useApi();
  const audit = useQuery({ queryKey: ['subject-audit', kind, id], queryFn: ({ signal }) => subjectAudit(api, kind, id, signal) });
  if (audit.isPending) return <Spinner size={20} />;
  if (audit.isError)
    return (
      <Callout intent="danger" data-testid="subject-audit-error">
        The history could not be loaded: {describeError(audit.error)}
      </Callout>
    );
  if (audit.data.items.length === 0) return <p className="pf-muted" data-testid="subject-audit-empty">Nothing recorded yet.</p>;
  return (
    <ol className="pf-timeline" data-testid="subject-audit">
      {audit.data.items.map((e) => (
        <li key={e.id} data-testid="subject-audit-entry" data-action={e.action}>
          <span className="pf-timeline-when">{formatDate(e.at)}</span>
          <span className="pf-timeline-what">
            <strong>{e.actorName ?? 'Psiform'}</strong> {auditWords(e.action)}
          </span>
          {e.note && <span className="pf-timeline-note">{e.note}</span>}
        </li>
      ))}
    </ol>
  );
}
