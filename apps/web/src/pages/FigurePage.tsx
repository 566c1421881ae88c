import { lazy, Suspense, useState } from 'react';
import { Button, Callout, EditableText, NonIdealState, Spinner } from '@blueprintjs/core';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Link, useParams, useSearchParams } from 'react-router-dom';
import { parseRecipe, titleProblem, type AssetDto, type FigureDto, type JobDto } from '@psiform/contracts';
import { useApi, useAuth } from '../auth/AuthProvider';
import { AssetDownloads } from '../figures/AssetDownloads';
import { JobProgress } from '../figures/JobProgress';
import { MeshStatsTable } from '../figures/MeshStatsTable';
import { describeRecipe, formatDate } from '../figures/model';
import { FigureReview } from '../review/FigureReview';
import { assetLinkWait, useAssetUrl } from '../review/ProofImage';
import { PreflightPanel } from '../print/PreflightPanel';
import { FigureStudioBar } from '../studio/FigureStudioBar';
import { Typeset } from '../components/Typeset';
import { phaseKeyColours } from '../scene/phaseKeyColours';
import { FigureLoadStatus } from '../components/FigureLoadStatus';
import { FigureMeta } from '../figures/FigureMeta';
import { CallFailed } from '../components/CallFailed';

// three.js and R3F load only when a mesh is shown (keeps them out of the first bundle).
const FigureViewport = lazy(() => import('../viewport/FigureViewport'));

function glbOf(assets: AssetDto[]): AssetDto | undefined {
  return assets.find((a) => a.kind === 'glb');
}

/** The GLB viewport of a figure (also used by the proof view, review/ProofPage.tsx). */
export function Viewport({ figure, asset }: { figure: FigureDto; asset: AssetDto }) {
  // Presigned links are short-lived: fetched per asset when the view opens, not cached for long.
  const link = useAssetUrl(asset.id);
  const parsed = parseRecipe(figure.currentVersion.recipe);
  if (!parsed.ok) {
    return <Callout intent="warning">The stored recipe does not read ({parsed.issues[0]?.message}); the mesh is not shown.</Callout>;
  }
  const recipe = parsed.recipe;
  if (!link.isSuccess) return assetLinkWait(link, { fetching: 'Fetching the mesh link…', failed: 'The mesh could not be fetched', testId: 'viewport-error' });
  return (
    <Suspense fallback={<NonIdealState icon={<Spinner size={28} />} title="Starting the 3D view…" />}>
      <FigureViewport url={link.data.url} palette={recipe.palette} stage={recipe.stage} phaseKey={phaseKeyColours(recipe)} />
    </Suspense>
  );
}

function Title({ figure, editable }: { figure: FigureDto; editable: boolean }) {
  const api = useApi();
  const queryClient = useQueryClient();
  const [draft, setDraft] = useState<string | null>(null);
  const rename = useMutation({
    mutationFn: (title: string) => api.updateFigure(figure.id, { title }),
    onSuccess: (fig) => {
      queryClient.setQueryData(['figure', figure.id], fig);
      void queryClient.invalidateQueries({ queryKey: ['figures'] });
      setDraft(null);
    },
    onError: () => setDraft(null),
  });
  if (!editable) return <h1 data-testid="figure-title">{figure.title}</h1>;
  return (
    <>
      <h1 className="pf-title-edit" data-testid="figure-title">
        <EditableText
          value={draft ?? figure.title}
          onChange={setDraft}
          onConfirm={(v) => {
            const t = v.trim();
            if (titleProblem(t)) return; // the message below names the limit; the text stays for correcting
            if (t !== figure.title) rename.mutate(t);
            else setDraft(null);
          }}
          onCancel={() => setDraft(null)}
          placeholder="Figure title"
          selectAllOnFocus
        />
      </h1>
      {draft !== null && titleProblem(draft) && (
        <Callout intent="warning" data-testid="title-error" className="pf-gap">
          The title {titleProblem(draft)}. It was not changed.
        </Callout>
      )}
      <CallFailed call={rename} testId="rename-error" className="pf-gap" lead="The title was not changed" />
    </>
  );
}

export function FigurePage() {
  const { figureId = '' } = useParams<{ figureId: string }>();
  const api = useApi();
  const { user } = useAuth();
  const queryClient = useQueryClient();
  const [search, setSearch] = useSearchParams();
  const jobId = search.get('job');
  const [finished, setFinished] = useState<JobDto | null>(null);

  const figure = useQuery({
    queryKey: ['figure', figureId],
    queryFn: ({ signal }) => api.figure(figureId, signal),
  });

  const compute = useMutation({
    mutationFn: () => api.computeMesh(figureId),
    onSuccess: ({ jobId: id }) => {
      setFinished(null);
      setSearch({ job: id }, { replace: true });
    },
  });

  function onJobFinished(job: JobDto) {
    setFinished(job);
    if (job.state === 'completed') void queryClient.invalidateQueries({ queryKey: ['figure', figureId] });
  }

  if (!figure.isSuccess) return <FigureLoadStatus figure={figure} what="figure" testId="figure" back={{ to: '/library', text: 'Back to the library' }} />;

  const f = figure.data;
  const parsed = parseRecipe(f.currentVersion.recipe);
  const glb = glbOf(f.assets);
  const running = Boolean(jobId) && finished === null;
  const canEdit = user?.role === 'illustrator' && !f.currentVersion.locked;

  return (
    <div className="pf-page pf-page-wide" data-testid="figure-page">
      <header className="pf-page-head">
        <p className="pf-crumbs">
          <Link to={`/publications/${encodeURIComponent(f.publicationId)}/figures`}>Library</Link>
        </p>
        <Title figure={f} editable={canEdit} />
        <FigureMeta figure={f} testId="figure">
          <span className="pf-muted">updated {formatDate(f.updatedAt)}</span>
        </FigureMeta>
      </header>

      <section className="pf-section">
        <h2>Model</h2>
        {parsed.ok ? (
          <p className="pf-model-note" data-testid="figure-model">
            <Typeset text={`${describeRecipe(parsed.recipe)}.`} />
          </p>
        ) : (
          <Callout intent="warning" data-testid="figure-model">
            The stored recipe does not pass validation: {parsed.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}
          </Callout>
        )}
        {parsed.ok && <FigureStudioBar figure={f} recipe={parsed.recipe} />}
      </section>

      <section className="pf-section">
        <div className="pf-head-row">
          <h2>Mesh</h2>
          <Button
            intent="primary"
            icon="cube"
            text={glb ? 'Compute the mesh again' : 'Compute mesh'}
            onClick={() => compute.mutate()}
            loading={compute.isPending}
            disabled={running || !parsed.ok}
            data-testid="compute-mesh"
          />
        </div>
        <CallFailed call={compute} testId="compute-error" className="pf-gap" lead="The mesh job was not queued" />
        {jobId && <JobProgress key={jobId} jobId={jobId} onFinished={onJobFinished} />}
        {glb ? (
          <>
            <Viewport key={glb.id} figure={f} asset={glb} />
            <h3>Surfaces</h3>
            <MeshStatsTable asset={glb} />
          </>
        ) : (
          !jobId && <p className="pf-muted" data-testid="no-mesh">No mesh yet for this version. Compute one to see it here.</p>
        )}
        {f.assets.length > 0 && (
          <>
            <h3>Files</h3>
            <AssetDownloads assets={f.assets} />
          </>
        )}
      </section>

      <FigureReview figure={f} />
      <PreflightPanel figure={f} />

      {user?.role === 'illustrator' && (
        <p className="pf-muted pf-small">
          Have a density cube from elsewhere?{' '}
          <Link to={`/uploads/new?publicationId=${encodeURIComponent(f.publicationId)}`} data-testid="figure-upload-link">
            Upload a density cube
          </Link>{' '}
          as a new figure.
        </p>
      )}
    </div>
  );
}
