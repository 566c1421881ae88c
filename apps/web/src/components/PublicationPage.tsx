import type { ReactNode } from 'react';
import { Callout, NonIdealState, Spinner } from '@blueprintjs/core';
import type { PublicationDto } from '@psiform/contracts';
import { Link, useParams } from 'react-router-dom';
import { describeError } from '../api/client';
import { usePublications } from '../figures/usePublications';

/**
 * A page about one of the user's publications (/publications/:publicationId/…): the crumbs back to Publications, the
 * title with the publication's name, an introduction, and the states of finding the publication among the user's
 * own ("Publication not found" when it is not one of them). `children` renders the page for the publication found.
 * Test ids: `<testId>-page`, `<testId>-unknown`.
 */
export function PublicationPage({ title, intro, testId, children }: { title: string; intro: ReactNode; testId: string; children(pub: PublicationDto): ReactNode }) {
  const { publicationId = '' } = useParams<{ publicationId: string }>();
  const publications = usePublications();
  const pub = publications.data?.find((p) => p.id === publicationId);
  return (
    <div className="pf-page" data-testid={`${testId}-page`}>
      <header className="pf-page-head">
        <p className="pf-crumbs">
          <Link to="/publications">Publications</Link>
        </p>
        <h1>
          {title}
          {pub ? `: ${pub.title}` : ''}
        </h1>
        <p className="pf-muted">{intro}</p>
      </header>
      {publications.isPending && <NonIdealState icon={<Spinner size={32} />} title="Loading…" />}
      {publications.isError && <Callout intent="danger">{describeError(publications.error)}</Callout>}
      {publications.isSuccess && !pub && (
        <Callout intent="warning" title="Publication not found" data-testid={`${testId}-unknown`}>
          You are not a member of this publication, or it does not exist.
        </Callout>
      )}
      {pub && children(pub)}
    </div>
  );
}
