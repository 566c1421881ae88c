import { Button, Callout, Card, NonIdealState, Spinner, Tag } from '@blueprintjs/core';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { PublicationDto } from '@psiform/contracts';
import { describeError } from '../api/client';
import { useApi, useAuth } from '../auth/AuthProvider';
import { canOpen, NAV_ITEMS } from '../nav/navigation';

const KIND_LABELS: Record<PublicationDto['kind'], string> = {
  book: 'Book',
  journal_volume: 'Journal volume',
};

function kindLabel(kind: string): string {
  return (KIND_LABELS as Record<string, string>)[kind] ?? kind;
}

export function PublicationsPage() {
  const api = useApi();
  const { user } = useAuth();
  const publications = useQuery({
    queryKey: ['publications', user?.id],
    queryFn: ({ signal }) => api.publications(signal),
  });
  const library = NAV_ITEMS.find((i) => i.path === '/library');
  const showFigures = Boolean(user && library && library.ready && canOpen(user.role, library));

  return (
    <div className="pf-page" data-testid="publications-page">
      <header className="pf-page-head">
        <h1>Publications</h1>
        <p className="pf-muted">The books and journal volumes you are a member of.</p>
      </header>

      {publications.isPending && (
        <div data-testid="publications-loading">
          <NonIdealState icon={<Spinner size={32} />} title="Loading publications…" />
        </div>
      )}

      {publications.isError && (
        <Callout intent="danger" title="Publications could not be loaded" data-testid="publications-error">
          <p>{describeError(publications.error)}</p>
          <Button text="Try again" icon="refresh" onClick={() => void publications.refetch()} loading={publications.isFetching} />
        </Callout>
      )}

      {publications.isSuccess && publications.data.length === 0 && (
        <div data-testid="publications-empty">
          <NonIdealState
            icon="inbox"
            title="No publications yet"
            description="You are not a member of any publication. An administrator can add you to one."
          />
        </div>
      )}

      {publications.isSuccess && publications.data.length > 0 && (
        <ul className="pf-pub-list" data-testid="publications-list" aria-label="Publications">
          {publications.data.map((p) => (
            <li key={p.id}>
              <Card className="pf-pub" data-testid="publication-card">
                <div className="pf-pub-head">
                  <h2 className="pf-pub-title" data-testid="publication-title">
                    {p.title}
                  </h2>
                  <Tag minimal className="pf-kind" data-testid="publication-kind">
                    {kindLabel(p.kind)}
                  </Tag>
                </div>
                <p className="pf-pub-publisher" data-testid="publication-publisher">
                  {p.publisher}
                </p>
                {p.description && (
                  <p className="pf-pub-desc" data-testid="publication-description">
                    {p.description}
                  </p>
                )}
                {showFigures && (
                  <p className="pf-pub-links">
                    <Link to={`/publications/${encodeURIComponent(p.id)}/figures`} data-testid="publication-figures">
                      Figures
                    </Link>
                  </p>
                )}
                <p className="pf-pub-links">
                  <Link to={`/publications/${encodeURIComponent(p.id)}/house-style`} data-testid="publication-house-style">
                    House style
                  </Link>{' '}
                  ·{' '}
                  <Link to={`/publications/${encodeURIComponent(p.id)}/delivery-profile`} data-testid="publication-delivery-profile">
                    Delivery profile
                  </Link>
                </p>
              </Card>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
