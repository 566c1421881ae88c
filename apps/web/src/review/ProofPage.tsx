import { useState } from 'react';
import { Button, ButtonGroup, Callout, Spinner } from '@blueprintjs/core';
import { useQuery } from '@tanstack/react-query';
import { Link, useParams } from 'react-router-dom';
import type { AssetDto } from '@psiform/contracts';
import { describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { Viewport } from '../pages/FigurePage';
import { AuditTrail } from './AuditTrail';
import { CommentsPanel, numberPins } from './CommentsPanel';
import { DecisionBar, useFigureAudit } from './DecisionBar';
import { ProofImage, type Pin, type ProofZoom } from './ProofImage';
import { listComments } from './reviewApi';
import { ComparePanel } from './ComparePanel';
import { figureVersions, printFacts, renderVersion } from './proofApi';
import { JobProgress } from '../figures/JobProgress';
import { useAuth } from '../auth/AuthProvider';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { FigureLoadStatus } from '../components/FigureLoadStatus';
import { FigureMeta } from '../figures/FigureMeta';
import { formatDate } from '../figures/model';

function latest(assets: AssetDto[], kind: AssetDto['kind']): AssetDto | undefined {
  return assets.filter((a) => a.kind === kind).sort((a, b) => b.createdAt.localeCompare(a.createdAt))[0];
}

/** The colours of this figure were pinned or re-rendered past failing colour checks: the newest such reason, always in view. */
export function ColourOverrideNote({ figureId }: { figureId: string }) {
  const audit = useFigureAudit(figureId);
  const last = [...(audit.data ?? [])].reverse().find((e) => e.action === 'colour_override');
  if (!last) return null;
  return (
    <Callout intent="warning" icon="warning-sign" title="Colour checks overridden" className="pf-gap" data-testid="proof-colour-override">
      {last.actorName ?? 'An art director'}, {formatDate(last.at)}: {last.note}
    </Callout>
  );
}

/** A proof as a reviewer sees it: the image (or the 3D view), comments with pins, decisions, history. */
export function ProofPage() {
  const { figureId = '' } = useParams<{ figureId: string }>();
  const api = useApi();
  const [pin, setPin] = useState<Pin | null>(null);
  const figure = useQuery({ queryKey: ['figure', figureId], queryFn: ({ signal }) => api.figure(figureId, signal) });
  const comments = useQuery({ queryKey: ['figure-comments', figureId], queryFn: ({ signal }) => listComments(api, figureId, signal) });
  const versions = useQuery({ queryKey: ['figure-versions', figureId], queryFn: ({ signal }) => figureVersions(api, figureId, signal) });
  const { user } = useAuth();
  const qc = useQueryClient();
  const [zoom, setZoom] = useState<ProofZoom>('fit');
  const [renderJob, setRenderJob] = useState<string | null>(null);
  const render = useMutation({ mutationFn: (n: number) => renderVersion(api, figureId, n), onSuccess: (r) => setRenderJob(r.jobId) });

  if (!figure.isSuccess) return <FigureLoadStatus figure={figure} what="proof" testId="proof" back={{ to: '/review', text: 'Back to the review desk' }} />;

  const f = figure.data;
  const current = versions.data?.find((v) => v.current) ?? null;
  const image = current?.image ?? null;
  const glb = latest(f.assets, 'glb');
  // Rendering follows the export rule: the owner, editors and art directors of the publication, admins.
  const canRender = !!user && (user.role !== 'illustrator' || user.id === f.ownerId);
  const list = comments.data ?? [];
  const pins = [...numberPins(list).values()];

  return (
    <div className="pf-page pf-page-wide" data-testid="proof-page">
      <header className="pf-page-head">
        <p className="pf-crumbs">
          <Link to="/review">Review desk</Link> · <Link to={`/figures/${encodeURIComponent(f.id)}`}>Figure page</Link>
        </p>
        <h1 data-testid="proof-title">{f.title}</h1>
        <FigureMeta figure={f} testId="proof" />
        <ColourOverrideNote figureId={f.id} />
      </header>

      <div className="pf-proof-layout">
        <section className="pf-section pf-proof-view">
          {image ? (
            <>
              <div className="pf-proof-facts" data-testid="proof-facts">
                <span>
                  <strong>Print size</strong> <span data-testid="proof-print-size">{printFacts(image)}</span>
                </span>
                <span>
                  <strong>Colour</strong> <span data-testid="proof-colour-mode">{image.colourMode}</span>
                </span>
                <ButtonGroup className="pf-toolbar-end">
                  <Button size="small" text="Fit" active={zoom === 'fit'} onClick={() => setZoom('fit')} data-testid="proof-zoom-fit" />
                  <Button size="small" text="1:1 print pixels" active={zoom === 'pixels'} onClick={() => setZoom('pixels')} data-testid="proof-zoom-pixels" />
                </ButtonGroup>
              </div>
              <ProofImage assetId={image.assetId} widthPx={image.widthPx} zoom={zoom} pins={pins} pending={pin} onPlace={setPin} />
            </>
          ) : (
            <>
              <div className="pf-proof-facts" data-testid="proof-no-image">
                <span className="pf-muted">Version {f.currentVersion.number} has no print image yet.</span>
                {renderJob ? (
                  <JobProgress
                    jobId={renderJob}
                    onFinished={() => {
                      setRenderJob(null);
                      void qc.invalidateQueries({ queryKey: ['figure-versions', figureId] });
                    }}
                  />
                ) : (
                  canRender && (
                    <Button size="small" icon="media" text="Render at print size" loading={render.isPending} onClick={() => render.mutate(f.currentVersion.number)} data-testid="proof-render" />
                  )
                )}
              </div>
              {render.isError && <Callout intent="danger" compact>{describeError(render.error)}</Callout>}
              {glb && (
                <>
                  <p className="pf-muted pf-small" data-testid="proof-3d-note">
                    Meanwhile, this is the 3D mesh of the current version. Pins need a rendered image.
                  </p>
                  <Viewport key={glb.id} figure={f} asset={glb} />
                </>
              )}
            </>
          )}
          <h2 className="pf-gap">Compare versions</h2>
          {versions.isPending && <Spinner size={20} />}
          {versions.isError && <Callout intent="danger">{describeError(versions.error)}</Callout>}
          {versions.isSuccess && <ComparePanel figureId={f.id} versions={versions.data} canRender={canRender} />}
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
              pinsPossible={Boolean(image)}
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
