import { Callout, HTMLTable, Tag } from '@blueprintjs/core';
import {
  PHASE_DELTA_E_ERROR,
  PHASE_DELTA_E_WARN,
  WCAG_AA_GRAPHICS,
  WCAG_AA_TEXT,
  type SwatchbookCheck,
} from '@psiform/colour';

function Verdict({ ok, warn, testId }: { ok: boolean; warn?: boolean; testId: string }) {
  return (
    <Tag minimal intent={ok ? 'success' : warn ? 'warning' : 'danger'} data-testid={testId}>
      {ok ? 'passes' : warn ? 'low' : 'too low'}
    </Tag>
  );
}

type CheckGroup = 'phases' | 'contrast' | 'print' | 'wheel';
type Warning = SwatchbookCheck['warnings'][number];

/** Which check raised a warning: each warning is shown under the heading of its check (every code has one). */
export const WARNING_GROUP: Record<Warning['code'], CheckGroup> = {
  phases_too_similar: 'phases',
  label_contrast_low: 'contrast',
  phase_background_contrast_low: 'contrast',
  out_of_print_gamut: 'print',
  wheel_clamped: 'wheel',
};

export function groupWarnings(warnings: Warning[]): Record<CheckGroup, Warning[]> {
  const out: Record<CheckGroup, Warning[]> = { phases: [], contrast: [], print: [], wheel: [] };
  for (const w of warnings) out[WARNING_GROUP[w.code]].push(w);
  return out;
}

function Warnings({ list, group }: { list: Warning[]; group: CheckGroup }) {
  if (list.length === 0) return null;
  return (
    <ul className="pf-warnings" data-testid={`check-warnings-${group}`}>
      {list.map((w, i) => (
        <li key={`${w.code}-${i}`}>
          <Callout intent={w.level === 'error' ? 'danger' : 'warning'} compact data-testid="check-warning" data-code={w.code} data-level={w.level} data-group={group}>
            {w.level === 'error' && <strong>Blocks pinning and batch re-renders: </strong>}
            {w.message.charAt(0).toUpperCase() + w.message.slice(1)}.
          </Callout>
        </li>
      ))}
    </ul>
  );
}

const de = (v: number) => v.toFixed(1);
const ratio = (v: number) => `${v.toFixed(2)}:1`;

/** The live checks of @psiform/colour's checkSwatchbook, as numbers with their thresholds. */
export function ColourChecks({ check }: { check: SwatchbookCheck }) {
  const f = check.figures;
  const phaseRows: [string, string, number][] = [
    ['normal', 'Normal colour vision', f.phaseDeltaE2000],
    ['protanopia', 'Simulated protanopia', f.phaseDeltaE2000Protan],
    ['deuteranopia', 'Simulated deuteranopia', f.phaseDeltaE2000Deutan],
    ['tritanopia', 'Simulated tritanopia', f.phaseDeltaE2000Tritan],
  ];
  const contrastRows: [string, string, number | undefined, number][] = [
    ['label', 'Label on background (text)', f.labelContrast, WCAG_AA_TEXT],
    ['positive', 'Positive phase on background', f.positiveBackgroundContrast, WCAG_AA_GRAPHICS],
    ['negative', 'Negative phase on background', f.negativeBackgroundContrast, WCAG_AA_GRAPHICS],
    ['nucleus', 'Nucleus on background', f.nucleusBackgroundContrast, WCAG_AA_GRAPHICS],
    ['axes', 'Axes on background', f.axesBackgroundContrast, WCAG_AA_GRAPHICS],
  ];

  const groups = groupWarnings(check.warnings);
  return (
    <div className="pf-checks" data-testid="colour-checks">
      <h3>Phases told apart (CIEDE2000)</h3>
      <p className="pf-muted pf-small">
        ΔE00 between the positive and negative phase; Psiform asks for at least {PHASE_DELTA_E_WARN} (below {PHASE_DELTA_E_ERROR} is an error). Deficiencies
        simulated after Machado, Oliveira &amp; Fernandes (2009), full severity.
      </p>
      <HTMLTable compact className="pf-table pf-num-table">
        <tbody>
          {phaseRows.map(([key, label, v]) => (
            <tr key={key}>
              <td>{label}</td>
              <td data-testid={`check-de-${key}`}>{de(v)}</td>
              <td>
                <Verdict ok={v >= PHASE_DELTA_E_WARN} warn={v >= PHASE_DELTA_E_ERROR} testId={`check-de-${key}-verdict`} />
              </td>
            </tr>
          ))}
        </tbody>
      </HTMLTable>
      <Warnings list={groups.phases} group="phases" />

      <h3>Contrast (WCAG 2.1)</h3>
      <p className="pf-muted pf-small">
        Text needs {WCAG_AA_TEXT}:1 (success criterion 1.4.3, AA); lobes, nucleus and axes {WCAG_AA_GRAPHICS}:1 (1.4.11).
      </p>
      <HTMLTable compact className="pf-table pf-num-table">
        <tbody>
          {contrastRows
            .filter(([, , v]) => v !== undefined)
            .map(([key, label, v, need]) => (
              <tr key={key}>
                <td>{label}</td>
                <td data-testid={`check-contrast-${key}`}>{ratio(v!)}</td>
                <td>
                  <Verdict ok={v! >= need} warn={key === 'label' && v! >= WCAG_AA_GRAPHICS} testId={`check-contrast-${key}-verdict`} />
                </td>
              </tr>
            ))}
        </tbody>
      </HTMLTable>
      <Warnings list={groups.contrast} group="contrast" />

      <h3>Print</h3>
      <p className="pf-muted pf-small" data-testid="check-gamut">
        {f.print === null
          ? 'CMYK values and gamut come from the press condition\'s ICC profile (On press, below).'
          : f.outOfPrintGamut.length === 0
            ? `Every swatch prints in gamut on ${f.print.condition.name}.`
            : `Out of gamut on ${f.print.condition.name}: ${f.outOfPrintGamut.join(', ')}.`}
      </p>

      <Warnings list={groups.print} group="print" />
      {groups.wheel.length > 0 && (
        <>
          <h3>Complex-phase wheel</h3>
          <Warnings list={groups.wheel} group="wheel" />
        </>
      )}

      {check.warnings.length === 0 && (
        <Callout intent="success" compact data-testid="check-all-clear">
          No warnings: the phases are distinct for every simulated vision and the label reads on the background.
        </Callout>
      )}
    </div>
  );
}
