import { Button, Callout, HTMLTable, NonIdealState, Spinner, Tag } from '@blueprintjs/core';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { ReviewDeskItemDto } from '@psiform/contracts';
import { describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { formatDate } from '../figures/model';
import { formatAge } from './format';
import { reviewDesk } from './reviewApi';

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

      {desk.isPending && (
        <div data-testid="review-desk-loading">
          <NonIdealState icon={<Spinner size={32} />} title="Loading the review desk…" />
        </div>
      )}
      {desk.isError && (
        <Callout intent="danger" title="The review desk could not be loaded" data-testid="review-desk-error">
          <p>{describeError(desk.error)}</p>
          <Button text="Try again" icon="refresh" onClick={() => void desk.refetch()} loading={desk.isFetching} />
        </Callout>
      )}
      {desk.isSuccess && desk.data.length === 0 && (
        <div data-testid="review-desk-empty">
          <NonIdealState icon="tick-circle" title="No proofs waiting" description="When an illustrator submits a figure for review it appears here." />
        </div>
      )}
      {desk.isSuccess && desk.data.length > 0 && (
        <HTMLTable className="pf-table" striped interactive data-testid="review-desk-table">
          <thead>
            <tr>
              <th>Title</th>
              <th>Publication</th>
              <th>Illustrator</th>
              <th>Version</th>
              <th>Waiting</th>
              <th>Needs</th>
            </tr>
          </thead>
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
