import type { ReactNode } from 'react';
import { Button, Callout, NonIdealState, Spinner, type IconName } from '@blueprintjs/core';
import type { UseQueryResult } from '@tanstack/react-query';
import { describeError } from '../api/client';

/**
 * The loading and error states of a list's query, the same on every page: a spinner while it loads ("Loading
 * publications…"), and on failure the server's reason with a retry ("Publications could not be loaded"). Test ids:
 * `<testId>-loading`, `<testId>-error`.
 */
export function QueryStatus({ query, what, testId }: { query: Pick<UseQueryResult<unknown>, 'isPending' | 'isError' | 'error' | 'isFetching' | 'refetch'>; what: string; testId: string }) {
  if (query.isPending) {
    return (
      <div data-testid={`${testId}-loading`}>
        <NonIdealState icon={<Spinner size={32} />} title={`Loading ${what}…`} />
      </div>
    );
  }
  if (query.isError) {
    return (
      <Callout intent="danger" title={`${what.charAt(0).toUpperCase()}${what.slice(1)} could not be loaded`} data-testid={`${testId}-error`}>
        <p>{describeError(query.error)}</p>
        <Button text="Try again" icon="refresh" onClick={() => void query.refetch()} loading={query.isFetching} />
      </Callout>
    );
  }
  return null;
}

/** A list with nothing in it: what is missing and what to do about it (`<testId>-empty`). */
export function EmptyState({ testId, icon, title, description }: { testId: string; icon: IconName; title: ReactNode; description: ReactNode }) {
  return (
    <div data-testid={`${testId}-empty`}>
      <NonIdealState icon={icon} title={title} description={description} />
    </div>
  );
}
