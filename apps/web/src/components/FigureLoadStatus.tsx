import { Callout, NonIdealState, Spinner } from '@blueprintjs/core';
import type { UseQueryResult } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { ApiError, describeError } from '../api/client';

/**
 * The whole-page states of a page about one figure (its page, its proof) while the figure loads or when it cannot:
 * a spinner ("Loading the proof…", `<testId>-loading`); "Figure not found" for 404 and 403 alike (so a figure of
 * another publication does not reveal that it exists), else the server's reason (`<testId>-error`), with a way back.
 * Returns null once the figure is there.
 */
export function FigureLoadStatus({ figure, what, testId, back }: { figure: Pick<UseQueryResult<unknown>, 'isPending' | 'isError' | 'error'>; what: string; testId: string; back: { to: string; text: string } }) {
  if (figure.isPending)
    return (
      <div className="pf-page" data-testid={`${testId}-loading`}>
        <NonIdealState icon={<Spinner size={32} />} title={`Loading the ${what}…`} />
      </div>
    );
  if (figure.isError) {
    const notFound = figure.error instanceof ApiError && (figure.error.status === 404 || figure.error.status === 403);
    return (
      <div className="pf-page">
        <Callout intent={notFound ? 'warning' : 'danger'} title={notFound ? 'Figure not found' : `The ${what} could not be loaded`} data-testid={`${testId}-error`}>
          <p>{notFound ? 'There is no such figure in the publications you belong to.' : describeError(figure.error)}</p>
          <Link to={back.to}>{back.text}</Link>
        </Callout>
      </div>
    );
  }
  return null;
}
