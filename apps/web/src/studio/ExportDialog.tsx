// Export a figure: PNG at a physical size and dpi, SVG companions, the bundle, or the mesh files.
import { useState } from 'react';
import { Button, Callout, Dialog, DialogBody, DialogFooter, FormGroup, HTMLSelect, ProgressBar } from '@blueprintjs/core';
import { rasterProblem, type AssetDto, type FigureDto, type JobDto, type Recipe } from '@psiform/contracts';
import { COLUMN_PRESETS, type ColumnPreset } from '@psiform/print';
import { ApiError, describeError } from '../api/client';
import { useFollowJob } from '../figures/JobProgress';
import { useApi } from '../auth/AuthProvider';
import { AssetDownloads } from '../figures/AssetDownloads';
import { fromMm } from './exportSize';
import { CanvasSizeFields, useCanvasSize } from './CanvasSizeFields';

export type ExportFormat = 'png' | 'svg-radial' | 'svg-section' | 'bundle' | 'glb' | 'stl';

/** Body of POST /api/figures/:id/exports. */
export type ExportRequestBody =
  | { format: 'png'; widthMm: number; heightMm: number; dpi: number; transparent?: boolean }
  | { format: 'svg'; kind: 'radial' | 'section' }
  | { format: 'bundle' };

const FORMATS: { value: ExportFormat; label: string }[] = [
  { value: 'png', label: 'PNG image (print size and dpi)' },
  { value: 'svg-radial', label: 'SVG companion: radial plot' },
  { value: 'svg-section', label: 'SVG companion: cross-section' },
  { value: 'bundle', label: 'Bundle (files + metadata sheet)' },
  { value: 'glb', label: 'GLB mesh (glTF 2.0)' },
  { value: 'stl', label: 'STL mesh' },
];

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

export function ExportProgress({ jobId, onDone }: { jobId: string; onDone(job: JobDto): void }) {
  const { job, streamError: err } = useFollowJob(jobId, onDone);
  const state = job?.state ?? 'queued';
  const value = job ? Math.max(0, Math.min(100, job.progress)) / 100 : 0;
  const running = state === 'queued' || state === 'active';
  return (
    <div className="pf-job" data-testid="export-progress" data-state={state} aria-live="polite">
      <div className="pf-job-line">
        <span data-testid="export-stage">{job ? (EXPORT_STAGE_WORDS[job.stage] ?? job.stage) : 'Connecting to the export job…'}</span>
        <span className="pf-muted" data-testid="export-percent">
          {Math.round(value * 100)}%
        </span>
      </div>
      <ProgressBar value={value} intent={state === 'failed' ? 'danger' : state === 'completed' ? 'success' : 'primary'} animate={running} stripes={running} />
      {job?.state === 'failed' && (
        <Callout intent="danger" className="pf-job-msg" data-testid="export-error">
          The export failed{job.stage && job.stage !== 'done' ? ` while ${(EXPORT_STAGE_WORDS[job.stage] ?? job.stage).toLowerCase()}` : ''}: {job.error?.trim() || 'the worker gave no message.'}
        </Callout>
      )}
      {err && (
        <Callout intent="warning" className="pf-job-msg" data-testid="export-stream-error">
          Progress could not be followed: {err}
        </Callout>
      )}
    </div>
  );
}

export interface ExportFormProps {
  figure: FigureDto;
  canvas: Recipe['canvas'];
  transparentDefault: boolean;
  /** The studio has changes the server has not stored: the export would draw the saved version. */
  unsaved?: boolean;
}

export function ExportForm({ figure, canvas, transparentDefault, unsaved }: ExportFormProps) {
  const api = useApi();
  const size = useCanvasSize({ widthMm: canvas.widthMm, heightMm: canvas.heightMm, dpi: canvas.dpi, transparent: transparentDefault });
  const { unit, setW, setH, dpi, transparent, widthMm, heightMm, px } = size;
  const [format, setFormat] = useState<ExportFormat>('png');
  const [requestedKind, setRequestedKind] = useState<string | undefined>();
  const [jobId, setJobId] = useState<string | null>(null);
  const [result, setResult] = useState<JobDto | null>(null);
  const [sending, setSending] = useState(false);
  const [error, setError] = useState<string | null>(null);

  function preset(p: ColumnPreset) {
    const target = COLUMN_PRESETS[p].widthMm;
    const aspect = widthMm && heightMm ? heightMm / widthMm : canvas.heightMm / canvas.widthMm;
    setW(fromMm(target, unit));
    setH(fromMm(Math.max(10, Math.round(target * aspect * 10) / 10), unit));
  }

  const meshAsset = format === 'glb' || format === 'stl' ? figure.assets.find((a) => a.kind === format) : undefined;
  const body: ExportRequestBody | null =
    format === 'png'
      ? widthMm !== null && heightMm !== null
        ? { format: 'png', widthMm: Number(widthMm.toFixed(3)), heightMm: Number(heightMm.toFixed(3)), dpi, ...(transparent ? { transparent: true } : {}) }
        : null
      : format === 'svg-radial'
        ? { format: 'svg', kind: 'radial' }
        : format === 'svg-section'
          ? { format: 'svg', kind: 'section' }
          : format === 'bundle'
            ? { format: 'bundle' }
            : null;

  async function submit() {
    if (!body) return;
    setRequestedKind(body.format === 'svg' ? 'svg' : body.format);
    setSending(true);
    setError(null);
    setResult(null);
    setJobId(null);
    try {
      const r = await api.request<{ jobId: string }>(`/api/figures/${encodeURIComponent(figure.id)}/exports`, { method: 'POST', body });
      setJobId(r.jobId);
    } catch (err) {
      setError(serverText(err));
    } finally {
      setSending(false);
    }
  }

  const running = Boolean(jobId) && !result;
  const raster = format === 'png' && widthMm !== null && heightMm !== null ? rasterProblem(Number(widthMm.toFixed(3)), Number(heightMm.toFixed(3)), dpi) : null;
  const blocked = format === 'png' && (widthMm === null || heightMm === null) ? 'Export waits for a valid width and height (see the fields above).' : raster ? `Cannot export: ${raster}.` : null;
  const what =
    format === 'png'
      ? `PNG · ${widthMm !== null ? Number(widthMm.toFixed(1)) : '?'} × ${heightMm !== null ? Number(heightMm.toFixed(1)) : '?'} mm · ${dpi} dpi`
      : format === 'svg-radial'
        ? `SVG radial plot · ${canvas.widthMm} × ${canvas.heightMm} mm`
        : format === 'svg-section'
          ? `SVG section (xz) · ${canvas.widthMm} × ${canvas.heightMm} mm`
          : format === 'bundle'
            ? 'bundle (zip)'
            : format.toUpperCase();
  return (
    <div className="pf-export" data-testid="export-form">
      <FormGroup label="Format" labelFor="exp-format">
        <HTMLSelect id="exp-format" value={format} onChange={(e) => setFormat(e.currentTarget.value as ExportFormat)} options={FORMATS} data-testid="exp-format" fill />
      </FormGroup>

      {format === 'png' && (
        <>
          <CanvasSizeFields
            size={size}
            idPrefix="exp"
            onPreset={preset}
            note={<p className="pf-muted pf-small">Column widths are common practice, not a standard: check the publisher's author guide.</p>}
          />
          <p className="pf-pixels" data-testid="exp-pixels">
            {px ? px.text : 'Enter a valid width and height to see the pixel size.'}
          </p>
        </>
      )}

      {(format === 'glb' || format === 'stl') &&
        (meshAsset ? (
          <DownloadList assets={[meshAsset]} testid="exp-mesh-download" />
        ) : (
          <Callout intent="primary" data-testid="exp-no-mesh">
            This version has no {format.toUpperCase()} file yet: compute the mesh on the figure page first.
          </Callout>
        ))}

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
      {blocked && (
        <p className="pf-error-line" data-testid="exp-blocked" role="alert">
          {blocked}
        </p>
      )}
      {format !== 'glb' && format !== 'stl' && (
        <Button
          intent="primary"
          icon="export"
          text={running ? 'Exporting…' : `Export ${what}`}
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
