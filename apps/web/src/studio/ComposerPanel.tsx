// Composer fields: states by label / by n l m / superposition / hybrid preset, Z, surface rule, grid.
import { useMemo, useState } from 'react';
import { Button, ButtonGroup, Callout, FormGroup, HTMLSelect, InputGroup, Slider } from '@blueprintjs/core';
import { RECIPE_LIMITS } from '@psiform/contracts';
import { gridMemoryText } from '../figures/model';
import {
  checkRow,
  filterLabelGroups,
  HYBRID_MEMBERS,
  HYBRID_PRETTY,
  ionLabel,
  labelGroups,
  newRow,
  normalisation,
  normaliseRows,
  trimNumber,
  type ContentCheck,
  type ContentDraft,
  type ContentMode,
  type TermRow,
} from './content';

export interface SurfaceDraft {
  rule: 'enclosed' | 'psi';
  /** Enclosed probability in percent, as typed. */
  percent: string;
  /** |ψ| level in a0^−3/2, as typed. */
  psi: string;
}

export interface ComposerPanelProps {
  draft: ContentDraft;
  onDraft(d: ContentDraft): void;
  check: ContentCheck;
  surface: SurfaceDraft;
  onSurface(s: SurfaceDraft): void;
  surfaceError: string | null;
  grid: string;
  onGrid(g: string): void;
  gridError: string | null;
  complex: boolean;
  previewN: number;
}

const MODES: { mode: ContentMode; text: string }[] = [
  { mode: 'label', text: 'By label' },
  { mode: 'nlm', text: 'By n, l, m' },
  { mode: 'superposition', text: 'Superposition' },
  { mode: 'hybrid', text: 'Hybrid' },
];

const ION_PICKS = [1, 2, 3, 4, 5, 6, 7, 8];

function Msg({ id, text, help }: { id: string; text?: string; help?: string }) {
  if (text)
    return (
      <span data-testid={id} role="alert">
        {text}
      </span>
    );
  return help ? <>{help}</> : null;
}

const intent = (e?: string | null) => (e ? ('danger' as const) : ('none' as const));

function LabelPicker({ value, onPick }: { value: string; onPick(key: string): void }) {
  const [query, setQuery] = useState('');
  const groups = useMemo(() => filterLabelGroups(labelGroups(), query), [query]);
  return (
    <div className="pf-label-picker">
      <InputGroup
        leftIcon="search"
        placeholder="Find a label: 3d, xy, f, sp3…"
        value={query}
        onValueChange={setQuery}
        data-testid="cmp-label-search"
        aria-label="Find an orbital label"
      />
      <div className="pf-label-list" data-testid="cmp-label-list" role="listbox" aria-label="Orbital labels by shell">
        {groups.length === 0 && <p className="pf-muted">No label matches “{query}”.</p>}
        {groups.map((g) => (
          <div key={g.title} className="pf-label-group">
            <div className="pf-label-group-title">{g.title}</div>
            <div className="pf-label-items">
              {g.items.map((it) => (
                <button
                  type="button"
                  key={it.key}
                  role="option"
                  aria-selected={value === it.key}
                  className={`pf-label-item${value === it.key ? ' is-active' : ''}`}
                  onClick={() => onPick(it.key)}
                  data-testid="cmp-label-item"
                  data-key={it.key}
                >
                  {it.pretty}
                </button>
              ))}
            </div>
          </div>
        ))}
      </div>
    </div>
  );
}

function RowsEditor({ draft, onDraft, errors }: { draft: ContentDraft; onDraft(d: ContentDraft): void; errors: Record<string, string> }) {
  const rows = draft.rows;
  const setRow = (i: number, patch: Partial<TermRow>) => onDraft({ ...draft, rows: rows.map((r, k) => (k === i ? { ...r, ...patch } : r)) });
  const checks = rows.map(checkRow);
  const terms = checks.every((c) => c.term) ? checks.map((c) => c.term!) : null;
  const norm = terms && terms.length ? normalisation(terms) : null;
  return (
    <div className="pf-rows" data-testid="cmp-rows">
      <table className="pf-rows-table">
        <thead>
          <tr>
            <th>n</th>
            <th>l</th>
            <th>m</th>
            <th>form</th>
            <th>|c|</th>
            <th>phase (°)</th>
            <th />
          </tr>
        </thead>
        <tbody>
          {rows.map((r, i) => (
            <tr key={r.id} data-testid="cmp-row">
              {(['n', 'l', 'm'] as const).map((k) => (
                <td key={k}>
                  <InputGroup small value={r[k]} onValueChange={(v) => setRow(i, { [k]: v })} intent={intent(errors[`rows.${i}.${k}`])} data-testid={`cmp-row-${k}`} aria-label={`term ${i + 1} ${k}`} />
                </td>
              ))}
              <td>
                <HTMLSelect
                  value={r.basis}
                  onChange={(e) => setRow(i, { basis: e.currentTarget.value as TermRow['basis'] })}
                  options={[
                    { value: 'real', label: 'real' },
                    { value: 'complex', label: 'complex' },
                  ]}
                  data-testid="cmp-row-basis"
                  aria-label={`term ${i + 1} form`}
                />
              </td>
              <td>
                <InputGroup small value={r.mag} onValueChange={(v) => setRow(i, { mag: v })} intent={intent(errors[`rows.${i}.mag`])} data-testid="cmp-row-mag" aria-label={`term ${i + 1} magnitude`} />
              </td>
              <td>
                <InputGroup small value={r.phase} onValueChange={(v) => setRow(i, { phase: v })} intent={intent(errors[`rows.${i}.phase`])} data-testid="cmp-row-phase" aria-label={`term ${i + 1} phase in degrees`} />
              </td>
              <td>
                <Button small minimal icon="cross" aria-label={`remove term ${i + 1}`} onClick={() => onDraft({ ...draft, rows: rows.filter((_, k) => k !== i) })} data-testid="cmp-row-remove" />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {rows.map((_, i) =>
        (['n', 'l', 'm', 'mag', 'phase'] as const).map((k) =>
          errors[`rows.${i}.${k}`] ? (
            <p key={`${i}-${k}`} className="pf-error-line" data-testid={`cmp-row-error`} role="alert">
              Term {i + 1}: {errors[`rows.${i}.${k}`]}
            </p>
          ) : null,
        ),
      )}
      {errors.rows && (
        <p className="pf-error-line" data-testid="cmp-rows-error" role="alert">
          {errors.rows}
        </p>
      )}
      <div className="pf-row-actions">
        <Button small icon="plus" text="Add a term" disabled={rows.length >= RECIPE_LIMITS.termsMax} onClick={() => onDraft({ ...draft, rows: [...rows, newRow()] })} data-testid="cmp-add-row" />
        <Button small icon="percentage" text="Normalise" disabled={!norm || norm.sumSquares === 0} onClick={() => onDraft({ ...draft, rows: normaliseRows(rows) })} data-testid="cmp-normalise" />
      </div>
      {norm && (
        <div className="pf-norm" data-testid="cmp-normalisation">
          <p>
            <span data-testid="cmp-sumsq">Σ|c|² = {trimNumber(norm.sumSquares, 4)}</span>
            {Math.abs(norm.sumSquares - 1) < 1e-6 ? ' (normalised)' : ' — the engine divides by √Σ|c|²; normalised coefficients:'}
          </p>
          <ol className="pf-norm-list">
            {norm.normalised.map((c, i) => (
              <li key={i} data-testid="cmp-norm-coef">
                {trimNumber(c.mag, 4)} · e^(i·{trimNumber(c.phaseDeg, 2)}°) = {trimNumber(c.re, 4)} {c.im < 0 ? '−' : '+'} {trimNumber(Math.abs(c.im), 4)}i
              </li>
            ))}
          </ol>
          <p className="pf-muted pf-small">Σ|c|² is taken over orthonormal functions: real and complex forms of the same n, l are combined first.</p>
        </div>
      )}
    </div>
  );
}

export function ComposerPanel(p: ComposerPanelProps) {
  const { draft, onDraft, check } = p;
  const e = check.errors;
  const Z = Number(draft.Z);
  const ion = e.Z ? '' : ionLabel(Z);
  const percent = Number(p.surface.percent);
  return (
    <div className="pf-composer" data-testid="composer-panel">
      <h3>State</h3>
      <ButtonGroup className="pf-gap-sm" aria-label="How to choose the state">
        {MODES.map((m) => (
          <Button key={m.mode} text={m.text} active={draft.mode === m.mode} onClick={() => onDraft({ ...draft, mode: m.mode })} data-testid={`cmp-mode-${m.mode}`} aria-pressed={draft.mode === m.mode} />
        ))}
      </ButtonGroup>

      {draft.mode === 'label' && (
        <>
          <FormGroup label="Orbital label" labelFor="cmp-label" intent={intent(e.label)} helperText={<Msg id="cmp-label-error" text={e.label} help="Real forms 1s … 7f, e.g. 2pz, 3dxy, 3dz2, 4fxyz; complex 2p+1; hybrids sp3#2." />}>
            <InputGroup id="cmp-label" value={draft.label} onValueChange={(v) => onDraft({ ...draft, label: v })} spellCheck={false} data-testid="cmp-label" />
          </FormGroup>
          <LabelPicker value={draft.label} onPick={(key) => onDraft({ ...draft, label: key })} />
        </>
      )}

      {draft.mode === 'nlm' && (
        <div className="pf-qn">
          {(['n', 'l', 'm'] as const).map((k) => (
            <FormGroup key={k} label={k} labelFor={`cmp-${k}`} intent={intent(e[k])} helperText={<Msg id={`cmp-${k}-error`} text={e[k]} />}>
              <InputGroup id={`cmp-${k}`} value={draft[k]} onValueChange={(v) => onDraft({ ...draft, [k]: v })} data-testid={`cmp-${k}`} />
            </FormGroup>
          ))}
          <FormGroup label="Angular form" labelFor="cmp-basis">
            <HTMLSelect
              id="cmp-basis"
              value={draft.basis}
              onChange={(ev) => onDraft({ ...draft, basis: ev.currentTarget.value as ContentDraft['basis'] })}
              options={[
                { value: 'real', label: 'Real (m > 0 cos-type, m < 0 sin-type)' },
                { value: 'complex', label: 'Complex Y_lm' },
              ]}
              data-testid="cmp-basis"
            />
          </FormGroup>
        </div>
      )}

      {draft.mode === 'superposition' && <RowsEditor draft={draft} onDraft={onDraft} errors={e} />}

      {draft.mode === 'hybrid' && (
        <div className="pf-form-row">
          <FormGroup label="Hybrid set" labelFor="cmp-hybrid-set">
            <HTMLSelect
              id="cmp-hybrid-set"
              value={draft.hybrid.set}
              onChange={(ev) => onDraft({ ...draft, hybrid: { set: ev.currentTarget.value, member: 1 } })}
              options={Object.keys(HYBRID_MEMBERS).map((s) => ({ value: s, label: HYBRID_PRETTY[s] }))}
              data-testid="cmp-hybrid-set"
            />
          </FormGroup>
          <FormGroup label="Member" labelFor="cmp-hybrid-member" intent={intent(e.hybrid)} helperText={<Msg id="cmp-hybrid-error" text={e.hybrid} help="Each member points its large lobe a different way." />}>
            <HTMLSelect
              id="cmp-hybrid-member"
              value={String(draft.hybrid.member)}
              onChange={(ev) => onDraft({ ...draft, hybrid: { ...draft.hybrid, member: Number(ev.currentTarget.value) } })}
              options={Array.from({ length: HYBRID_MEMBERS[draft.hybrid.set] ?? 1 }, (_, i) => ({ value: String(i + 1), label: `#${i + 1}` }))}
              data-testid="cmp-hybrid-member"
            />
          </FormGroup>
        </div>
      )}

      <div className="pf-form-row">
        <FormGroup
          label="Nuclear charge Z"
          labelFor="cmp-z"
          intent={intent(e.Z)}
          helperText={<Msg id="cmp-z-error" text={e.Z} help={ion ? `One-electron ion: ${ion}` : undefined} />}
        >
          <InputGroup id="cmp-z" value={draft.Z} onValueChange={(v) => onDraft({ ...draft, Z: v })} data-testid="cmp-z" rightElement={ion ? <span className="pf-ion" data-testid="cmp-ion">{ion}</span> : undefined} />
        </FormGroup>
        <FormGroup label="Common ions" labelFor="cmp-z-pick">
          <HTMLSelect
            id="cmp-z-pick"
            value={ION_PICKS.includes(Z) ? String(Z) : ''}
            onChange={(ev) => ev.currentTarget.value && onDraft({ ...draft, Z: ev.currentTarget.value })}
            options={[{ value: '', label: 'Choose…' }, ...ION_PICKS.map((z) => ({ value: String(z), label: `${ionLabel(z)} (Z = ${z})` }))]}
            data-testid="cmp-z-pick"
          />
        </FormGroup>
      </div>

      <h3>Surface</h3>
      <ButtonGroup className="pf-gap-sm" aria-label="Surface rule">
        <Button text="Enclosed probability" active={p.surface.rule === 'enclosed'} onClick={() => p.onSurface({ ...p.surface, rule: 'enclosed' })} data-testid="cmp-rule-enclosed" />
        <Button text="|ψ| value" active={p.surface.rule === 'psi'} onClick={() => p.onSurface({ ...p.surface, rule: 'psi' })} data-testid="cmp-rule-psi" />
      </ButtonGroup>
      {p.surface.rule === 'enclosed' ? (
        <div className="pf-fraction">
          <Slider
            min={50}
            max={99}
            stepSize={0.5}
            labelStepSize={10}
            labelRenderer={(v) => `${v}%`}
            value={Number.isFinite(percent) ? Math.min(99, Math.max(50, percent)) : 90}
            onChange={(v) => p.onSurface({ ...p.surface, percent: String(v) })}
            data-testid="cmp-fraction-slider"
          />
          <FormGroup label="Enclosed probability (%)" labelFor="cmp-fraction" intent={intent(p.surfaceError)} helperText={<Msg id="cmp-surface-error" text={p.surfaceError ?? undefined} help="Share of the probability inside the surfaces (0 to 100, both excluded)." />}>
            <InputGroup id="cmp-fraction" value={p.surface.percent} onValueChange={(v) => p.onSurface({ ...p.surface, percent: v })} data-testid="cmp-fraction" rightElement={<span className="pf-ion">%</span>} />
          </FormGroup>
        </div>
      ) : (
        <FormGroup label="|ψ| at the surface (a0^−3/2)" labelFor="cmp-psi" intent={intent(p.surfaceError)} helperText={<Msg id="cmp-surface-error" text={p.surfaceError ?? undefined} help="The surfaces are ψ = ±value (|ψ| = value for complex states)." />}>
          <InputGroup id="cmp-psi" value={p.surface.psi} onValueChange={(v) => p.onSurface({ ...p.surface, psi: v })} data-testid="cmp-psi" />
        </FormGroup>
      )}

      <h3>Grid</h3>
      <FormGroup
        label="Grid N (points per side)"
        labelFor="cmp-grid"
        intent={intent(p.gridError)}
        helperText={
          p.gridError ? (
            <Msg id="cmp-grid-error" text={p.gridError} />
          ) : (
            <span data-testid="cmp-memory">
              {gridMemoryText(Number(p.grid), p.complex)}. The live preview samples {p.previewN}³.
            </span>
          )
        }
      >
        <InputGroup id="cmp-grid" value={p.grid} onValueChange={p.onGrid} data-testid="cmp-grid" />
      </FormGroup>
      {Object.keys(e).length > 0 && (
        <Callout intent="warning" className="pf-gap-sm" data-testid="cmp-invalid">
          Fix the fields marked in red to preview and save.
        </Callout>
      )}
    </div>
  );
}
