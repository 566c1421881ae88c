import { HTMLSelect, HTMLTable, Spinner, Tag } from '@blueprintjs/core';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { Link, useSearchParams } from 'react-router-dom';
import { DESK_STATES, FIGURE_STATUS_LABELS, type DeskState, type ReviewDeskItemDto } from '@psiform/contracts';
import { useApi } from '../auth/AuthProvider';
import { formatDate } from '../figures/model';
import { usePublications } from '../figures/usePublications';
import { formatAge } from './format';
import { EmptyState, QueryStatus } from '../components/QueryStatus';
import { TableHead } from '../components/TableHead';
import { filteredReviewDesk, type DeskFilter } from './proofApi';

/** Age filters (waited at least): our choice of steps an editor thinks in. */
export const AGE_STEPS: { hours: number; label: string }[] = [
  { hours: 0, label: 'Any age' },
  { hours: 24, label: 'Over a day' },
  { hours: 72, label: 'Over 3 days' },
  { hours: 168, label: 'Over a week' },
];

/** The desk's filter lives in the URL (?publication=&state=&age=), so a filtered desk can be bookmarked or shared. */
export function filterFromSearch(sp: URLSearchParams): DeskFilter {
  const state = sp.get('state');
  const age = Number(sp.get('age'));
  return {
    publicationId: sp.get('publication') || undefined,
    state: (DESK_STATES as readonly string[]).includes(state ?? '') ? (state as DeskState) : 'in_review',
    minAgeHours: AGE_STEPS.some((s) => s.hours === age) && age > 0 ? age : undefined,
  };
}

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
  const [sp, setSp] = useSearchParams();
  const filter = filterFromSearch(sp);
  const pubs = usePublications();
  const desk = useQuery({
    queryKey: ['review-desk', filter],
    queryFn: ({ signal }) => filteredReviewDesk(api, filter, signal),
    refetchInterval: 60_000,
    placeholderData: keepPreviousData,
  });
  const setParam = (k: string, v: string) => {
    const next = new URLSearchParams(sp);
    if (v) next.set(k, v);
    else next.delete(k);
    setSp(next, { replace: true });
  };
  const filtered = Boolean(filter.publicationId || filter.state !== 'in_review' || filter.minAgeHours);

  return (
    <div className="pf-page pf-page-wide" data-testid="review-desk">
      <header className="pf-page-head">
        <h1>Review desk</h1>
        <p className="pf-muted">Proofs waiting in the publications you belong to, the longest-waiting first.</p>
      </header>
      <div className="pf-toolbar" data-testid="desk-filters">
        <HTMLSelect
          value={filter.publicationId ?? ''}
          onChange={(e) => setParam('publication', e.currentTarget.value)}
          aria-label="Filter by publication"
          data-testid="desk-filter-publication"
          options={[{ value: '', label: 'Every publication' }, ...(pubs.data ?? []).map((p) => ({ value: p.id, label: p.title }))]}
        />
        <HTMLSelect
          value={filter.state}
          onChange={(e) => setParam('state', e.currentTarget.value === 'in_review' ? '' : e.currentTarget.value)}
          aria-label="Filter by state"
          data-testid="desk-filter-state"
          options={DESK_STATES.map((st) => ({ value: st, label: FIGURE_STATUS_LABELS[st] }))}
        />
        <HTMLSelect
          value={String(filter.minAgeHours ?? 0)}
          onChange={(e) => setParam('age', e.currentTarget.value === '0' ? '' : e.currentTarget.value)}
          aria-label="Filter by age"
          data-testid="desk-filter-age"
          options={AGE_STEPS.map((a) => ({ value: String(a.hours), label: a.label }))}
        />
        {desk.isFetching && !desk.isPending && <Spinner size={16} aria-label="Refreshing" />}
      </div>

      <QueryStatus query={desk} what="the review desk" testId="review-desk" />
      {desk.isSuccess && desk.data.length === 0 && (filtered
        ? <EmptyState testId="review-desk" icon="filter" title="No proofs match" description="Nothing in the publications you belong to matches these filters." />
        : <EmptyState testId="review-desk" icon="tick-circle" title="No proofs waiting" description="When an illustrator submits a figure for review it appears here." />)}
      {desk.isSuccess && desk.data.length > 0 && (
        <HTMLTable className="pf-table" striped interactive data-testid="review-desk-table">
          <TableHead columns={['Title', 'Publication', 'Illustrator', 'Version', 'State', 'Waiting', 'Needs']} />
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
                <td data-testid="desk-state">{FIGURE_STATUS_LABELS[item.status]}</td>
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
