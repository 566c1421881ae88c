import { useState } from 'react';
import { Callout, NonIdealState, Spinner, Tag } from '@blueprintjs/core';
import { useQuery } from '@tanstack/react-query';
import { Link, useParams } from 'react-router-dom';
import type { AssetDto } from '@psiform/contracts';
import { ApiError, describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { statusIntent } from '../figures/FiguresTable';
import { statusLabel } from '../figures/model';
import { Viewport } from '../pages/FigurePage';
import { AuditTrail } from './AuditTrail';
import { CommentsPanel, numberPins } from './CommentsPanel';
import { DecisionBar } from './DecisionBar';
import { ProofImage, type Pin } from './ProofImage';
import { listComments } from './reviewApi';

function latest(assets: AssetDto[], kind: AssetDto['kind']): AssetDto | undefined {
  return assets.filter((a) => a.kind === kind).sort((a, b) => b.createdAt.localeCompare(a.createdAt))[0];
}

/** A proof as a reviewer sees it: the image (or the 3D view), comments with pins, decisions, history. */
export function ProofPage() {
  const { figureId = '' } = useParams<{ figureId: string }>();
  const api = useApi();
  const [pin, setPin] = useState<Pin | null>(null);
  const figure = useQuery({ queryKey: ['figure', figureId], queryFn: ({ signal }) => api.figure(figureId, signal) });
  const comments = useQuery({ queryKey: ['figure-comments', figureId], queryFn: ({ signal }) => listComments(api, figureId, signal) });

  if (figure.isPending)
    return (
      <div className="pf-page" data-testid="proof-loading">
        <NonIdealState icon={<Spinner size={32} />} title="Loading the proof…" />
      </div>
    );
  if (figure.isError) {
    const notFound = figure.error instanceof ApiError && (figure.error.status === 404 || figure.error.status === 403);
    return (
      <div className="pf-page">
        <Callout intent={notFound ? 'warning' : 'danger'} title={notFound ? 'Figure not found' : 'The proof could not be loaded'} data-testid="proof-error">
          <p>{notFound ? 'There is no such figure in the publications you belong to.' : describeError(figure.error)}</p>
          <Link to="/review">Back to the review desk</Link>
        </Callout>
      </div>
    );
  }

  const f = figure.data;
  const png = latest(f.assets, 'png');
  const glb = latest(f.assets, 'glb');
  const list = comments.data ?? [];
  const pins = [...numberPins(list).values()];

  return (
    <div className="pf-page pf-page-wide" data-testid="proof-page">
      <header className="pf-page-head">
        <p className="pf-crumbs">
          <Link to="/review">Review desk</Link> · <Link to={`/figures/${encodeURIComponent(f.id)}`}>Figure page</Link>
        </p>
        <h1 data-testid="proof-title">{f.title}</h1>
        <div className="pf-meta">
          <Tag minimal intent={statusIntent(f.status)} data-testid="proof-status">
            {statusLabel(f.status)}
          </Tag>
          <span data-testid="proof-version">Version {f.currentVersion.number}</span>
          {f.ownerName && <span>by {f.ownerName}</span>}
        </div>
      </header>

      <div className="pf-proof-layout">
        <section className="pf-section pf-proof-view">
          {png ? (
            <ProofImage asset={png} pins={pins} pending={pin} onPlace={setPin} />
          ) : glb ? (
            <>
              <p className="pf-muted pf-small" data-testid="proof-3d-note">
                No rendered PNG yet: this is the 3D mesh of the current version. Pins need a rendered image.
              </p>
              <Viewport key={glb.id} figure={f} asset={glb} />
            </>
          ) : (
            <p className="pf-muted" data-testid="proof-no-image">
              This version has no rendered image or mesh yet.
            </p>
          )}
        </section>
        <aside className="pf-proof-side">
          <section className="pf-section">
            <h2>Decision</h2>
            <DecisionBar figure={f} />
          </section>
          <section className="pf-section">
            <h2>Comments</h2>
            <CommentsPanel
              figure={f}
              comments={list}
              loading={comments.isPending}
              error={comments.isError ? comments.error : null}
              pin={pin}
              pinsPossible={Boolean(png)}
              onClearPin={() => setPin(null)}
            />
          </section>
          <section className="pf-section">
            <h2>History</h2>
            <AuditTrail figureId={f.id} />
          </section>
        </aside>
      </div>
    </div>
  );
}
