// The studio: Composer (content, surface, grid) with a live preview, Stage panels, save, export.
import { lazy, Suspense, useEffect, useMemo, useState } from 'react';
import { Button, Callout, FormGroup, InputGroup, NonIdealState, Spinner, Tag } from '@blueprintjs/core';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { canonicalJson, formatRecipeIssues, parseRecipe, RECIPE_VERSION, type FigureDto, type Recipe } from '@psiform/contracts';
import { ApiError, describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { describeRecipe, validateGridN } from '../figures/model';
import { PublicationChooser } from '../figures/PublicationChooser';
import { usePublications } from '../figures/usePublications';
import { ComposerPanel, type SurfaceDraft } from './ComposerPanel';
import { checkContent, defaultDraft, draftFromTerms, type ContentDraft } from './content';
import { ExportDialog } from './ExportDialog';
import { applyShortcut, isTypingTarget, type Look } from './shortcuts';
import { StagePanel } from './StagePanel';
import { usePreview, type PreviewRule } from './usePreview';

const StudioCanvas = lazy(() => import('./StudioCanvas'));

export const MODEL_NOTE = 'One-electron hydrogen-like model: the shapes are ψ_nlm = R_nl Y_lm of a single electron; many-electron orbitals differ.';

export function defaultRecipe(): Recipe {
  const r = parseRecipe({
    version: RECIPE_VERSION,
    label: '2p_z',
    content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1, im: 0 }] },
    grid: { n: 128, extent: 'auto' },
    surface: { rule: 'enclosed', fraction: 0.9 },
  });
  if (!r.ok) throw new Error('default recipe invalid');
  return r.recipe;
}

function serverMessages(err: unknown): string[] {
  if (err instanceof ApiError && err.status === 400 && err.body) {
    const m = err.body.message;
    return Array.isArray(m) ? m : [m];
  }
  return [describeError(err)];
}

function percentText(f: number): string {
  return String(Number((f * 100).toFixed(3)));
}

function surfaceFrom(recipe: Recipe): SurfaceDraft {
  return recipe.surface.rule === 'enclosed'
    ? { rule: 'enclosed', percent: percentText(recipe.surface.fraction), psi: '0.01' }
    : { rule: 'psi', percent: '90', psi: String(recipe.surface.value) };
}

function checkSurface(s: SurfaceDraft): { rule: PreviewRule | null; error: string | null } {
  if (s.rule === 'enclosed') {
    const t = s.percent.trim().replace(',', '.');
    const p = Number(t);
    if (t === '') return { rule: null, error: 'Enter the enclosed probability in percent.' };
    if (!Number.isFinite(p)) return { rule: null, error: 'The enclosed probability must be a number.' };
    if (!(p > 0 && p < 100)) return { rule: null, error: `The enclosed probability must be between 0% and 100%, both excluded (got ${p}%).` };
    return { rule: { rule: 'enclosed', fraction: Number((p / 100).toPrecision(10)) }, error: null };
  }
  const t = s.psi.trim().replace(',', '.');
  const v = Number(t);
  if (t === '') return { rule: null, error: 'Enter the |ψ| value.' };
  if (!Number.isFinite(v) || v <= 0) return { rule: null, error: 'The |ψ| value must be a positive number.' };
  return { rule: { rule: 'psi', value: v }, error: null };
}

interface StudioProps {
  initial: Recipe;
  figure: FigureDto | null;
}

function Studio({ initial, figure }: StudioProps) {
  const api = useApi();
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const publications = usePublications();
  const [draft, setDraft] = useState<ContentDraft>(() =>
    figure ? draftFromTerms(initial.content.terms, initial.content.Z, initial.label) : defaultDraft(),
  );
  const [surface, setSurface] = useState<SurfaceDraft>(() => surfaceFrom(initial));
  const [grid, setGrid] = useState(String(initial.grid.n));
  const [look, setLook] = useState<Look>({ stage: initial.stage, annotations: initial.annotations });
  const [canvas, setCanvas] = useState(initial.canvas);
  const [title, setTitle] = useState('');
  const [pubChoice, setPubChoice] = useState<string | null>(null);
  const [saved, setSaved] = useState<string>(() => (figure ? canonicalJson(initial) : ''));
  const [exportOpen, setExportOpen] = useState(false);

  const check = checkContent(draft);
  const surf = checkSurface(surface);
  // 'auto' lets the engine pick the grid that resolves the surface (the recipe schema's default).
  const gridAuto = grid.trim().toLowerCase() === 'auto';
  const gridN: number | 'auto' = gridAuto ? 'auto' : Number(grid.trim());
  const gridError = gridAuto ? null : grid.trim() === '' ? 'Enter the grid size N.' : validateGridN(gridN as number);

  const built = useMemo(() => {
    if (!check.built || !surf.rule || gridError) return null;
    const doc = {
      ...initial,
      version: RECIPE_VERSION,
      label: look.annotations.label.text || check.built.label,
      content: { Z: check.built.Z, terms: check.built.terms },
      grid: { n: gridN, extent: initial.grid.extent },
      surface: surf.rule,
      stage: look.stage,
      annotations: look.annotations,
      canvas,
    };
    const parsed = parseRecipe(doc);
    return parsed.ok ? { ok: true as const, recipe: parsed.recipe } : { ok: false as const, issues: formatRecipeIssues(parsed.issues) };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [JSON.stringify([check.built, surf.rule, gridN, gridError, look, canvas]), initial]);

  const state = check.built ? { Z: check.built.Z, terms: check.built.terms } : null;
  const { surfaces, status, previewN } = usePreview(gridError ? null : state, gridError ? 128 : gridN, initial.grid.extent, surf.rule && { ...surf.rule, nodal: look.stage.material.nodalOutline });

  // Stage shortcuts (not while typing in a field).
  useEffect(() => {
    function onKey(e: KeyboardEvent) {
      if (e.ctrlKey || e.metaKey || e.altKey || isTypingTarget(e.target)) return;
      setLook((l) => {
        const next = applyShortcut(l, e.key);
        return next ?? l;
      });
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);

  const pubs = publications.data ?? [];
  const publication = pubs.find((p) => p.id === pubChoice) ?? pubs[0];
  const titleError = figure ? null : title.trim() === '' ? 'Give the figure a title.' : null;
  const current = built?.ok ? canonicalJson(built.recipe) : null;
  const dirty = current !== null && current !== saved;

  const save = useMutation({
    mutationFn: async (recipe: Recipe) => {
      if (figure) return api.updateFigure(figure.id, { recipe });
      if (!publication) throw new Error('Choose a publication for the figure.');
      return api.createFigure({ publicationId: publication.id, title: title.trim(), recipe });
    },
    onSuccess: (fig, recipe) => {
      setSaved(canonicalJson(recipe));
      queryClient.setQueryData(['figure', fig.id], fig);
      void queryClient.invalidateQueries({ queryKey: ['figures'] });
      if (!figure) navigate(`/figures/${encodeURIComponent(fig.id)}/studio`);
    },
  });

  const canSave = built?.ok === true && !titleError && (!figure || dirty) && (figure !== null || Boolean(publication));
  const label = look.annotations.label.text || check.built?.label || initial.label || '';

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
            <Link to="/library">Library</Link>
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
              onClick={() => built?.ok && save.mutate(built.recipe)}
              data-testid="studio-save"
            />
          </div>
        </div>
        <p className="pf-model-note" data-testid="studio-model">
          {built?.ok ? `${describeRecipe(built.recipe)}.` : MODEL_NOTE}
        </p>
      </header>

      {!figure && (
        <div className="pf-form-row">
          <FormGroup label="Title" labelFor="studio-title" intent={title && titleError ? 'danger' : 'none'}>
            <InputGroup id="studio-title" value={title} onValueChange={setTitle} placeholder="e.g. Plate 4.2: the 2p_z orbital" data-testid="studio-title" />
          </FormGroup>
          {publication && <PublicationChooser publications={pubs} value={publication.id} onChange={setPubChoice} id="studio-publication" />}
          {publications.isSuccess && pubs.length === 0 && <Callout intent="warning">You are not a member of any publication, so a figure cannot be created.</Callout>}
        </div>
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
      {built && !built.ok && (
        <Callout intent="danger" title="The recipe is not valid" data-testid="studio-recipe-issues">
          <ul>
            {built.issues.map((i) => (
              <li key={i}>{i}</li>
            ))}
          </ul>
        </Callout>
      )}

      <div className="pf-studio">
        <aside className="pf-studio-left">
          <ComposerPanel
            draft={draft}
            onDraft={setDraft}
            check={check}
            surface={surface}
            onSurface={setSurface}
            surfaceError={surf.error}
            grid={grid}
            onGrid={setGrid}
            gridError={gridError}
            complex={check.built ? !check.built.isReal : false}
            previewN={previewN}
          />
        </aside>
        <main className="pf-studio-centre">
          <div className="pf-viewport" data-testid="studio-viewport" data-ready={status.phase === 'ready' ? 'true' : 'false'}>
            {surfaces.length === 0 && status.phase !== 'error' && <NonIdealState icon={<Spinner size={28} />} title="Sampling ψ for the preview…" />}
            {surfaces.length > 0 && (
              <Suspense fallback={<NonIdealState icon={<Spinner size={28} />} title="Starting the 3D view…" />}>
                <StudioCanvas
                  surfaces={surfaces}
                  palette={initial.palette}
                  stage={look.stage}
                  annotations={look.annotations}
                  canvas={canvas}
                  label={label}
                  controls
                  onOrbitEnd={(pose) =>
                    setLook((l) => ({ ...l, stage: { ...l.stage, camera: { ...l.stage.camera, view: 'free', position: pose.position, target: pose.target, zoom: pose.zoom } } }))
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
                {status.enclosed !== null && <> · encloses {(status.enclosed * 100).toFixed(1)}%</>}
                {status.isovalue !== null && <> · |ψ| = {status.isovalue.toPrecision(3)} a0^−3/2</>}
                {(status.phase === 'sampling' || status.phase === 'extracting') && <> · updating…</>}
              </>
            )}
          </p>
          <div className="pf-legend" aria-label="Phase colours">
            <span>
              <i style={{ background: initial.palette.positive }} /> ψ &gt; 0
            </span>
            <span>
              <i style={{ background: initial.palette.negative }} /> ψ &lt; 0
            </span>
            <span className="pf-muted">Drag to turn (free view), scroll to zoom. z (the quantisation axis) points up.</span>
          </div>
        </main>
        <aside className="pf-studio-right">
          <StagePanel look={look} onLook={setLook} canvas={canvas} onCanvas={setCanvas} />
        </aside>
      </div>

      {figure && (
        <ExportDialog
          isOpen={exportOpen}
          onClose={() => setExportOpen(false)}
          figure={figure}
          canvas={canvas}
          transparentDefault={look.stage.background.transparent}
          unsaved={dirty}
        />
      )}
    </div>
  );
}

/** /figures/:figureId/studio (an existing figure) and /composer (a new one). */
export function StudioPage() {
  const { figureId } = useParams<{ figureId: string }>();
  const api = useApi();
  const figure = useQuery({
    queryKey: ['figure', figureId],
    queryFn: ({ signal }) => api.figure(figureId!, signal),
    enabled: Boolean(figureId),
  });
  const fresh = useMemo(() => defaultRecipe(), []);
  if (!figureId) return <Studio initial={fresh} figure={null} />;
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
