// Export a figure: PNG at a physical size and dpi, SVG companions, the bundle, or the mesh files.
import { useMemo, useState } from 'react';
import { Button, Callout, Dialog, DialogBody, DialogFooter, FormGroup, HTMLSelect, Spinner } from '@blueprintjs/core';
import { useQuery } from '@tanstack/react-query';
import {
  DEFAULT_DELIVERY_PROFILE,
  PRESS_CONDITIONS,
  rasterProblem,
  type AssetDto,
  type ColourMode,
  type DeliveryProfile,
  type FigureDto,
  type JobDto,
  type PreflightReport,
  type PressConditionId,
  type Recipe,
} from '@psiform/contracts';
import { altOf, DPI_CHOICES, figureWords, plannedSubject, preflightReport, type PlannedFile } from '@psiform/print';
import { ApiError, describeError } from '../api/client';
import { getDeliveryProfile } from '../print/printApi';
import { PreflightFileTable } from '../print/PreflightPanel';
import { JobProgress } from '../figures/JobProgress';
import { useApi } from '../auth/AuthProvider';
import { AssetDownloads } from '../figures/AssetDownloads';
import { fromMm } from './exportSize';
import { CanvasSizeFields, columnChoices, useCanvasSize, type ColumnChoice } from './CanvasSizeFields';

export type ExportFormat = 'tiff' | 'png' | 'pdf-radial' | 'pdf-section' | 'svg-radial' | 'svg-section' | 'bundle' | 'glb' | 'stl';

/** Body of POST /api/figures/:id/exports. */
export type ExportRequestBody =
  | { format: 'png'; widthMm: number; heightMm: number; dpi: number; transparent?: boolean }
  | { format: 'tiff'; widthMm: number; heightMm: number; dpi: number; transparent?: boolean; colour: ColourMode; pressCondition: PressConditionId }
  | { format: 'svg'; kind: 'radial' | 'section' }
  | { format: 'pdf'; kind: 'radial' | 'section'; colour: ColourMode; pressCondition: PressConditionId }
  | { format: 'bundle' };

const FORMAT_LABEL: Record<ExportFormat, string> = {
  tiff: 'TIFF image (print size, dpi and colour)',
  png: 'PNG image (print size and dpi)',
  'pdf-radial': 'PDF companion: radial plot',
  'pdf-section': 'PDF companion: cross-section',
  'svg-radial': 'SVG companion: radial plot',
  'svg-section': 'SVG companion: cross-section',
  bundle: 'Bundle (files + metadata sheet + preflight)',
  glb: 'GLB mesh (glTF 2.0)',
  stl: 'STL mesh',
};

/**
 * The formats in the order the publication's delivery profile asks for them: its raster formats, then its vector
 * formats (radial plot and cross-section each), then the bundle and the meshes; formats the profile does not list
 * come last, marked so.
 */
export function exportFormatChoices(profile: Pick<DeliveryProfile, 'rasterFormats' | 'vectorFormats'>): { value: ExportFormat; label: string }[] {
  const asked: ExportFormat[] = [
    ...profile.rasterFormats,
    ...profile.vectorFormats.flatMap((v) => [`${v}-radial`, `${v}-section`] as ExportFormat[]),
  ];
  const rest = (Object.keys(FORMAT_LABEL) as ExportFormat[]).filter((f) => !asked.includes(f));
  const outside = (f: ExportFormat) => f === 'tiff' || f === 'png' || f.startsWith('pdf') || f.startsWith('svg');
  return [
    ...asked.map((f) => ({ value: f, label: FORMAT_LABEL[f] })),
    ...rest.map((f) => ({ value: f, label: outside(f) ? `${FORMAT_LABEL[f]} (not in the delivery profile)` : FORMAT_LABEL[f] })),
  ];
}

/** The dialog's first resolution: the canvas's, raised to the profile's minimum when it is below (the lowest choice that meets it). */
export function firstDpi(canvasDpi: number, minDpi: number): number {
  if (canvasDpi >= minDpi) return canvasDpi;
  return DPI_CHOICES.find((d) => d >= minDpi) ?? DPI_CHOICES[DPI_CHOICES.length - 1];
}

export const EXPORT_STAGE_WORDS: Record<string, string> = {
  queued: 'Waiting in the queue',
  loading: 'Loading the figure',
  meshing: 'Computing the mesh',
  rendering: 'Drawing the figure',
  render: 'Drawing the figure',
  encoding: 'Writing the file',
  plotting: 'Drawing the plot',
  bundling: 'Packing the bundle',
  storing: 'Storing the file',
  done: 'Done',
};

function serverText(err: unknown): string {
  if (err instanceof ApiError && err.status === 404 && !err.body?.message?.toString().trim()) {
    return 'This server does not offer exports yet (POST /api/figures/:id/exports answered 404).';
  }
  if (err instanceof ApiError && (err.status === 404 || err.status === 405) && /Cannot POST/i.test(String(err.body?.message ?? ''))) {
    return 'This server does not offer exports yet (POST /api/figures/:id/exports is not a route).';
  }
  return describeError(err);
}

/** The file the user asked for comes first; a job that had to compute the mesh first also lists its GLB and STL. */
export function askedForFirst(assets: AssetDto[], kind: string | undefined): AssetDto[] {
  if (!kind) return assets;
  return [...assets].sort((a, b) => Number(b.kind === kind) - Number(a.kind === kind));
}

/** The downloads of an export, each button naming kind, size and dpi (see figures/AssetDownloads). */
export function DownloadList({ assets, testid }: { assets: AssetDto[]; testid: string }) {
  return <AssetDownloads assets={assets} containerTestid={testid} testid={() => 'export-download'} primary />;
}

/** An export job's words for a failure: the stage it stopped in and the worker's message. */
function exportFailureText(job: JobDto): string {
  const where = job.stage && job.stage !== 'done' ? ` while ${(EXPORT_STAGE_WORDS[job.stage] ?? job.stage).toLowerCase()}` : '';
  return `The export failed${where}: ${job.error?.trim() || 'the worker gave no message.'}`;
}

/**
 * Starting an export job (POST `path` with the export request) and holding what follows: the job to follow, its
 * finished snapshot (setResult, from ExportProgress), the reason it was not started (`errorText` words it), and
 * whether a request is on its way. One owner for the figure's and the figure set's export forms.
 */
export function useExportJob(path: string, errorText: (err: unknown) => string = describeError) {
  const api = useApi();
  const [jobId, setJobId] = useState<string | null>(null);
  const [result, setResult] = useState<JobDto | null>(null);
  const [sending, setSending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  async function start(body: object) {
    setSending(true);
    setError(null);
    setResult(null);
    setJobId(null);
    try {
      const r = await api.request<{ jobId: string }>(path, { method: 'POST', body });
      setJobId(r.jobId);
    } catch (err) {
      setError(errorText(err));
    } finally {
      setSending(false);
    }
  }
  return { jobId, result, setResult, sending, error, start, running: Boolean(jobId) && !result };
}

export function ExportProgress({ jobId, onDone }: { jobId: string; onDone(job: JobDto): void }) {
  return <JobProgress jobId={jobId} onFinished={onDone} testId="export" words={EXPORT_STAGE_WORDS} connecting="Connecting to the export job…" failure={exportFailureText} />;
}

export interface ExportFormProps {
  figure: FigureDto;
  canvas: Recipe['canvas'];
  transparentDefault: boolean;
  /** The studio has changes the server has not stored: the export would draw the saved version. */
  unsaved?: boolean;
}

/** The preflight report an export job attached to its file (asset stats.preflight), when it did. */
function reportOf(asset: AssetDto): PreflightReport | null {
  const r = (asset.stats as { preflight?: PreflightReport } | null | undefined)?.preflight;
  return r && Array.isArray(r.files) ? r : null;
}

/** The figure's alt text as the export will write it: from the version's mesh statistics (null before a mesh exists). */
function figureAlt(figure: FigureDto): { short: string; long: string } | null {
  const mesh = figure.assets.find((a) => a.kind === 'glb' && a.stats?.grid);
  if (!mesh?.stats) return null;
  try {
    return altOf(figureWords(figure.currentVersion.recipe, mesh.stats, figure.currentVersion.engineVersion || 'unknown', new Date().toISOString()));
  } catch {
    return null;
  }
}

/**
 * Loads the publication's delivery profile, then the form: its choices come first (formats, column widths, dpi,
 * colour mode and press condition) and the preflight runs on the planned file before anything is sent.
 */
export function ExportForm(props: ExportFormProps) {
  const api = useApi();
  const q = useQuery({ queryKey: ['delivery-profile', props.figure.publicationId], queryFn: () => getDeliveryProfile(api, props.figure.publicationId), retry: false });
  if (q.isPending) return <Spinner size={24} data-testid="exp-profile-loading" />;
  const profile: DeliveryProfile = q.data ?? DEFAULT_DELIVERY_PROFILE;
  return (
    <>
      {q.isError ? (
        <Callout intent="warning" className="pf-gap-sm" data-testid="exp-profile-error">
          The publication&apos;s delivery profile could not be read ({describeError(q.error)}); the default profile&apos;s choices are offered.
        </Callout>
      ) : (
        <p className="pf-muted pf-small" data-testid="exp-profile">
          Choices of the publication&apos;s delivery profile{q.data?.isDefault ? ' (the default: the publication has not set its own)' : ''} come first: {profile.rasterFormats.join(' or ').toUpperCase()} at
          {' '}at least {profile.minDpi} dpi, {profile.colourMode.toUpperCase()}
          {profile.colourMode === 'cmyk' ? ` for ${PRESS_CONDITIONS.find((c) => c.id === profile.pressCondition)?.name ?? profile.pressCondition}` : ''}.
        </p>
      )}
      <ProfiledExportForm {...props} profile={profile} />
    </>
  );
}

function ProfiledExportForm({ figure, canvas, transparentDefault, unsaved, profile }: ExportFormProps & { profile: DeliveryProfile }) {
  const size = useCanvasSize({ widthMm: canvas.widthMm, heightMm: canvas.heightMm, dpi: firstDpi(canvas.dpi, profile.minDpi), transparent: transparentDefault });
  const { unit, setW, setH, dpi, transparent, widthMm, heightMm, px } = size;
  const formats = useMemo(() => exportFormatChoices(profile), [profile]);
  const [format, setFormat] = useState<ExportFormat>(formats[0].value);
  const [colour, setColour] = useState<ColourMode>(profile.colourMode);
  const [press, setPress] = useState<PressConditionId>(profile.pressCondition);
  const [requestedKind, setRequestedKind] = useState<string | undefined>();
  const { jobId, result, setResult, sending, error, start, running } = useExportJob(`/api/figures/${encodeURIComponent(figure.id)}/exports`, serverText);
  const columns = useMemo(() => columnChoices(profile), [profile]);

  function preset(c: ColumnChoice) {
    const aspect = widthMm && heightMm ? heightMm / widthMm : canvas.heightMm / canvas.widthMm;
    setW(fromMm(c.widthMm, unit));
    setH(fromMm(Math.max(10, Math.round(c.widthMm * aspect * 10) / 10), unit));
  }

  const raster = format === 'png' || format === 'tiff';
  const coloured = format === 'tiff' || format.startsWith('pdf');
  const plot = format.startsWith('svg') || format.startsWith('pdf') ? (format.endsWith('radial') ? 'radial' : 'section') : null;
  const meshAsset = format === 'glb' || format === 'stl' ? figure.assets.find((a) => a.kind === format) : undefined;
  const sized = widthMm !== null && heightMm !== null ? { widthMm: Number(widthMm.toFixed(3)), heightMm: Number(heightMm.toFixed(3)), dpi } : null;
  const body: ExportRequestBody | null =
    format === 'png'
      ? sized && { format: 'png', ...sized, ...(transparent ? { transparent: true } : {}) }
      : format === 'tiff'
        ? sized && { format: 'tiff', ...sized, ...(transparent ? { transparent: true } : {}), colour, pressCondition: press }
        : plot && format.startsWith('svg')
          ? { format: 'svg', kind: plot }
          : plot
            ? { format: 'pdf', kind: plot, colour, pressCondition: press }
            : format === 'bundle'
              ? { format: 'bundle' }
              : null;

  // The preflight of the file this export will write, against the publication's profile, before anything is sent.
  const alt = useMemo(() => figureAlt(figure), [figure]);
  const planned: PlannedFile | null =
    format === 'png' || format === 'tiff'
      ? sized && (format === 'tiff' ? { format, ...sized, colour, pressCondition: press } : { format, ...sized })
      : plot && format.startsWith('pdf')
        ? { format: 'pdf', kind: plot, widthMm: canvas.widthMm, heightMm: canvas.heightMm, colour, pressCondition: press }
        : plot
          ? { format: 'svg', kind: plot, widthMm: canvas.widthMm, heightMm: canvas.heightMm }
          : null;
  const uploaded = figure.currentVersion.recipe.source?.kind === 'upload';
  const plannedReport = useMemo(() => {
    if (!planned || (plot && uploaded)) return null;
    try {
      return preflightReport([plannedSubject(planned, figure.currentVersion.recipe, alt)], profile, new Date().toISOString());
    } catch {
      return null;
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps -- planned is rebuilt each render from these values
  }, [JSON.stringify(planned), figure.currentVersion.recipe, alt, profile, plot, uploaded]);
  const failing = plannedReport ? plannedReport.files.flatMap((f) => f.results.filter((r) => r.status === 'fail')).length : 0;

  async function submit() {
    if (!body) return;
    setRequestedKind(body.format);
    await start(body);
  }

  const rasterLimit = raster && sized ? rasterProblem(sized.widthMm, sized.heightMm, dpi) : null;
  const blocked = raster && !sized ? 'Export waits for a valid width and height (see the fields above).' : rasterLimit ? `Cannot export: ${rasterLimit}.` : null;
  const cond = PRESS_CONDITIONS.find((c) => c.id === press);
  const colourWords = colour === 'cmyk' ? `CMYK ${cond?.id.toUpperCase() ?? press}` : 'RGB';
  const what = raster
    ? `${format.toUpperCase()} · ${widthMm !== null ? Number(widthMm.toFixed(1)) : '?'} × ${heightMm !== null ? Number(heightMm.toFixed(1)) : '?'} mm · ${dpi} dpi${format === 'tiff' ? ` · ${colourWords}` : ''}`
    : plot
      ? `${format.startsWith('pdf') ? 'PDF' : 'SVG'} ${plot === 'radial' ? 'radial plot' : 'section (xz)'} · ${canvas.widthMm} × ${canvas.heightMm} mm${format.startsWith('pdf') ? ` · ${colourWords}` : ''}`
      : format === 'bundle'
        ? 'bundle (zip)'
        : format.toUpperCase();
  const doneReports = result?.state === 'completed' ? result.assets.map((a) => ({ asset: a, report: reportOf(a) })).filter((x) => x.report) : [];
  return (
    <div className="pf-export" data-testid="export-form">
      <FormGroup label="Format" labelFor="exp-format">
        <HTMLSelect id="exp-format" value={format} onChange={(e) => setFormat(e.currentTarget.value as ExportFormat)} options={formats} data-testid="exp-format" fill />
      </FormGroup>

      {raster && (
        <>
          <CanvasSizeFields
            size={size}
            idPrefix="exp"
            presets={columns}
            onPreset={preset}
            minDpi={profile.minDpi}
            note={<p className="pf-muted pf-small">Column widths of the publication&apos;s delivery profile.</p>}
          />
          <p className="pf-pixels" data-testid="exp-pixels">
            {px ? px.text : 'Enter a valid width and height to see the pixel size.'}
          </p>
        </>
      )}

      {coloured && (
        <div className="pf-form-row">
          <FormGroup label="Colour" labelFor="exp-colour">
            <HTMLSelect
              id="exp-colour"
              value={colour}
              onChange={(e) => setColour(e.currentTarget.value as ColourMode)}
              options={(['cmyk', 'rgb'] as const).map((c) => ({ value: c, label: `${c === 'cmyk' ? 'CMYK (separated for press)' : 'RGB (sRGB embedded)'}${c === profile.colourMode ? ' · profile' : ''}` }))}
              data-testid="exp-colour"
            />
          </FormGroup>
          {colour === 'cmyk' && (
            <FormGroup label="Press condition" labelFor="exp-press">
              <HTMLSelect
                id="exp-press"
                value={press}
                onChange={(e) => setPress(e.currentTarget.value as PressConditionId)}
                options={[...PRESS_CONDITIONS].sort((a, b) => Number(b.id === profile.pressCondition) - Number(a.id === profile.pressCondition)).map((c) => ({ value: c.id, label: `${c.name}${c.id === profile.pressCondition ? ' · profile' : ''}` }))}
                data-testid="exp-press"
              />
            </FormGroup>
          )}
        </div>
      )}

      {(format === 'glb' || format === 'stl') &&
        (meshAsset ? (
          <DownloadList assets={[meshAsset]} testid="exp-mesh-download" />
        ) : (
          <Callout intent="primary" data-testid="exp-no-mesh">
            This version has no {format.toUpperCase()} file yet: compute the mesh on the figure page first.
          </Callout>
        ))}

      {plannedReport && !result && (
        <section className="pf-gap-sm" data-testid="exp-preflight" data-passed={plannedReport.passed ? 'true' : 'false'}>
          <h3>Preflight before export: {plannedReport.passed ? 'every check passes' : `${failing} check${failing === 1 ? '' : 's'} fail`}</h3>
          <p className="pf-muted pf-small">
            The file this export will write, checked against the delivery profile. The export checks the written file again and keeps that report with it.
            {!alt && raster ? ' The alt text is written from the mesh: compute the mesh first, or it fails here and in the file.' : ''}
          </p>
          {plannedReport.files.map((f) => (
            <PreflightFileTable key={f.file} file={f} testid="exp-preflight-table" />
          ))}
        </section>
      )}
      {format === 'bundle' && !result && (
        <p className="pf-muted pf-small" data-testid="exp-preflight-bundle">
          A bundle preflights each file it holds ({profile.rasterFormats[0].toUpperCase()} and {profile.vectorFormats.join(', ').toUpperCase()} companions) and carries the report (preflight.json, PREFLIGHT.txt); it is shown here when the export is done.
        </p>
      )}

      {unsaved && (
        <Callout intent="warning" className="pf-gap-sm" data-testid="exp-unsaved">
          You have unsaved changes: exports are made from the saved version {figure.currentVersion.number}. Save first to include them.
        </Callout>
      )}
      {error && (
        <Callout intent="danger" className="pf-gap-sm" data-testid="exp-server-error" title="The export was not started">
          {error}
        </Callout>
      )}
      {jobId && (
        <ExportProgress
          key={jobId}
          jobId={jobId}
          onDone={(job) => {
            setResult(job);
          }}
        />
      )}
      {result?.state === 'completed' &&
        (result.assets.length > 0 ? (
          <DownloadList assets={askedForFirst(result.assets, requestedKind)} testid="export-ready" />
        ) : (
          <Callout intent="warning" data-testid="export-no-asset">
            The export finished but reported no file.
          </Callout>
        ))}
      {doneReports.map(({ asset, report }) => (
        <section key={asset.id} className="pf-gap-sm" data-testid="exp-preflight-done" data-passed={report!.passed ? 'true' : 'false'}>
          <h3>Preflight of the written {asset.kind.toUpperCase()}: {report!.passed ? 'every check passes' : 'some checks fail'}</h3>
          {report!.files.map((f) => (
            <PreflightFileTable key={f.file} file={f} testid="exp-preflight-done-table" />
          ))}
        </section>
      ))}
      {blocked && (
        <p className="pf-error-line" data-testid="exp-blocked" role="alert">
          {blocked}
        </p>
      )}
      {format !== 'glb' && format !== 'stl' && (
        <Button
          intent={failing ? 'warning' : 'primary'}
          icon="export"
          text={running ? 'Exporting…' : `Export ${what}${failing ? ` (preflight: ${failing} failing)` : ''}`}
          onClick={() => void submit()}
          loading={sending}
          disabled={running || !body || Boolean(blocked)}
          data-testid="exp-submit"
          className="pf-gap-sm"
        />
      )}
    </div>
  );
}

export function ExportDialog({ isOpen, onClose, ...form }: ExportFormProps & { isOpen: boolean; onClose(): void }) {
  return (
    <Dialog isOpen={isOpen} onClose={onClose} title="Export the figure" icon="export" className="pf-export-dialog">
      <DialogBody>
        <ExportForm {...form} />
      </DialogBody>
      <DialogFooter actions={<Button text="Close" onClick={onClose} data-testid="exp-close" />}>
        <span className="pf-muted pf-small">One-electron hydrogen-like model; many-electron orbitals differ.</span>
      </DialogFooter>
    </Dialog>
  );
}
