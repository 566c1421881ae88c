import { Link } from 'react-router-dom';
import type { FigureDto } from '@psiform/contracts';
import { AuditTrail } from './AuditTrail';
import { DecisionBar } from './DecisionBar';

/** The review part of the figure page: decisions for the signed-in role, a link to the proof view, the history. */
export function FigureReview({ figure }: { figure: FigureDto }) {
  return (
    <section className="pf-section" data-testid="figure-review">
      <div className="pf-head-row">
        <h2>Review</h2>
        <Link to={`/figures/${encodeURIComponent(figure.id)}/proof`} data-testid="open-proof">
          Open the proof view (comments and pins)
        </Link>
      </div>
      <DecisionBar figure={figure} />
      <h3>History</h3>
      <AuditTrail figureId={figure.id} />
    </section>
  );
}
