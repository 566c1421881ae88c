import { useEffect, useState } from 'react';
import { Button } from '@blueprintjs/core';

/** Typing pauses this long before a search is sent. */
export const SEARCH_DEBOUNCE_MS = 300;

export function useDebounced<T>(value: T, ms: number): T {
  const [v, setV] = useState(value);
  useEffect(() => {
    const t = setTimeout(() => setV(value), ms);
    return () => clearTimeout(t);
  }, [value, ms]);
  return v;
}

export interface SortState<K extends string> {
  sort: K;
  order: 'asc' | 'desc';
}

/** A column header that sorts the table by its key (click again to reverse); the one sortable header of every table. */
export function SortHeader<K extends string>({ label, sortKey, state, onSort }: { label: string; sortKey: K; state: SortState<K>; onSort(key: K): void }) {
  const active = state.sort === sortKey;
  return (
    <th scope="col" aria-sort={active ? (state.order === 'asc' ? 'ascending' : 'descending') : undefined}>
      <button type="button" className={active ? 'pf-sort pf-sort-active' : 'pf-sort'} onClick={() => onSort(sortKey)} data-testid={`sort-${sortKey}`}>
        {label}
        <span aria-hidden="true" className="pf-sort-mark">
          {active ? (state.order === 'asc' ? '▲' : '▼') : '↕'}
        </span>
      </button>
    </th>
  );
}

/** Next sort state after a click on `key`: same key reverses; a new key starts in its natural order. */
export function nextSort<K extends string>(state: SortState<K>, key: K, descFirst: readonly K[] = []): SortState<K> {
  if (state.sort === key) return { sort: key, order: state.order === 'asc' ? 'desc' : 'asc' };
  return { sort: key, order: descFirst.includes(key) ? 'desc' : 'asc' };
}

/** "1–25 of 60 · page 1 of 3" with Previous / Next; test ids `<prefix>-prev|next|page-info`. */
export function Pager({ page, pageSize, total, onPage, testIdPrefix }: { page: number; pageSize: number; total: number; onPage(page: number): void; testIdPrefix: string }) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const first = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const last = Math.min(total, page * pageSize);
  return (
    <div className="pf-pager">
      <Button icon="chevron-left" text="Previous" variant="minimal" disabled={page <= 1} onClick={() => onPage(Math.max(1, page - 1))} data-testid={`${testIdPrefix}-prev`} />
      <span data-testid={`${testIdPrefix}-page-info`}>
        {first}–{last} of {total} · page {page} of {pages}
      </span>
      <Button endIcon="chevron-right" text="Next" variant="minimal" disabled={page >= pages} onClick={() => onPage(Math.min(pages, page + 1))} data-testid={`${testIdPrefix}-next`} />
    </div>
  );
}
