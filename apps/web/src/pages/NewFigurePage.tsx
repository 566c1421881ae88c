import { useState, type FormEvent } from 'react';
import { Button, Callout, FormGroup, HTMLSelect, InputGroup, NonIdealState, Radio, RadioGroup, Spinner } from '@blueprintjs/core';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useNavigate, useSearchParams } from 'react-router-dom';
import { formatRecipeIssues, parseRecipe, RECIPE_LIMITS, RECIPE_VERSION, type Recipe } from '@psiform/contracts';
import { ApiError, describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { describeRecipe, gridMemoryText, validateFraction, validateGridN, validateZInt } from '../figures/model';
import { PublicationChooser } from '../figures/PublicationChooser';
import { checkQuantumNumbers, orbitalFromLabel, orbitalFromNlm, type OrbitalChoice } from '../figures/quantum';
import { usePublications } from '../figures/usePublications';

type Mode = 'label' | 'nlm';

function num(text: string): number {
  const t = text.trim().replace(/^\u2212/, '-');
  return t === '' ? Number.NaN : Number(t);
}

/** Server validation messages as a list (NestJS sends a string or a string[]). */
function serverMessages(err: unknown): string[] {
  if (err instanceof ApiError && err.status === 400 && err.body) {
    const m = err.body.message;
    return Array.isArray(m) ? m : [m];
  }
  return [describeError(err)];
}

export interface NewFigureFormProps {
  publicationId: string;
  onCreated(figureId: string): void;
}

/** A first, simple way to make a figure: one orbital, Z, grid and enclosed fraction (the Composer comes later). */
export function NewFigureForm({ publicationId, onCreated }: NewFigureFormProps) {
  const api = useApi();
  const queryClient = useQueryClient();
  const [title, setTitle] = useState('');
  const [mode, setMode] = useState<Mode>('label');
  const [label, setLabel] = useState('2pz');
  const [nText, setN] = useState('2');
  const [lText, setL] = useState('1');
  const [mText, setM] = useState('0');
  const [basis, setBasis] = useState<'real' | 'complex'>('real');
  const [zText, setZ] = useState('1');
  const [gridText, setGrid] = useState('96');
  const [fractionText, setFraction] = useState('0.9');

  const qn = checkQuantumNumbers(nText, lText, mText);
  const fromLabel = mode === 'label' ? orbitalFromLabel(label) : null;
  const orbital: OrbitalChoice | null =
    mode === 'label'
      ? fromLabel && fromLabel.ok
        ? fromLabel.value
        : null
      : qn.values
        ? orbitalFromNlm(qn.values.n, qn.values.l, qn.values.m, basis)
        : null;

  const Z = num(zText);
  const gridN = num(gridText);
  const fraction = num(fractionText);
  const zError = zText.trim() === '' ? 'Enter the nuclear charge Z.' : validateZInt(Z);
  const gridError = gridText.trim() === '' ? 'Enter the grid size N.' : validateGridN(gridN);
  const fractionError = fractionText.trim() === '' ? 'Enter the enclosed fraction.' : validateFraction(fraction);
  const titleError = title.trim() === '' ? 'Give the figure a title.' : title.length > 200 ? 'Keep the title under 200 characters.' : null;

  // The same schema the server applies: built only when every field reads, then checked as a whole.
  const built = (() => {
    if (!orbital || zError || gridError || fractionError) return null;
    const doc = {
      version: RECIPE_VERSION,
      label: orbital.label,
      content: { Z, terms: orbital.terms.map((t) => ({ n: t.n, l: t.l, m: t.m, basis: t.basis, re: t.re, im: t.im })) },
      grid: { n: gridN, extent: 'auto' as const },
      surface: { rule: 'enclosed' as const, fraction },
    };
    const parsed = parseRecipe(doc);
    return parsed.ok ? { ok: true as const, doc, recipe: parsed.recipe } : { ok: false as const, issues: formatRecipeIssues(parsed.issues) };
  })();

  const create = useMutation({
    mutationFn: (recipe: unknown) => api.createFigure({ publicationId, title: title.trim(), recipe }),
    onSuccess: (fig) => {
      void queryClient.invalidateQueries({ queryKey: ['figures'] });
      onCreated(fig.id);
    },
  });

  const valid = !titleError && built?.ok === true;
  const complex = orbital ? !orbital.isReal : false;

  function submit(e: FormEvent) {
    e.preventDefault();
    if (!valid || !built?.ok || create.isPending) return;
    create.mutate(built.doc);
  }

  const field = (err: string | null) => (err ? ('danger' as const) : ('none' as const));
  const msg = (id: string, err: string | null, help?: string) =>
    err ? (
      <span data-testid={id} role="alert">
        {err}
      </span>
    ) : (
      help
    );

  return (
    <form className="pf-form" onSubmit={submit} noValidate data-testid="new-figure-form" aria-label="New figure">
      <FormGroup label="Title" labelFor="nf-title" intent={title && titleError ? 'danger' : 'none'} helperText={title ? msg('nf-title-error', titleError) : undefined}>
        <InputGroup id="nf-title" value={title} onValueChange={setTitle} placeholder="e.g. Plate 4.2: the 2p_z orbital" data-testid="nf-title" />
      </FormGroup>

      <RadioGroup label="Orbital" inline selectedValue={mode} onChange={(e) => setMode(e.currentTarget.value as Mode)}>
        <Radio value="label" label="By label" data-testid="nf-mode-label" />
        <Radio value="nlm" label="By n, l, m" data-testid="nf-mode-nlm" />
      </RadioGroup>

      {mode === 'label' ? (
        <FormGroup
          label="Orbital label"
          labelFor="nf-label"
          intent={fromLabel && !fromLabel.ok ? 'danger' : 'none'}
          helperText={
            fromLabel && !fromLabel.ok
              ? msg('nf-label-error', fromLabel.message)
              : 'Real forms such as 1s, 2pz, 3dxy, 3dz2, 3dx2-y2, 4fxyz; hybrids sp, sp2, sp3 (#1…); complex 2p+1, 3d-2.'
          }
        >
          <InputGroup id="nf-label" value={label} onValueChange={setLabel} data-testid="nf-label" spellCheck={false} />
        </FormGroup>
      ) : (
        <div className="pf-qn">
          <FormGroup label="n" labelFor="nf-n" intent={field(qn.n)} helperText={msg('nf-n-error', qn.n)}>
            <InputGroup id="nf-n" inputMode="numeric" value={nText} onValueChange={setN} data-testid="nf-n" />
          </FormGroup>
          <FormGroup label="l" labelFor="nf-l" intent={field(qn.l)} helperText={msg('nf-l-error', qn.l)}>
            <InputGroup id="nf-l" inputMode="numeric" value={lText} onValueChange={setL} data-testid="nf-l" />
          </FormGroup>
          <FormGroup label="m" labelFor="nf-m" intent={field(qn.m)} helperText={msg('nf-m-error', qn.m)}>
            <InputGroup id="nf-m" value={mText} onValueChange={setM} data-testid="nf-m" />
          </FormGroup>
          <FormGroup label="Angular form" labelFor="nf-basis">
            <HTMLSelect
              id="nf-basis"
              value={basis}
              onChange={(e) => setBasis(e.currentTarget.value as 'real' | 'complex')}
              data-testid="nf-basis"
              options={[
                { value: 'real', label: 'Real (m > 0 cos-type, m < 0 sin-type)' },
                { value: 'complex', label: 'Complex Y_lm' },
              ]}
            />
          </FormGroup>
        </div>
      )}

      <div className="pf-form-row">
        <FormGroup label="Nuclear charge Z" labelFor="nf-z" intent={field(zError)} helperText={msg('nf-z-error', zError, `1 to ${RECIPE_LIMITS.zMax}`)}>
          <InputGroup id="nf-z" inputMode="numeric" value={zText} onValueChange={setZ} data-testid="nf-z" />
        </FormGroup>
        <FormGroup
          label="Grid N (points per side)"
          labelFor="nf-grid"
          intent={field(gridError)}
          helperText={
            gridError ? (
              msg('nf-grid-error', gridError)
            ) : (
              <span data-testid="nf-memory">{gridMemoryText(gridN, complex)}</span>
            )
          }
        >
          <InputGroup id="nf-grid" inputMode="numeric" value={gridText} onValueChange={setGrid} data-testid="nf-grid" />
        </FormGroup>
        <FormGroup
          label="Enclosed fraction"
          labelFor="nf-fraction"
          intent={field(fractionError)}
          helperText={msg('nf-fraction-error', fractionError, 'Share of the probability inside the surface, e.g. 0.9')}
        >
          <InputGroup id="nf-fraction" inputMode="decimal" value={fractionText} onValueChange={setFraction} data-testid="nf-fraction" />
        </FormGroup>
      </div>

      {built?.ok && (
        <p className="pf-model-note" data-testid="nf-summary">
          {describeRecipe(built.recipe as Recipe)}.
        </p>
      )}
      {built && !built.ok && (
        <Callout intent="danger" title="The recipe is not valid" data-testid="nf-recipe-issues">
          <ul>
            {built.issues.map((i) => (
              <li key={i}>{i}</li>
            ))}
          </ul>
        </Callout>
      )}

      {create.isError && (
        <Callout intent="danger" title="The server did not accept the figure" data-testid="nf-server-error" className="pf-gap">
          <ul>
            {serverMessages(create.error).map((m) => (
              <li key={m}>{m}</li>
            ))}
          </ul>
        </Callout>
      )}

      <Button type="submit" intent="primary" text="Create figure" disabled={!valid} loading={create.isPending} data-testid="nf-submit" />
    </form>
  );
}

export function NewFigurePage() {
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const publications = usePublications();
  const list = publications.data ?? [];
  const [chosen, setChosen] = useState<string | null>(null);
  const wanted = chosen ?? search.get('publicationId');
  const current = list.find((p) => p.id === wanted) ?? list[0];

  return (
    <div className="pf-page" data-testid="new-figure-page">
      <header className="pf-page-head">
        <h1>New figure</h1>
        <p className="pf-muted">One orbital of a one-electron (hydrogen-like) atom. The full Composer comes in a later release.</p>
      </header>
      {publications.isPending && <NonIdealState icon={<Spinner size={32} />} title="Loading publications…" />}
      {publications.isError && (
        <Callout intent="danger" title="Publications could not be loaded">
          {describeError(publications.error)}
        </Callout>
      )}
      {publications.isSuccess && list.length === 0 && (
        <NonIdealState icon="inbox" title="No publication to add to" description="A figure belongs to a publication, and you are not a member of any." />
      )}
      {current && (
        <>
          <PublicationChooser publications={list} value={current.id} onChange={setChosen} id="nf-publication" />
          {list.length === 1 && (
            <p className="pf-muted">
              For <strong>{current.title}</strong>
            </p>
          )}
          <NewFigureForm publicationId={current.id} onCreated={(id) => navigate(`/figures/${encodeURIComponent(id)}`)} />
        </>
      )}
    </div>
  );
}
