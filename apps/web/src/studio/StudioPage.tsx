// The studio: Composer (content, surface, grid) with a live preview, Stage panels, save, export.
// One draft (./draft.ts, a reducer over the recipe) feeds every panel, the preview and Save.
import { lazy, Suspense, useEffect, useMemo, useReducer, useState } from 'react';
import { Button, Callout, FormGroup, InputGroup, NonIdealState, Spinner, Tag } from '@blueprintjs/core';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Link, useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { formatRecipeIssues, parseRecipe, TEXT_LIMITS, type FigureDto, type Recipe } from '@psiform/contracts';
import { isRealState } from '@psiform/orbitals';
import { PSI_UNIT_TEXT } from '@psiform/print';
import { ApiError, describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { Typeset } from '../components/Typeset';
import { describeRecipe } from '../figures/model';
import { PublicationChooser } from '../figures/PublicationChooser';
import { usePublications } from '../figures/usePublications';
import { houseStyle } from '../review/reviewApi';
import { getSwatchbook } from '../swatchbooks/swatchbookApi';
import { ComposerPanel, psiMaxMessage } from './ComposerPanel';
import { createDraft, draftErrors, draftReducer, fieldText, isDirty } from './draft';
import { ExportDialog } from './ExportDialog';
import { COMPOSER_PRESETS, presetRecipe } from './presets';
import { applyShortcut, isTypingTarget } from './shortcuts';
import { StagePanel } from './StagePanel';
import { SurfaceWarnings } from './SurfaceWarnings';
import { usePreview } from './usePreview';
import { phaseKeyColours } from '../scene/phaseKeyColours';
import { PhaseKeyLegend } from '../components/PhaseKeyLegend';
const StudioCanvas = lazy(() => import('./StudioCanvas'));

export const MODEL_NOTE = 'One-electron hydrogen-like model: the shapes are ψ_nlm = R_nl Y_lm of a single electron; many-electron orbitals differ.';

function serverMessages(err: unknown): string[] {
  if (err instanceof ApiError && err.status === 400 && err.body) {
    const m = err.body.message;
    return Array.isArray(m) ? m : [m];
  }
  return [describeError(err)];
}

/** The house colours of a publication (its pinned swatchbook), or null when none is pinned. */
function useHousePalette(publicationId: string | undefined) {
  const api = useApi();
  return useQuery({
    queryKey: ['house-palette', publicationId],
    enabled: Boolean(publicationId),
    queryFn: async ({ signal }) => {
      const hs = await houseStyle(api, publicationId!, signal);
      if (!hs) return null;
      const sb = await getSwatchbook(api, hs.swatchbookId, signal);
      return { swatchbookId: sb.id, positive: sb.colors.positive, negative: sb.colors.negative, background: sb.colors.background, name: sb.name };
    },
  });
}

interface StudioProps {
  initial: Recipe;
  figure: FigureDto | null;
  publicationId?: string | null;
}

function Studio({ initial, figure, publicationId }: StudioProps) {
  const api = useApi();
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const publications = usePublications();
  const [draft, dispatch] = useReducer(draftReducer, undefined, () => createDraft(initial, { isNew: !figure }));
  // What the server holds: opening a saved figure compares equal, so it is never "unsaved" on arrival.
  const [saved, setSaved] = useState<Recipe | null>(figure ? initial : null);
  const [pubChoice, setPubChoice] = useState<string | null>(publicationId ?? null);
  const [exportOpen, setExportOpen] = useState(false);
  const recipe = draft.recipe;

  const pubs = publications.data ?? [];
  const publication = figure ? pubs.find((p) => p.id === figure.publicationId) : (pubs.find((p) => p.id === pubChoice) ?? pubs[0]);

  // A new figure previews the publication's house colours from the start (the server applies them on save too).
  const house = useHousePalette(figure ? undefined : publication?.id);
  useEffect(() => {
    if (figure || house.data === undefined) return;
    const h = house.data;
    if (h) dispatch({ type: 'palette', palette: { swatchbookId: h.swatchbookId, positive: h.positive, negative: h.negative }, background: h.background });
    else dispatch({ type: 'palette', palette: presetRecipe(null).palette, background: presetRecipe(null).stage.background.color });
  }, [figure, house.data]);
  // A new figure states its lengths in the publication's unit from the start (the server applies it on save).
  const unit = publication?.lengthUnit;
  useEffect(() => {
    if (!figure && unit) dispatch({ type: 'unit', unit });
  }, [figure, unit]);

  const errors = draftErrors(draft);
  const stateOk = !errors.rows;
  const state = stateOk ? { Z: recipe.content.Z, terms: recipe.content.terms.map((t) => ({ ...t, im: t.im ?? 0 })) } : null;
  const { surfaces, status, previewN } = usePreview(state, recipe.grid.n, recipe.grid.extent, { ...recipe.surface, nodal: recipe.stage.material.nodalOutline }, { palette: recipe.palette, mode: recipe.phase?.mode });
  const psiMax = psiMaxMessage(recipe, status.maxAbs);
  if (psiMax && !errors.psi) errors.psiMax = psiMax;

  const parsed = useMemo(() => parseRecipe(recipe), [recipe]);
  const issues = parsed.ok ? null : formatRecipeIssues(parsed.issues);
  const dirty = isDirty(draft, saved);
  const complex = useMemo(() => {
    try {
      return state ? !isRealState(state) : false;
    } catch {
      return false;
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [JSON.stringify(recipe.content)]);

  // Coloured by arg ψ: the phase key (same colours as the surfaces) in the legend and the figure's 2D layer.
  const keyColours = useMemo(
    () => phaseKeyColours(recipe),
    // eslint-disable-next-line react-hooks/exhaustive-deps -- the key depends on the state and phase mode only
    [JSON.stringify(recipe.content), recipe.phase?.mode],
  );

  // Stage shortcuts (not while typing in a field).
  const look = { stage: recipe.stage, annotations: recipe.annotations };
  const lookKey = JSON.stringify(look);
  useEffect(() => {
    function onKey(e: KeyboardEvent) {
      if (e.ctrlKey || e.metaKey || e.altKey || isTypingTarget(e.target)) return;
      const next = applyShortcut(JSON.parse(lookKey), e.key);
      if (next) dispatch({ type: 'look', stage: next.stage, annotations: next.annotations });
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [lookKey]);

  const save = useMutation({
    mutationFn: async (r: Recipe) => {
      if (figure) return api.updateFigure(figure.id, { recipe: r });
      if (!publication) throw new Error('Choose a publication for the figure.');
      return api.createFigure({ publicationId: publication.id, title: draft.title.trim(), recipe: r });
    },
    onSuccess: (fig) => {
      const stored = parseRecipe(fig.currentVersion.recipe);
      if (stored.ok) {
        setSaved(stored.recipe);
        dispatch({ type: 'load', recipe: stored.recipe, keepTitle: true, keepMode: true });
      }
      queryClient.setQueryData(['figure', fig.id], fig);
      void queryClient.invalidateQueries({ queryKey: ['figures'] });
      if (!figure) navigate(`/figures/${encodeURIComponent(fig.id)}/studio`);
    },
  });

  const hasErrors = Object.keys(errors).length > 0;
  const canSave = parsed.ok && !hasErrors && (figure ? dirty : Boolean(publication));
  const label = recipe.annotations.label.text || recipe.label || '';

  return (
    <div className="pf-page pf-page-studio" data-testid="studio-page">
      <header className="pf-page-head">
        <p className="pf-crumbs">
          {figure ? (
            <>
              <Link to={`/publications/${encodeURIComponent(figure.publicationId)}/figures`}>Library</Link> ·{' '}
              <Link to={`/figures/${encodeURIComponent(figure.id)}`} data-testid="studio-figure-link">
                {figure.title}
              </Link>
            </>
          ) : (
            <Link to={publication ? `/library?publicationId=${encodeURIComponent(publication.id)}` : '/library'}>Library</Link>
          )}
        </p>
        <div className="pf-head-row">
          <h1>{figure ? 'Studio' : 'Composer: a new figure'}</h1>
          <div className="pf-studio-actions">
            {figure && <Tag minimal data-testid="studio-version">Version {figure.currentVersion.number}</Tag>}
            {figure && dirty && (
              <Tag intent="warning" minimal data-testid="studio-dirty">
                Unsaved changes
              </Tag>
            )}
            {figure && <Button icon="export" text="Export…" onClick={() => setExportOpen(true)} data-testid="studio-export" />}
            <Button
              intent="primary"
              icon="floppy-disk"
              text={figure ? 'Save as a new version' : 'Create figure'}
              disabled={!canSave}
              loading={save.isPending}
              onClick={() => parsed.ok && save.mutate(parsed.recipe)}
              data-testid="studio-save"
            />
          </div>
        </div>
        <p className="pf-model-note" data-testid="studio-model">
          {parsed.ok ? <Typeset text={`${describeRecipe(parsed.recipe)}.`} /> : MODEL_NOTE}
        </p>
        {!canSave && hasErrors && (
          <p className="pf-error-line" data-testid="studio-save-blocked" role="status">
            {figure ? 'Saving' : 'Creating the figure'} waits for {Object.keys(errors).length === 1 ? 'one field' : `${Object.keys(errors).length} fields`} marked in red.
          </p>
        )}
      </header>

      {!figure && (
        <>
          <div className="pf-presets" data-testid="studio-presets" aria-label="Start from">
            <span className="pf-muted">Start from:</span>
            {COMPOSER_PRESETS.map((p) => (
              <Button
                key={p.id}
                small
                minimal
                title={p.note}
                onClick={() => {
                  const r = p.recipe();
                  dispatch({ type: 'load', recipe: { ...r, palette: recipe.palette, stage: { ...r.stage, background: recipe.stage.background } }, keepTitle: true });
                }}
                data-testid="studio-preset"
                data-preset={p.id}
              >
                <Typeset text={p.name} />
              </Button>
            ))}
          </div>
          <div className="pf-form-row">
            <FormGroup
              label="Title"
              labelFor="studio-title"
              intent={errors.title && draft.title !== '' ? 'danger' : 'none'}
              helperText={
                <span data-testid={errors.title ? 'studio-title-error' : 'studio-title-help'} role={errors.title ? 'alert' : undefined}>
                  {errors.title ?? `Up to ${TEXT_LIMITS.titleMax} characters; files are named from it.`}
                </span>
              }
            >
              <InputGroup
                id="studio-title"
                value={fieldText(draft, 'title')}
                onValueChange={(v) => dispatch({ type: 'text', key: 'title', value: v })}
                placeholder="e.g. Plate 4.2: the 2p_z orbital"
                data-testid="studio-title"
              />
            </FormGroup>
            {publication && <PublicationChooser publications={pubs} value={publication.id} onChange={setPubChoice} id="studio-publication" />}
            {publications.isSuccess && pubs.length === 0 && <Callout intent="warning">You are not a member of any publication, so a figure cannot be created.</Callout>}
          </div>
          {house.data && (
            <p className="pf-muted pf-small" data-testid="studio-house-palette">
              Previewed in the house colours of this publication ({house.data.name}).
            </p>
          )}
        </>
      )}

      {save.isError && (
        <Callout intent="danger" title="The server did not accept the recipe" data-testid="studio-server-error" className="pf-gap">
          <ul>
            {serverMessages(save.error).map((m) => (
              <li key={m}>{m}</li>
            ))}
          </ul>
        </Callout>
      )}
      {save.isSuccess && !dirty && figure && (
        <p className="pf-muted" data-testid="studio-saved">
          Saved as version {save.data.currentVersion.number}.
        </p>
      )}
      {issues && (
        <Callout intent="danger" title="The recipe is not valid" data-testid="studio-recipe-issues">
          <ul>
            {issues.map((i) => (
              <li key={i}>{i}</li>
            ))}
          </ul>
        </Callout>
      )}

      <div className="pf-studio">
        <aside className="pf-studio-left">
          <ComposerPanel
            draft={draft}
            dispatch={dispatch}
            errors={errors}
            complex={complex}
            previewN={previewN}
            maxAbsPsi={status.maxAbs}
            isovalue={status.isovalue}
            enclosed={status.enclosed}
          />
        </aside>
        <main className="pf-studio-centre">
          <div className="pf-viewport" data-testid="studio-viewport" data-ready={status.phase === 'ready' ? 'true' : 'false'}>
            {surfaces.length === 0 && status.phase !== 'error' && <NonIdealState icon={<Spinner size={28} />} title="Sampling ψ for the preview…" />}
            {surfaces.length > 0 && (
              <Suspense fallback={<NonIdealState icon={<Spinner size={28} />} title="Starting the 3D view…" />}>
                <StudioCanvas
                  surfaces={surfaces}
                  palette={recipe.palette}
                  stage={recipe.stage}
                  annotations={recipe.annotations}
                  canvas={recipe.canvas}
                  label={label}
                  phaseKey={keyColours}
                  controls
                  onOrbitEnd={(pose) =>
                    dispatch({ type: 'look', annotations: recipe.annotations, stage: { ...recipe.stage, camera: { ...recipe.stage.camera, view: 'free', position: pose.position, target: pose.target, zoom: pose.zoom } } })
                  }
                />
              </Suspense>
            )}
            {status.phase === 'ready' && <span data-testid="preview-ready" hidden />}
          </div>
          <p className="pf-status-line" data-testid="preview-status" aria-live="polite">
            {status.phase === 'error' ? (
              <span className="pf-error-line" data-testid="preview-error">
                Preview failed: {status.error}
              </span>
            ) : (
              <>
                Preview {status.n || previewN}³
                {status.sampleMs !== null && <> · sampled in {Math.round(status.sampleMs)} ms</>}
                {status.updateMs !== null && (
                  <>
                    {' '}
                    · last update <span data-testid="preview-ms">{Math.round(status.updateMs)}</span> ms
                  </>
                )}
                {status.triangles > 0 && <> · {status.triangles.toLocaleString('en-GB')} triangles</>}
                {status.enclosed !== null && (
                  <>
                    {' '}
                    · encloses <span data-testid="preview-enclosed">{(status.enclosed * 100).toFixed(1)}</span>% over all space
                    {status.enclosedError !== null && status.enclosedError >= 5e-4 && <> ± {(status.enclosedError * 100).toFixed(1)}</>}
                    {status.enclosedInBox !== null && status.enclosedInBox < status.enclosed - 5e-4 && (
                      <>
                        {' '}
                        (<span data-testid="preview-enclosed-in-box">{(status.enclosedInBox * 100).toFixed(1)}</span>% inside the box)
                      </>
                    )}
                  </>
                )}
                {status.isovalue !== null && (
                  <>
                    {' '}
                    · |ψ| = {status.isovalue.toPrecision(3)} <Typeset text={PSI_UNIT_TEXT} />
                  </>
                )}
                {(status.phase === 'sampling' || status.phase === 'extracting') && <> · updating…</>}
              </>
            )}
          </p>
          <SurfaceWarnings
            warnings={status.warnings}
            extent={recipe.grid.extent}
            onExtent={(extent) => dispatch({ type: 'grid', grid: { extent } })}
            gridAuto={recipe.grid.n === 'auto'}
            onGridAuto={() => dispatch({ type: 'grid', grid: { n: 'auto' } })}
          />
          <div className="pf-legend" aria-label="Phase colours" data-testid="phase-legend">
            {keyColours && <PhaseKeyLegend colourAt={keyColours} />}
            {!keyColours && (
              <>
                <span>
                  <i style={{ background: recipe.palette.positive }} /> ψ &gt; 0
                </span>
                <span>
                  <i style={{ background: recipe.palette.negative }} /> ψ &lt; 0
                </span>
              </>
            )}
            <span className="pf-muted">Drag to turn (free view), scroll to zoom. z (the quantisation axis) points up.</span>
          </div>
        </main>
        <aside className="pf-studio-right">
          <StagePanel draft={draft} dispatch={dispatch} errors={errors} publicationUnit={publication?.lengthUnit} />
        </aside>
      </div>

      {figure && (
        <ExportDialog
          isOpen={exportOpen}
          onClose={() => setExportOpen(false)}
          figure={figure}
          canvas={recipe.canvas}
          transparentDefault={recipe.stage.background.transparent}
          unsaved={dirty}
        />
      )}
    </div>
  );
}

/** /figures/:figureId/studio (an existing figure) and /composer (a new one, ?preset= and ?publicationId= optional). */
export function StudioPage() {
  const { figureId } = useParams<{ figureId: string }>();
  const [search] = useSearchParams();
  const api = useApi();
  const figure = useQuery({
    queryKey: ['figure', figureId],
    queryFn: ({ signal }) => api.figure(figureId!, signal),
    enabled: Boolean(figureId),
  });
  const preset = search.get('preset');
  const fresh = useMemo(() => presetRecipe(preset), [preset]);
  if (!figureId) return <Studio key={preset ?? ''} initial={fresh} figure={null} publicationId={search.get('publicationId')} />;
  if (figure.isPending) return <NonIdealState icon={<Spinner size={32} />} title="Loading the figure…" />;
  if (figure.isError)
    return (
      <div className="pf-page">
        <Callout intent="danger" title="The figure could not be loaded" data-testid="studio-error">
          {describeError(figure.error)} <Link to="/library">Back to the library</Link>
        </Callout>
      </div>
    );
  const parsed = parseRecipe(figure.data.currentVersion.recipe);
  if (!parsed.ok)
    return (
      <div className="pf-page">
        <Callout intent="warning" title="The stored recipe does not read" data-testid="studio-error">
          {formatRecipeIssues(parsed.issues).join('; ')}
        </Callout>
      </div>
    );
  if (parsed.recipe.source?.kind === 'upload')
    return (
      <div className="pf-page">
        <Callout intent="primary" title="An uploaded cube" data-testid="studio-error">
          This figure's field comes from an uploaded cube, so its states cannot be composed here. <Link to={`/figures/${encodeURIComponent(figureId)}`}>Back to the figure</Link>
        </Callout>
      </div>
    );
  return <Studio key={figure.data.id} initial={parsed.recipe} figure={figure.data} />;
}
