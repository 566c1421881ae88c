import { statusLabel } from '../figures/model';
import { AuditTimeline } from '../components/AuditTimeline';
import { useFigureAudit } from './DecisionBar';

/** Compact timeline of what happened to the figure: who, when, from -> to, note (in the order written). */
export function AuditTrail({ figureId }: { figureId: string }) {
  const audit = useFigureAudit(figureId);
  return (
    <AuditTimeline
      query={audit}
      entries={(entries) => entries}
      testId="audit"
      listTestId="audit-trail"
      detail={(e) =>
        e.fromStatus && e.toStatus && e.fromStatus !== e.toStatus ? (
          <span className="pf-muted" data-testid="audit-move">
            {' '}
            · {statusLabel(e.fromStatus)} → {statusLabel(e.toStatus)}
          </span>
        ) : null
      }
    />
  );
}
