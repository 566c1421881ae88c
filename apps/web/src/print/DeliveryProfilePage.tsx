import { useEffect, useMemo, useState } from 'react';
import { Button, Callout, Checkbox, FormGroup, HTMLSelect, InputGroup, NonIdealState, NumericInput, Radio, RadioGroup, Spinner, Switch } from '@blueprintjs/core';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import {
  ARTWORK_TYPES,
  DELIVERY_LIMITS,
  FILE_NAME_TOKENS,
  PRESS_CONDITIONS,
  RASTER_FORMATS,
  VECTOR_FORMATS,
  parseDeliveryProfile,
  type DeliveryProfile,
} from '@psiform/contracts';
import { describeError } from '../api/client';
import { useApi, useAuth } from '../auth/AuthProvider';
import { getDeliveryProfile, putDeliveryProfile } from './printApi';
import { PublicationPage } from '../components/PublicationPage';
import { CallFailed } from '../components/CallFailed';

/** Field -> message, from the same schema the server uses (libs/contracts parseDeliveryProfile). */
export function profileErrors(p: unknown): Record<string, string> {
  const r = parseDeliveryProfile(p);
  if (r.ok) return {};
  const out: Record<string, string> = {};
  for (const e of r.errors) {
    const [path, ...rest] = e.split(': ');
    const key = path.replace(/\.\d+\./, '.').replace(/\.\d+$/, '');
    if (!out[key]) out[key] = rest.join(': ');
  }
  return out;
}

function Err({ errors, field }: { errors: Record<string, string>; field: string }) {
  return errors[field] ? (
    <div className="pf-field-error" role="alert" data-testid={`dp-error-${field}`}>
      {errors[field]}
    </div>
  ) : null;
}

/** The delivery-profile form: every rule of the publication's deliverables. Art directors (and admins) edit. */
export function DeliveryProfileForm({ publicationId }: { publicationId: string }) {
  const api = useApi();
  const { user } = useAuth();
  const qc = useQueryClient();
  const canEdit = user?.role === 'art_director' || user?.role === 'admin';
  const q = useQuery({ queryKey: ['delivery-profile', publicationId], queryFn: () => getDeliveryProfile(api, publicationId) });
  const [draft, setDraft] = useState<DeliveryProfile | null>(null);
  const [saved, setSaved] = useState(false);
  useEffect(() => {
    if (q.data && !draft) {
      const { publicationId: _p, isDefault: _d, updatedAt: _u, updatedBy: _b, ...profile } = q.data;
      setDraft(profile);
    }
  }, [q.data, draft]);
  const errors = useMemo(() => (draft ? profileErrors(draft) : {}), [draft]);
  const save = useMutation({
    mutationFn: (p: DeliveryProfile) => putDeliveryProfile(api, publicationId, p),
    onSuccess: () => {
      setSaved(true);
      void qc.invalidateQueries({ queryKey: ['delivery-profile', publicationId] });
    },
  });
  if (q.isPending || !draft) return q.isError ? <Callout intent="danger">{describeError(q.error)}</Callout> : <NonIdealState icon={<Spinner size={32} />} title="Loading…" />;
  const set = (patch: Partial<DeliveryProfile>) => {
    setSaved(false);
    setDraft({ ...draft, ...patch });
  };
  const num = (v: number) => (Number.isFinite(v) ? v : NaN);
  const toggle = <T extends string>(list: T[], item: T, on: boolean): T[] => (on ? [...list.filter((x) => x !== item), item] : list.filter((x) => x !== item));
  const L = DELIVERY_LIMITS;
  return (
    <form
      className="pf-form"
      data-testid="delivery-profile-form"
      onSubmit={(e) => {
        e.preventDefault();
        if (Object.keys(errors).length === 0) save.mutate(draft);
      }}
    >
      {q.data?.isDefault && (
        <Callout intent="primary" data-testid="dp-default">
          This publication has no delivery profile of its own yet: the defaults below apply until an art director saves one.
        </Callout>
      )}
      <fieldset disabled={!canEdit}>
        <h3>Column widths</h3>
        {draft.columnWidthsMm.map((c, i) => (
          <div key={i} className="pf-row" data-testid="dp-column">
            <InputGroup aria-label={`column ${i + 1} name`} value={c.name} data-testid={`dp-column-name-${i}`} onChange={(e) => set({ columnWidthsMm: draft.columnWidthsMm.map((x, k) => (k === i ? { ...x, name: e.target.value } : x)) })} />
            <NumericInput aria-label={`column ${i + 1} width in mm`} value={c.widthMm} min={L.columnMmMin} max={L.columnMmMax} data-testid={`dp-column-mm-${i}`} onValueChange={(v) => set({ columnWidthsMm: draft.columnWidthsMm.map((x, k) => (k === i ? { ...x, widthMm: num(v) } : x)) })} rightElement={<span className="pf-unit">mm</span>} />
            <Button minimal icon="cross" aria-label="remove column" disabled={draft.columnWidthsMm.length <= 1} onClick={() => set({ columnWidthsMm: draft.columnWidthsMm.filter((_, k) => k !== i) })} />
          </div>
        ))}
        <Err errors={errors} field="columnWidthsMm.widthMm" />
        <Err errors={errors} field="columnWidthsMm.name" />
        <Button minimal icon="add" data-testid="dp-add-column" disabled={draft.columnWidthsMm.length >= L.columnsMax} onClick={() => set({ columnWidthsMm: [...draft.columnWidthsMm, { name: 'column', widthMm: 120 }] })}>
          Add a column width
        </Button>

        <h3>Artwork</h3>
        <FormGroup label="Artwork type" labelFor="dp-artwork">
          <HTMLSelect id="dp-artwork" data-testid="dp-artwork" value={draft.artworkType} onChange={(e) => {
            const t = ARTWORK_TYPES.find((a) => a.id === e.target.value)!;
            set({ artworkType: t.id, minDpi: t.minDpi });
          }}>
            {ARTWORK_TYPES.map((a) => (
              <option key={a.id} value={a.id}>{`${a.name} (usually ${a.minDpi} dpi)`}</option>
            ))}
          </HTMLSelect>
        </FormGroup>
        <FormGroup label="Minimum resolution (dpi)" labelFor="dp-min-dpi">
          <NumericInput id="dp-min-dpi" data-testid="dp-min-dpi" value={draft.minDpi} onValueChange={(v) => set({ minDpi: num(v) })} />
          <Err errors={errors} field="minDpi" />
        </FormGroup>
        <FormGroup label="Smallest text after scaling (pt), subscripts included" labelFor="dp-min-font">
          <NumericInput id="dp-min-font" data-testid="dp-min-font" stepSize={0.5} value={draft.minFontPt} onValueChange={(v) => set({ minFontPt: num(v) })} />
          <Err errors={errors} field="minFontPt" />
        </FormGroup>
        <FormGroup label="Thinnest line after scaling (pt)" labelFor="dp-min-line">
          <NumericInput id="dp-min-line" data-testid="dp-min-line" stepSize={0.05} minorStepSize={0.01} value={draft.minLineWeightPt} onValueChange={(v) => set({ minLineWeightPt: num(v) })} />
          <Err errors={errors} field="minLineWeightPt" />
        </FormGroup>

        <h3>Colour</h3>
        <RadioGroup label="Colour mode" selectedValue={draft.colourMode} onChange={(e) => set({ colourMode: e.currentTarget.value as DeliveryProfile['colourMode'] })}>
          <Radio value="cmyk" label="CMYK, separated to the press condition" data-testid="dp-colour-cmyk" />
          <Radio value="rgb" label="RGB (sRGB); the printer converts" data-testid="dp-colour-rgb" />
        </RadioGroup>
        <FormGroup label="Press condition" labelFor="dp-press">
          <HTMLSelect id="dp-press" data-testid="dp-press" value={draft.pressCondition} onChange={(e) => set({ pressCondition: e.target.value as DeliveryProfile['pressCondition'] })}>
            {PRESS_CONDITIONS.map((c) => (
              <option key={c.id} value={c.id}>{`${c.name} — ${c.region}, total ink ${c.tacPercent}%`}</option>
            ))}
          </HTMLSelect>
        </FormGroup>

        <h3>Formats (ticked in order of preference; export dialogs offer them first)</h3>
        <div className="pf-row">
          {RASTER_FORMATS.map((f) => (
            <Checkbox key={f} label={f.toUpperCase()} data-testid={`dp-raster-${f}`} checked={draft.rasterFormats.includes(f)} onChange={(e) => set({ rasterFormats: toggle(draft.rasterFormats, f, e.currentTarget.checked) })} />
          ))}
          {VECTOR_FORMATS.map((f) => (
            <Checkbox key={f} label={f.toUpperCase()} data-testid={`dp-vector-${f}`} checked={draft.vectorFormats.includes(f)} onChange={(e) => set({ vectorFormats: toggle(draft.vectorFormats, f, e.currentTarget.checked) })} />
          ))}
        </div>
        <Err errors={errors} field="rasterFormats" />
        <Err errors={errors} field="vectorFormats" />
        <FormGroup label="File-name template" labelFor="dp-template" helperText={`Words: ${FILE_NAME_TOKENS.map((t) => `{${t}}`).join(' ')}; the extension is added.`}>
          <InputGroup id="dp-template" data-testid="dp-template" value={draft.fileNameTemplate} onChange={(e) => set({ fileNameTemplate: e.target.value })} />
          <Err errors={errors} field="fileNameTemplate" />
        </FormGroup>

        <h3>Alt text</h3>
        <Switch label="Alt text required" data-testid="dp-alt-required" checked={draft.altText.required} onChange={(e) => set({ altText: { ...draft.altText, required: e.currentTarget.checked } })} />
        <FormGroup label="Longest alt text (characters)" labelFor="dp-alt-max">
          <NumericInput id="dp-alt-max" data-testid="dp-alt-max" value={draft.altText.maxLength} onValueChange={(v) => set({ altText: { ...draft.altText, maxLength: num(v) } })} />
          <Err errors={errors} field="altText.maxLength" />
        </FormGroup>
        <Switch label="A long description is required too" data-testid="dp-alt-long" checked={draft.altText.longDescriptionRequired} onChange={(e) => set({ altText: { ...draft.altText, longDescriptionRequired: e.currentTarget.checked } })} />
      </fieldset>
      {canEdit && (
        <Button type="submit" intent="primary" data-testid="dp-save" disabled={Object.keys(errors).length > 0} loading={save.isPending}>
          Save the delivery profile
        </Button>
      )}
      <CallFailed call={save} testId="dp-save-error" />
      {saved && !save.isPending && !save.isError && (
        <span className="pf-muted" data-testid="dp-saved">
          Saved.
        </span>
      )}
    </form>
  );
}

/** /publications/:publicationId/delivery-profile */
export function DeliveryProfilePage() {
  return (
    <PublicationPage
      title="Delivery profile"
      intro="What the production department accepts. Every export and bundle is preflighted against it; failures block approval unless an editor overrides them with a reason."
      testId="delivery-profile"
    >
      {(pub) => <DeliveryProfileForm publicationId={pub.id} />}
    </PublicationPage>
  );
}
