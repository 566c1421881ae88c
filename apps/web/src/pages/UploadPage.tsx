import { useEffect, useRef, useState, type FormEvent, type HTMLProps } from 'react';
import { Button, Callout, FileInput, FormGroup, InputGroup, NonIdealState, ProgressBar, Radio, RadioGroup } from '@blueprintjs/core';
import { useQueryClient } from '@tanstack/react-query';
import { useNavigate, useSearchParams } from 'react-router-dom';
import { describeError } from '../api/client';
import { uploadCube, type CubeFormat } from '../api/upload';
import { useApi } from '../auth/AuthProvider';
import { validateFraction } from '../figures/model';
import { precheckCube, type Check } from '../figures/precheck';
import { PublicationChooser } from '../figures/PublicationChooser';
import { usePublications } from '../figures/usePublications';
import { formatBytes } from '@psiform/orbitals';
import { QueryStatus } from '../components/QueryStatus';

export interface UploadFormProps {
  publicationId: string;
  onUploaded(figureId: string): void;
}

/** A density cube from elsewhere (NRRD, or raw little-endian float32 + JSON sidecar) becomes a new figure. */
export function UploadForm({ publicationId, onUploaded }: UploadFormProps) {
  const api = useApi();
  const queryClient = useQueryClient();
  const [title, setTitle] = useState('');
  const [format, setFormat] = useState<CubeFormat>('nrrd');
  const [cube, setCube] = useState<File | null>(null);
  const [sidecar, setSidecar] = useState<File | null>(null);
  const [quantity, setQuantity] = useState<'psi' | 'density'>('psi');
  const [fractionText, setFraction] = useState('0.9');
  const [check, setCheck] = useState<Check<string> | null>(null);
  const [progress, setProgress] = useState<number | null>(null);
  const [uploading, setUploading] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const abort = useRef<AbortController | null>(null);

  // Re-check whenever a file or the format changes; a stale answer (from an earlier choice) is ignored.
  useEffect(() => {
    let current = true;
    if (!cube && !sidecar) {
      setCheck(null);
      return;
    }
    void precheckCube({ format, cube, sidecar }).then((r) => {
      if (current) setCheck(r);
    });
    return () => {
      current = false;
    };
  }, [format, cube, sidecar]);

  useEffect(() => () => abort.current?.abort(), []);

  const fraction = Number(fractionText.trim() === '' ? Number.NaN : fractionText);
  const fractionError = validateFraction(fraction);
  const ready = title.trim() !== '' && check?.ok === true && !fractionError && !uploading;

  async function submit(e: FormEvent) {
    e.preventDefault();
    if (!ready || !cube) return;
    setError(null);
    setUploading(true);
    setProgress(0);
    abort.current = new AbortController();
    try {
      const res = await uploadCube(
        api,
        {
          publicationId,
          title: title.trim(),
          format,
          cube,
          sidecar: format === 'raw' ? sidecar : null,
          quantity: format === 'nrrd' ? quantity : undefined,
          fraction,
        },
        { onProgress: (p) => setProgress(p.fraction), signal: abort.current.signal },
      );
      void queryClient.invalidateQueries({ queryKey: ['figures'] });
      onUploaded(res.figureId);
    } catch (err) {
      if (err instanceof DOMException && err.name === 'AbortError') return;
      setError(describeError(err));
      setProgress(null);
    } finally {
      setUploading(false);
    }
  }

  return (
    <form className="pf-form" onSubmit={(e) => void submit(e)} noValidate data-testid="upload-form" aria-label="Upload a density cube">
      <FormGroup label="Title" labelFor="up-title">
        <InputGroup id="up-title" value={title} onValueChange={setTitle} data-testid="upload-title" />
      </FormGroup>
      <RadioGroup
        label="Format"
        selectedValue={format}
        onChange={(e) => setFormat(e.currentTarget.value as CubeFormat)}
      >
        <Radio value="nrrd" label="NRRD (header and data in one file)" data-testid="upload-format-nrrd" />
        <Radio value="raw" label="Raw little-endian float32 (x fastest) with a JSON sidecar" data-testid="upload-format-raw" />
      </RadioGroup>
      {format === 'nrrd' && (
        <RadioGroup label="The cube holds" inline selectedValue={quantity} onChange={(e) => setQuantity(e.currentTarget.value as 'psi' | 'density')}>
          <Radio value="psi" label="ψ (signed: two phases)" data-testid="upload-quantity-psi" />
          <Radio value="density" label="density |ψ|² (one surface)" data-testid="upload-quantity-density" />
        </RadioGroup>
      )}
      {format === 'raw' && (
        <FormGroup
          label="Sidecar (JSON)"
          labelFor="up-sidecar"
          helperText='{"sizes":[nx,ny,nz], "spacing": d or [dx,dy,dz], "origin": [x,y,z] (optional), "quantity": "psi" or "density"}, lengths in a0'
        >
          <FileInput
            fill
            text={sidecar ? sidecar.name : 'Choose the sidecar…'}
            hasSelection={Boolean(sidecar)}
            onInputChange={(e) => setSidecar(e.currentTarget.files?.[0] ?? null)}
            inputProps={{ id: 'up-sidecar', accept: '.json,application/json', 'data-testid': 'upload-sidecar' } as HTMLProps<HTMLInputElement>}
          />
        </FormGroup>
      )}
      <FormGroup label="Cube file" labelFor="up-cube" helperText={cube ? `${cube.name}, ${formatBytes(cube.size)}` : undefined}>
        <FileInput
          fill
          text={cube ? cube.name : format === 'nrrd' ? 'Choose the .nrrd file…' : 'Choose the raw float32 file…'}
          hasSelection={Boolean(cube)}
          onInputChange={(e) => setCube(e.currentTarget.files?.[0] ?? null)}
          inputProps={{ id: 'up-cube', accept: format === 'nrrd' ? '.nrrd' : undefined, 'data-testid': 'upload-cube' } as HTMLProps<HTMLInputElement>}
        />
      </FormGroup>

      <FormGroup
        label="Enclosed fraction"
        labelFor="up-fraction"
        intent={fractionError ? 'danger' : 'none'}
        helperText={fractionError ? <span data-testid="upload-fraction-error">{fractionError}</span> : 'Share of the probability inside the surface, e.g. 0.9'}
      >
        <InputGroup id="up-fraction" inputMode="decimal" value={fractionText} onValueChange={setFraction} data-testid="upload-fraction" />
      </FormGroup>

      {check && (
        <Callout intent={check.ok ? 'success' : 'danger'} data-testid="upload-precheck" className="pf-gap">
          {check.ok ? check.value : check.message}
        </Callout>
      )}
      {progress !== null && (
        <div className="pf-gap">
          <ProgressBar value={progress ?? undefined} intent="primary" data-testid="upload-progress" />
          <span className="pf-muted pf-small" data-testid="upload-percent">
            {progress === null ? 'Uploading…' : `${Math.round(progress * 100)}% sent`}
          </span>
        </div>
      )}
      {error && (
        <Callout intent="danger" title="The cube was not accepted" data-testid="upload-error" className="pf-gap">
          {error}
        </Callout>
      )}
      <Button type="submit" intent="primary" icon="upload" text="Upload" disabled={!ready} loading={uploading} data-testid="upload-submit" />
    </form>
  );
}

export function UploadPage() {
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const publications = usePublications();
  const list = publications.data ?? [];
  const [chosen, setChosen] = useState<string | null>(null);
  const wanted = chosen ?? search.get('publicationId');
  const current = list.find((p) => p.id === wanted) ?? list[0];
  return (
    <div className="pf-page" data-testid="upload-page">
      <header className="pf-page-head">
        <h1>Upload a density cube</h1>
        <p className="pf-muted">A sampled ψ or |ψ|² from another program becomes a figure; Psiform draws its isosurfaces.</p>
      </header>
      <QueryStatus query={publications} what="publications" testId="upload-publications" />
      {publications.isSuccess && list.length === 0 && (
        <NonIdealState icon="inbox" title="No publication to add to" description="A figure belongs to a publication, and you are not a member of any." />
      )}
      {current && (
        <>
          <PublicationChooser publications={list} value={current.id} onChange={setChosen} id="up-publication" />
          <UploadForm publicationId={current.id} onUploaded={(id) => navigate(`/figures/${encodeURIComponent(id)}`)} />
        </>
      )}
    </div>
  );
}
