// What the preview cannot show truthfully, said in the Studio next to the figure, with the fix offered:
// a box that cuts the surface → widen the box to the engine's suggested half-width (or let it choose);
// a forced grid too coarse for a detail → let the engine choose the grid. The words are the engine's own
// (@psiform/meshing recipeToSurfaces warnings), so the Studio says exactly what the CLI, job and sheet say.
import { Button, Callout } from '@blueprintjs/core';
import type { SurfaceWarning } from '@psiform/meshing';

export interface SurfaceWarningsProps {
  warnings: readonly SurfaceWarning[];
  /** Current half-width of the box in a0, or 'auto'. */
  extent: number | 'auto';
  onExtent: (extent: number | 'auto') => void;
  gridAuto: boolean;
  onGridAuto: () => void;
}

/** Half-width shown to people: 3 significant digits, rounded up so the widened box really holds the surface. */
export function widenedExtent(suggested: number): number {
  const p = 10 ** (Math.floor(Math.log10(suggested)) - 2);
  return Math.ceil(suggested / p - 1e-9) * p;
}

export function SurfaceWarnings({ warnings, extent, onExtent, gridAuto, onGridAuto }: SurfaceWarningsProps) {
  if (warnings.length === 0) return null;
  const box = warnings.find((w) => w.code === 'box-cuts-surface' && typeof w.suggestedExtent === 'number');
  const coarse = warnings.some((w) => w.code === 'feature-unresolved');
  const wider = box?.suggestedExtent !== undefined ? Number(widenedExtent(box.suggestedExtent).toPrecision(3)) : null;
  return (
    <Callout intent="warning" title="What this figure cannot show truthfully" className="pf-gap" data-testid="studio-warnings">
      <ul>
        {warnings.map((w, i) => (
          <li key={`${w.code}-${i}`} data-testid="studio-warning" data-code={w.code}>
            {w.message}
          </li>
        ))}
      </ul>
      {wider !== null && (
        <p>
          <Button icon="zoom-out" text={`Widen the box to ±${wider} a0`} onClick={() => onExtent(wider)} data-testid="studio-widen-box" />{' '}
          {extent !== 'auto' && <Button minimal text="Let the engine choose the box" onClick={() => onExtent('auto')} data-testid="studio-box-auto" />}
        </p>
      )}
      {coarse && !gridAuto && (
        <p>
          <Button icon="grid" text="Let the engine choose the grid" onClick={onGridAuto} data-testid="studio-grid-auto" />
        </p>
      )}
    </Callout>
  );
}
