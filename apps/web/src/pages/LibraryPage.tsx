import { AnchorButton, Button, Callout, NonIdealState, Spinner } from '@blueprintjs/core';
import { Link, useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { describeError } from '../api/client';
import { useAuth } from '../auth/AuthProvider';
import { FiguresTable } from '../figures/FiguresTable';
import { PublicationChooser } from '../figures/PublicationChooser';
import { usePublications } from '../figures/usePublications';

/**
 * The figures of a publication. Reached as /library (publication from ?publicationId= or the first one)
 * and as /publications/:publicationId/figures from a publication card.
 */
export function LibraryPage() {
  const { user } = useAuth();
  const params = useParams<{ publicationId?: string }>();
  const [search, setSearch] = useSearchParams();
  const navigate = useNavigate();
  const publications = usePublications();

  const list = publications.data ?? [];
  const wanted = params.publicationId ?? search.get('publicationId') ?? '';
  const current = list.find((p) => p.id === wanted) ?? (params.publicationId ? undefined : list[0]);

  function choose(id: string) {
    if (params.publicationId) navigate(`/publications/${encodeURIComponent(id)}/figures`);
    else setSearch({ publicationId: id }, { replace: true });
  }

  const canCreate = user?.role === 'illustrator';
  const q = current ? `?publicationId=${encodeURIComponent(current.id)}` : '';

  return (
    <div className="pf-page pf-page-wide" data-testid="library-page">
      <header className="pf-page-head pf-head-row">
        <div>
          <h1>Library</h1>
          <p className="pf-muted">
            {current ? (
              <>
                Figures of <strong data-testid="library-publication">{current.title}</strong>
              </>
            ) : (
              'Figures of the publications you belong to.'
            )}
          </p>
        </div>
        {canCreate && current && (
          <div className="pf-head-actions">
            <Link to={`/uploads/new${q}`} className="pf-quiet-link" data-testid="library-upload">
              Upload a density cube
            </Link>
            <AnchorButton
              intent="primary"
              icon="plus"
              text="New figure"
              href={`/composer${q}`}
              onClick={(e) => {
                e.preventDefault();
                navigate(`/composer${q}`);
              }}
              data-testid="library-new-figure"
            />
          </div>
        )}
      </header>

      {publications.isPending && (
        <div data-testid="publications-loading">
          <NonIdealState icon={<Spinner size={32} />} title="Loading publications…" />
        </div>
      )}
      {publications.isError && (
        <Callout intent="danger" title="Publications could not be loaded" data-testid="publications-error">
          <p>{describeError(publications.error)}</p>
          <Button text="Try again" icon="refresh" onClick={() => void publications.refetch()} />
        </Callout>
      )}
      {publications.isSuccess && list.length === 0 && (
        <div data-testid="publications-empty">
          <NonIdealState
            icon="inbox"
            title="No publications yet"
            description="Figures belong to a publication, and you are not a member of any. An administrator can add you to one."
          />
        </div>
      )}
      {publications.isSuccess && list.length > 0 && !current && (
        <Callout intent="warning" title="Publication not found" data-testid="library-unknown-publication">
          You are not a member of this publication, or it does not exist. <Link to="/library">Open the library</Link>.
        </Callout>
      )}
      {current && (
        <>
          <PublicationChooser publications={list} value={current.id} onChange={choose} inline />
          <FiguresTable publicationId={current.id} />
        </>
      )}
    </div>
  );
}
