import { PublicationPage } from '../components/PublicationPage';
import { HouseStylePanel } from './HouseStylePanel';
import { LengthUnitPanel } from './LengthUnitPanel';

/** /publications/:publicationId/house-style: the publication's house style panel. */
export function HouseStylePage() {
  return (
    <PublicationPage
      title="House style"
      intro="One swatchbook per publication, the colour sign-off rule, whether figures may override the colours, and the one length unit of its figures."
      testId="house-style"
    >
      {(pub) => (
        <section className="pf-section">
          <HouseStylePanel publicationId={pub.id} />
          <LengthUnitPanel publication={pub} />
        </section>
      )}
    </PublicationPage>
  );
}
