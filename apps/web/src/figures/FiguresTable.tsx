import { useEffect, useState } from 'react';
import { HTMLSelect, HTMLTable, InputGroup, NonIdealState, Spinner, Tag } from '@blueprintjs/core';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { FIGURE_STATUSES, type FigureSortKey, type FigureStatus, type FigureSummaryDto } from '@psiform/contracts';
import { type FigureListParams } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { Pager, SortHeader, nextSort, useDebounced, SEARCH_DEBOUNCE_MS } from '../components/TableParts';
import { formatDate, statusLabel } from './model';
import { Typeset } from '../components/Typeset';
import { plainLabel } from '@psiform/print';
import { QueryStatus } from '../components/QueryStatus';

export const PAGE_SIZE = 25;
export { SEARCH_DEBOUNCE_MS };

const COLUMNS: { key: string; label: string; sort?: FigureSortKey }[] = [
  { key: 'thumbnail', label: 'Preview' },
  { key: 'title', label: 'Title', sort: 'title' },
  { key: 'label', label: 'Label' },
  { key: 'status', label: 'Status', sort: 'status' },
  { key: 'owner', label: 'Owner' },
  { key: 'version', label: 'Version', sort: 'versionNumber' },
  { key: 'updated', label: 'Updated', sort: 'updatedAt' },
];

export function statusIntent(s: FigureStatus | string) {
  switch (s) {
    case 'approved':
    case 'released':
      return 'success' as const;
    case 'changes_requested':
      return 'warning' as const;
    case 'in_review':
      return 'primary' as const;
    default:
      return 'none' as const;
  }
}

/** Shown size of the worker's 320 × 240 thumbnail (same 4:3 aspect). */
export const THUMB_WIDTH = 64;
export const THUMB_HEIGHT = 48;

/** A row's thumbnail (presigned link from the list), or a neutral box of the same size while there is none. */
export function FigureThumbnail({ figure }: { figure: Pick<FigureSummaryDto, 'title' | 'label' | 'thumbnailUrl'> }) {
  const [failed, setFailed] = useState(false);
  useEffect(() => setFailed(false), [figure.thumbnailUrl]);
  if (!figure.thumbnailUrl || failed) {
    return (
      <span
        className="pf-thumb pf-thumb-none"
        style={{ width: THUMB_WIDTH, height: THUMB_HEIGHT }}
        role="img"
        aria-label={figure.thumbnailUrl ? 'Preview could not be loaded' : 'No preview yet'}
        data-testid="figure-thumb-none"
      />
    );
  }
  return (
    <img
      className="pf-thumb"
      src={figure.thumbnailUrl}
      width={THUMB_WIDTH}
      height={THUMB_HEIGHT}
      loading="lazy"
      decoding="async"
      alt={figure.label ? `${figure.title} (${plainLabel(figure.label)})` : figure.title}
      onError={() => setFailed(true)}
      data-testid="figure-thumb"
    />
  );
}

/** The figures of one publication: searchable, filterable by proof state, sortable, paged by the server. */
export function FiguresTable({ publicationId, pageSize = PAGE_SIZE }: { publicationId: string; pageSize?: number }) {
  const api = useApi();
  const [page, setPage] = useState(1);
  const [search, setSearch] = useState('');
  const [status, setStatus] = useState<FigureStatus | ''>('');
  const [sort, setSort] = useState<FigureSortKey>('updatedAt');
  const [order, setOrder] = useState<'asc' | 'desc'>('desc');
  const q = useDebounced(search, SEARCH_DEBOUNCE_MS);

  // A new publication, search or filter starts again on page 1.
  useEffect(() => setPage(1), [publicationId, q, status]);

  const params: FigureListParams = { publicationId, page, pageSize, q, status, sort, order };
  const figures = useQuery({
    queryKey: ['figures', params],
    queryFn: ({ signal }) => api.listFigures(params, signal),
    placeholderData: keepPreviousData,
  });

  const total = figures.data?.total ?? 0;
  const items = figures.data?.items ?? [];

  function toggleSort(key: FigureSortKey) {
    const next = nextSort({ sort, order }, key, ['updatedAt', 'versionNumber']);
    setSort(next.sort);
    setOrder(next.order);
    setPage(1);
  }

  return (
    <section className="pf-figures" aria-label="Figures">
      <div className="pf-toolbar">
        <InputGroup
          type="search"
          leftIcon="search"
          placeholder="Search titles and labels"
          value={search}
          onValueChange={(v) => setSearch(v)}
          aria-label="Search figures"
          data-testid="figures-search"
          className="pf-search"
        />
        <HTMLSelect
          value={status}
          onChange={(e) => setStatus(e.currentTarget.value as FigureStatus | '')}
          aria-label="Filter by status"
          data-testid="figures-status"
          options={[{ value: '', label: 'Any status' }, ...FIGURE_STATUSES.map((s) => ({ value: s, label: statusLabel(s) }))]}
        />
        {figures.isFetching && !figures.isPending && <Spinner size={16} aria-label="Refreshing" />}
      </div>

      <QueryStatus query={figures} what="figures" testId="figures" />

      {figures.isSuccess && items.length === 0 && (
        <div data-testid="figures-empty">
          <NonIdealState
            icon="inbox"
            title={q || status ? 'No figures match' : 'No figures yet'}
            description={
              q || status
                ? 'Nothing in this publication matches the search and status filter.'
                : 'This publication has no figures yet. Create one, or upload a density cube.'
            }
          />
        </div>
      )}

      {figures.isSuccess && items.length > 0 && (
        <>
          <HTMLTable className="pf-table" striped interactive data-testid="figures-table">
            <thead>
              <tr>
                {COLUMNS.map((c) =>
                  c.sort ? (
                    <SortHeader key={c.key} label={c.label} sortKey={c.sort} state={{ sort, order }} onSort={toggleSort} />
                  ) : (
                    <th key={c.key} scope="col">
                      {c.label}
                    </th>
                  ),
                )}
              </tr>
            </thead>
            <tbody>
              {items.map((f) => (
                <tr key={f.id} data-testid="figure-row">
                  <td className="pf-thumb-cell">
                    <FigureThumbnail figure={f} />
                  </td>
                  <td>
                    <Link to={`/figures/${encodeURIComponent(f.id)}`} data-testid="figure-title">
                      {f.title}
                    </Link>
                  </td>
                  <td data-testid="figure-label">{f.label ? <Typeset text={f.label} /> : '—'}</td>
                  <td>
                    <Tag minimal intent={statusIntent(f.status)} data-testid="figure-status">
                      {statusLabel(f.status)}
                    </Tag>
                  </td>
                  <td data-testid="figure-owner">{f.ownerName ?? f.ownerId}</td>
                  <td data-testid="figure-version">v{f.versionNumber}</td>
                  <td data-testid="figure-updated">{formatDate(f.updatedAt)}</td>
                </tr>
              ))}
            </tbody>
          </HTMLTable>
          <Pager page={page} pageSize={pageSize} total={total} onPage={setPage} testIdPrefix="figures" />
        </>
      )}
    </section>
  );
}
