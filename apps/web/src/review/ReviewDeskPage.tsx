import { HTMLTable, Tag } from '@blueprintjs/core';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { ReviewDeskItemDto } from '@psiform/contracts';
import { useApi } from '../auth/AuthProvider';
import { formatDate } from '../figures/model';
import { formatAge } from './format';
import { reviewDesk } from './reviewApi';
import { EmptyState, QueryStatus } from '../components/QueryStatus';
import { TableHead } from '../components/TableHead';

/** Oldest first: the proof that has waited longest is reviewed first. Ties by title. */
export function sortOldestFirst(items: readonly ReviewDeskItemDto[]): ReviewDeskItemDto[] {
  return [...items].sort((a, b) => b.ageHours - a.ageHours || a.title.localeCompare(b.title));
}

function waitingFor(item: ReviewDeskItemDto): string {
  const parts: string[] = [];
  if (!item.editorApproved) parts.push('editor');
  if (item.requireColourSignOff && !item.colourSignedOff) parts.push('colour sign-off');
  return parts.join(' + ');
}

export function ReviewDeskPage() {
  const api = useApi();
  const desk = useQuery({
    queryKey: ['review-desk'],
    queryFn: ({ signal }) => reviewDesk(api, signal),
    refetchInterval: 60_000,
  });

  return (
    <div className="pf-page pf-page-wide" data-testid="review-desk">
      <header className="pf-page-head">
        <h1>Review desk</h1>
        <p className="pf-muted">Proofs waiting in the publications you belong to, the longest-waiting first.</p>
      </header>

      <QueryStatus query={desk} what="the review desk" testId="review-desk" />
      {desk.isSuccess && desk.data.length === 0 && <EmptyState testId="review-desk" icon="tick-circle" title="No proofs waiting" description="When an illustrator submits a figure for review it appears here." />}
      {desk.isSuccess && desk.data.length > 0 && (
        <HTMLTable className="pf-table" striped interactive data-testid="review-desk-table">
          <TableHead columns={['Title', 'Publication', 'Illustrator', 'Version', 'Waiting', 'Needs']} />
          <tbody>
            {sortOldestFirst(desk.data).map((item) => (
              <tr key={item.figureId} data-testid="desk-row">
                <td>
                  <Link to={`/figures/${encodeURIComponent(item.figureId)}/proof`} data-testid="desk-title">
                    {item.title}
                  </Link>
                </td>
                <td data-testid="desk-publication">{item.publicationTitle}</td>
                <td data-testid="desk-illustrator">{item.submittedBy ?? '—'}</td>
                <td data-testid="desk-version">v{item.versionNumber}</td>
                <td data-testid="desk-age" title={`submitted ${formatDate(item.submittedAt)}`}>
                  {formatAge(item.ageHours)}
                </td>
                <td>
                  <Tag minimal data-testid="desk-needs">
                    {waitingFor(item) || 'complete'}
                  </Tag>
                </td>
              </tr>
            ))}
          </tbody>
        </HTMLTable>
      )}
    </div>
  );
}
