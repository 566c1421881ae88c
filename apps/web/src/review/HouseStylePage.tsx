import { Callout, NonIdealState, Spinner } from '@blueprintjs/core';
import { Link, useParams } from 'react-router-dom';
import { describeError } from '../api/client';
import { usePublications } from '../figures/usePublications';
import { HouseStylePanel } from './HouseStylePanel';
import { LengthUnitPanel } from './LengthUnitPanel';

/** /publications/:publicationId/house-style: the publication's house style panel. */
export function HouseStylePage() {
  const { publicationId = '' } = useParams<{ publicationId: string }>();
  const publications = usePublications();
  const pub = publications.data?.find((p) => p.id === publicationId);
  return (
    <div className="pf-page" data-testid="house-style-page">
      <header className="pf-page-head">
        <p className="pf-crumbs">
          <Link to="/publications">Publications</Link>
        </p>
        <h1>House style{pub ? `: ${pub.title}` : ''}</h1>
        <p className="pf-muted">One swatchbook per publication, the colour sign-off rule, whether figures may override the colours, and the one length unit of its figures.</p>
      </header>
      {publications.isPending && <NonIdealState icon={<Spinner size={32} />} title="Loading…" />}
      {publications.isError && <Callout intent="danger">{describeError(publications.error)}</Callout>}
      {publications.isSuccess && !pub && (
        <Callout intent="warning" title="Publication not found" data-testid="house-style-unknown">
          You are not a member of this publication, or it does not exist.
        </Callout>
      )}
      {pub && (
        <section className="pf-section">
          <HouseStylePanel publicationId={pub.id} />
          <LengthUnitPanel publication={pub} />
        </section>
      )}
    </div>
  );
}
