import { useCallback, useMemo, useState } from 'react';
import { Button, Callout, FormGroup, InputGroup, NumericInput, Tag } from '@blueprintjs/core';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useNavigate } from 'react-router-dom';
import { checkSwatchbook, DEFAULT_WHEEL, isHex } from '@psiform/colour';
import { PSIFORM_PALETTE, type SwatchbookColorsDto, type SwatchbookDto } from '@psiform/contracts';
import { ApiError, describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { ColourChecks } from './ColourChecks';
import { ColourField } from './ColourField';
import { CvdPreviews, PhaseWheelStrip } from './CvdPreviews';
import { PressCheck } from './PressCheck';
import { createSwatchbook, updateSwatchbook } from './swatchbookApi';

/** Starting colours of a new swatchbook: Psiform's own default palette (contracts PSIFORM_PALETTE). */
export const NEW_SWATCHBOOK_COLOURS: SwatchbookColorsDto = {
  positive: PSIFORM_PALETTE.positive,
  negative: PSIFORM_PALETTE.negative,
  background: '#ffffff',
  label: '#222222',
  nucleus: '#222222',
  axes: '#5f5a52',
  wheel: { ...DEFAULT_WHEEL },
};

const SWATCHES: { key: keyof Omit<SwatchbookColorsDto, 'wheel'>; label: string; optional?: boolean }[] = [
  { key: 'positive', label: 'Positive phase' },
  { key: 'negative', label: 'Negative phase' },
  { key: 'background', label: 'Background' },
  { key: 'label', label: 'Label' },
  { key: 'nucleus', label: 'Nucleus', optional: true },
  { key: 'axes', label: 'Axes', optional: true },
];

function complete(c: SwatchbookColorsDto): boolean {
  return [c.positive, c.negative, c.background, c.label].every(isHex) && [c.nucleus, c.axes].every((v) => v === undefined || isHex(v));
}

/** Same swatches and wheel, whatever the key order. */
export function sameColours(a: SwatchbookColorsDto, b: SwatchbookColorsDto): boolean {
  const keys = ['positive', 'negative', 'background', 'label', 'nucleus', 'axes'] as const;
  if (keys.some((k) => (a[k] ?? null) !== (b[k] ?? null))) return false;
  return (a.wheel?.lightness ?? null) === (b.wheel?.lightness ?? null) && (a.wheel?.chroma ?? null) === (b.wheel?.chroma ?? null);
}

function serverProblems(err: unknown): string[] {
  if (err instanceof ApiError && err.status === 400 && Array.isArray(err.body?.message)) return err.body.message;
  return [describeError(err)];
}

/**
 * Create or edit a swatchbook. Every check is recomputed in the browser (@psiform/colour) on each change,
 * so the art director sees the consequence of a colour before saving. Read-only when locked or not allowed.
 */
export function SwatchbookEditor({ existing, canEdit, publicationId }: { existing?: SwatchbookDto; canEdit: boolean; publicationId?: string }) {
  const api = useApi();
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  const [name, setName] = useState(existing?.name ?? '');
  const [colours, setColours] = useState<SwatchbookColorsDto>(existing?.colors ?? NEW_SWATCHBOOK_COLOURS);
  const [saved, setSaved] = useState(false);
  const readOnly = !canEdit || Boolean(existing?.locked);
  const wheel = colours.wheel ?? DEFAULT_WHEEL;

  const check = useMemo(() => (complete(colours) ? checkSwatchbook(colours) : null), [colours]);
  const dirty = !existing || name.trim() !== existing.name || !sameColours(colours, existing.colors);

  const save = useMutation({
    mutationFn: () => (existing ? updateSwatchbook(api, existing.id, { name: name.trim(), colors: colours }) : createSwatchbook(api, { name: name.trim(), colors: colours, publicationId: publicationId! })),
    onSuccess: (sb) => {
      queryClient.setQueryData(['swatchbook', sb.id], sb);
      void queryClient.invalidateQueries({ queryKey: ['swatchbooks'] });
      void queryClient.invalidateQueries({ queryKey: ['swatchbook-versions', sb.id] });
      setSaved(true);
      if (!existing) navigate(`/swatchbooks/${encodeURIComponent(sb.id)}`);
    },
  });

  function set(key: keyof SwatchbookColorsDto, value: string | undefined) {
    setSaved(false);
    setColours((c) => {
      const next = { ...c } as Record<string, unknown>;
      if (value === undefined) delete next[key];
      else next[key] = value;
      return next as unknown as SwatchbookColorsDto;
    });
  }

  function setWheel(part: 'lightness' | 'chroma', v: number) {
    if (!Number.isFinite(v)) return;
    setSaved(false);
    setColours((c) => ({ ...c, wheel: { ...(c.wheel ?? DEFAULT_WHEEL), [part]: v } }));
  }

  const [problems, setProblems] = useState<Record<string, string>>({});
  const onProblem = useCallback((field: string, problem: string | null) => {
    setProblems((p) => {
      if ((p[field] ?? null) === problem) return p;
      const next = { ...p };
      if (problem) next[field] = problem;
      else delete next[field];
      return next;
    });
  }, []);
  const canSave = !readOnly && dirty && name.trim() !== '' && check !== null && Object.keys(problems).length === 0 && (Boolean(existing) || Boolean(publicationId));

  return (
    <form
      className="pf-swatch-editor"
      onSubmit={(e) => {
        e.preventDefault();
        if (canSave) save.mutate();
      }}
      data-testid="swatchbook-editor"
    >
      <div className="pf-swatch-grid">
        <div>
          <FormGroup label="Name" labelFor="sw-name" intent={name.trim() ? 'none' : 'danger'} helperText={name.trim() ? undefined : 'A name is required.'}>
            <InputGroup id="sw-name" value={name} onChange={(e) => {
                setSaved(false);
                setName(e.target.value);
              }} maxLength={120} disabled={readOnly} data-testid="sw-name" />
          </FormGroup>
          {SWATCHES.map((s) => (
            <ColourField key={s.key} name={s.key} label={s.label} value={colours[s.key]} optional={s.optional} disabled={readOnly} onChange={(v) => set(s.key, v)} onProblem={onProblem} />
          ))}
          <h3>Complex phase wheel</h3>
          <p className="pf-muted pf-small">For complex states the phase arg ψ is a hue at constant OKLCH lightness and chroma.</p>
          <div className="pf-form-row">
            <FormGroup label="Lightness (OKLCH L)" labelFor="sw-wheel-l">
              <NumericInput id="sw-wheel-l" min={0.05} max={0.95} stepSize={0.05} minorStepSize={0.01} value={wheel.lightness} onValueChange={(v) => setWheel('lightness', v)} disabled={readOnly} data-testid="sw-wheel-lightness" />
            </FormGroup>
            <FormGroup label="Chroma (OKLCH C)" labelFor="sw-wheel-c">
              <NumericInput id="sw-wheel-c" min={0} max={0.4} stepSize={0.01} minorStepSize={0.005} value={wheel.chroma} onValueChange={(v) => setWheel('chroma', v)} disabled={readOnly} data-testid="sw-wheel-chroma" />
            </FormGroup>
          </div>
          <PhaseWheelStrip lightness={wheel.lightness} chroma={wheel.chroma} />
        </div>

        <div>
          <h3>How the sample figure looks</h3>
          {check ? (
            <CvdPreviews colours={colours as Parameters<typeof CvdPreviews>[0]['colours']} />
          ) : (
            <p className="pf-muted">Complete every colour to see the previews.</p>
          )}
          {check ? <ColourChecks check={check} /> : <p className="pf-muted" data-testid="checks-incomplete">The checks run once every colour is a #rrggbb value.</p>}
          {check && <PressCheck colours={colours as Parameters<typeof PressCheck>[0]['colours']} />}
        </div>
      </div>

      {!readOnly && (
        <div className="pf-head-actions pf-save-row">
          {saved && !dirty && (
            <Tag minimal intent="success" data-testid="sw-saved">
              Saved
            </Tag>
          )}
          {Object.keys(problems).length > 0 && (
            <span className="pf-error-line" data-testid="sw-save-blocked" role="status">
              Saving waits for {Object.keys(problems).length === 1 ? 'the colour' : 'the colours'} marked in red.
            </span>
          )}
          <Button type="submit" intent="primary" icon="floppy-disk" text={existing ? 'Save changes' : 'Create swatchbook'} disabled={!canSave} loading={save.isPending} data-testid="sw-save" />
        </div>
      )}
      {save.isError && (
        <Callout intent="danger" title="Not saved" className="pf-gap" data-testid="sw-save-error">
          <ul>
            {serverProblems(save.error).map((m) => (
              <li key={m}>{m}</li>
            ))}
          </ul>
        </Callout>
      )}
    </form>
  );
}
