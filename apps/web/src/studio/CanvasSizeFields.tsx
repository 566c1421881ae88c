import { useState, type ReactNode } from 'react';
import { Button, ButtonGroup, Checkbox, FormGroup, HTMLSelect, InputGroup } from '@blueprintjs/core';
import { DEFAULT_DELIVERY_PROFILE, type DeliveryProfile } from '@psiform/contracts';
import { DPI_CHOICES } from '@psiform/print';
import { fromMm, lengthError, pixelText, toMm, type LengthUnit } from './exportSize';

/** The print canvas being chosen: width and height as typed (mm or inches), dpi, transparency, and what follows from them. */
export function useCanvasSize(init: { widthMm: number; heightMm: number; dpi: number; transparent: boolean }) {
  const [unit, setUnit] = useState<LengthUnit>('mm');
  const [w, setW] = useState(fromMm(init.widthMm, 'mm'));
  const [h, setH] = useState(fromMm(init.heightMm, 'mm'));
  const [dpi, setDpi] = useState<number>(init.dpi);
  const [transparent, setTransparent] = useState(init.transparent);
  const wErr = lengthError(w, unit, 'width');
  const hErr = lengthError(h, unit, 'height');
  const widthMm = wErr ? null : toMm(Number(w.replace(',', '.')), unit);
  const heightMm = hErr ? null : toMm(Number(h.replace(',', '.')), unit);
  const px = widthMm !== null && heightMm !== null ? pixelText(widthMm, heightMm, dpi) : null;

  function switchUnit(u: LengthUnit) {
    if (u === unit) return;
    if (widthMm !== null) setW(fromMm(widthMm, u));
    if (heightMm !== null) setH(fromMm(heightMm, u));
    setUnit(u);
  }
  return { unit, w, h, setW, setH, dpi, setDpi, transparent, setTransparent, wErr, hErr, widthMm, heightMm, px, switchUnit };
}

export type CanvasSize = ReturnType<typeof useCanvasSize>;

/** A column width offered as a preset: the publication's delivery profile's, or the common-practice ones. */
export interface ColumnChoice {
  /** Test-id part: the name as a slug ("one and a half" -> one-and-a-half). */
  key: string;
  label: string;
  widthMm: number;
}

const slug = (s: string) => s.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '');

/** The delivery profile's column widths as presets (its own names and widths); the default profile's without one. */
export function columnChoices(profile: Pick<DeliveryProfile, 'columnWidthsMm'> = DEFAULT_DELIVERY_PROFILE): ColumnChoice[] {
  return profile.columnWidthsMm.map((c) => ({ key: slug(c.name), label: `${c.name} ${c.widthMm} mm`, widthMm: c.widthMm }));
}

/**
 * Unit switch, column presets, width, height, dpi and transparency; ids and test ids start with `idPrefix`.
 * `minDpi` (the delivery profile's) marks the resolutions below it.
 */
export function CanvasSizeFields({
  size,
  idPrefix: p,
  presets,
  onPreset,
  note,
  minDpi,
}: {
  size: CanvasSize;
  idPrefix: string;
  presets: ColumnChoice[];
  onPreset(preset: ColumnChoice): void;
  note?: ReactNode;
  minDpi?: number;
}) {
  const { unit, w, h, setW, setH, dpi, setDpi, transparent, setTransparent, wErr, hErr, switchUnit } = size;
  return (
    <>
      <div className="pf-head-row">
        <ButtonGroup aria-label="Length unit">
          <Button text="mm" active={unit === 'mm'} onClick={() => switchUnit('mm')} data-testid={`${p}-unit-mm`} />
          <Button text="inches" active={unit === 'in'} onClick={() => switchUnit('in')} data-testid={`${p}-unit-in`} />
        </ButtonGroup>
        <ButtonGroup aria-label="Column width presets">
          {presets.map((c) => (
            <Button key={c.key} small text={c.label} onClick={() => onPreset(c)} data-testid={`${p}-preset-${c.key}`} />
          ))}
        </ButtonGroup>
      </div>
      {note}
      <div className="pf-form-row">
        <FormGroup label={`Width (${unit})`} labelFor={`${p}-width`} intent={wErr ? 'danger' : 'none'} helperText={wErr && <span data-testid={`${p}-width-error`}>{wErr}</span>}>
          <InputGroup id={`${p}-width`} value={w} onValueChange={setW} data-testid={`${p}-width`} />
        </FormGroup>
        <FormGroup label={`Height (${unit})`} labelFor={`${p}-height`} intent={hErr ? 'danger' : 'none'} helperText={hErr && <span data-testid={`${p}-height-error`}>{hErr}</span>}>
          <InputGroup id={`${p}-height`} value={h} onValueChange={setH} data-testid={`${p}-height`} />
        </FormGroup>
        <FormGroup label="Resolution" labelFor={`${p}-dpi`}>
          <HTMLSelect id={`${p}-dpi`} value={String(dpi)} onChange={(e) => setDpi(Number(e.currentTarget.value))} options={DPI_CHOICES.map((d) => ({ value: String(d), label: minDpi && d < minDpi ? `${d} dpi (below the profile's ${minDpi})` : `${d} dpi` }))} data-testid={`${p}-dpi`} />
        </FormGroup>
      </div>
      <Checkbox label="Transparent background" checked={transparent} onChange={(e) => setTransparent(e.currentTarget.checked)} data-testid={`${p}-transparent`} />
    </>
  );
}
