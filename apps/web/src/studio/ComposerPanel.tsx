// Composer fields: the state by label / by n l m / superposition / hybrid preset, Z, surface rule, grid.
// Every field reads and writes the one draft (./draft.ts); the views never rewrite the state on their own.
import { useMemo, useState, type Dispatch } from 'react';
import { Button, ButtonGroup, Callout, FormGroup, HTMLSelect, InputGroup, Slider } from '@blueprintjs/core';
import { PSI_UNIT_TEXT } from '@psiform/print';
import { RECIPE_LIMITS } from '@psiform/contracts';
import { Typeset } from '../components/Typeset';
import { gridMemoryText } from '../figures/model';
import { filterLabelGroups, HYBRID_MEMBERS, HYBRID_PRETTY, ionLabel, labelGroups, normalisation, trimNumber } from './content';
import { fieldText, namedState, singleUnitTerm, viewShowsState, type ComposerDraft, type ContentMode, type DraftAction } from './draft';
import { TableHead } from '../components/TableHead';

export interface ComposerPanelProps {
  draft: ComposerDraft;
  dispatch: Dispatch<DraftAction>;
  errors: Record<string, string>;
  complex: boolean;
  previewN: number;
  /** Largest |ψ| on the preview grid (a0^-3/2), once sampled: the |ψ| rule's upper limit. */
  maxAbsPsi: number | null;
  /** The preview's current isovalue and enclosed fraction, so switching the rule keeps the same surface. */
  isovalue: number | null;
  enclosed: number | null;
}

const MODES: { mode: ContentMode; text: string }[] = [
  { mode: 'label', text: 'By label' },
  { mode: 'nlm', text: 'By n, l, m' },
  { mode: 'superposition', text: 'Superposition' },
  { mode: 'hybrid', text: 'Hybrid' },
];

const REPLACE_WORDS: Record<Exclude<ContentMode, 'superposition'>, string> = {
  label: 'Replace with a named orbital…',
  nlm: 'Replace with one n, l, m state…',
  hybrid: 'Replace with a hybrid…',
};

const ION_PICKS = [1, 2, 3, 4, 5, 6, 7, 8];

function Msg({ id, text, help }: { id: string; text?: string | null; help?: React.ReactNode }) {
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
      <InputGroup leftIcon="search" placeholder="Find a label: 3d, xy, f, sp3…" value={query} onValueChange={setQuery} data-testid="cmp-label-search" aria-label="Find an orbital label" />
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
                  <Typeset text={it.pretty} />
                </button>
              ))}
            </div>
          </div>
        ))}
      </div>
    </div>
  );
}

/** The current terms, read-only, for a view that cannot show them exactly. */
function CurrentTerms({ draft, mode, dispatch }: { draft: ComposerDraft; mode: Exclude<ContentMode, 'superposition'>; dispatch: Dispatch<DraftAction> }) {
  const terms = draft.recipe.content.terms;
  return (
    <Callout intent="primary" className="pf-gap-sm" data-testid="cmp-current-state">
      <p>
        This view cannot show the current state exactly, so it is left as it is:{' '}
        <strong data-testid="cmp-current-label">
          <Typeset text={draft.recipe.label ?? ''} />
        </strong>{' '}
        ({terms.length} term{terms.length === 1 ? '' : 's'}). Switching views never changes ψ; the Superposition view shows every coefficient.
      </p>
      <Button icon="exchange" text={REPLACE_WORDS[mode]} onClick={() => dispatch({ type: 'replacing', open: true })} data-testid="cmp-replace" />
    </Callout>
  );
}

function RowsEditor({ draft, dispatch, errors }: { draft: ComposerDraft; dispatch: Dispatch<DraftAction>; errors: Record<string, string> }) {
  const terms = draft.recipe.content.terms;
  const norm = terms.length ? normalisation(terms.map((t) => ({ ...t, im: t.im ?? 0 }))) : null;
  const set = (key: string, value: string) => dispatch({ type: 'text', key, value });
  return (
    <div className="pf-rows" data-testid="cmp-rows">
      <table className="pf-rows-table">
        <TableHead columns={['n', 'l', 'm', 'form', '|c|', 'phase (°)', '']} />
        <tbody>
          {draft.rowIds.map((id, i) => (
            <tr key={id} data-testid="cmp-row">
              {(['n', 'l', 'm'] as const).map((k) => (
                <td key={k}>
                  <InputGroup small value={fieldText(draft, `row.${id}.${k}`)} onValueChange={(v) => set(`row.${id}.${k}`, v)} intent={intent(errors[`row.${id}.${k}`])} data-testid={`cmp-row-${k}`} aria-label={`term ${i + 1} ${k}`} />
                </td>
              ))}
              <td>
                <HTMLSelect
                  value={terms[i]?.basis ?? 'real'}
                  onChange={(e) => dispatch({ type: 'row-basis', id, basis: e.currentTarget.value as 'real' | 'complex' })}
                  options={[
                    { value: 'real', label: 'real' },
                    { value: 'complex', label: 'complex' },
                  ]}
                  data-testid="cmp-row-basis"
                  aria-label={`term ${i + 1} form`}
                />
              </td>
              <td>
                <InputGroup small value={fieldText(draft, `row.${id}.mag`)} onValueChange={(v) => set(`row.${id}.mag`, v)} intent={intent(errors[`row.${id}.mag`])} data-testid="cmp-row-mag" aria-label={`term ${i + 1} magnitude`} />
              </td>
              <td>
                <InputGroup small value={fieldText(draft, `row.${id}.phase`)} onValueChange={(v) => set(`row.${id}.phase`, v)} intent={intent(errors[`row.${id}.phase`])} data-testid="cmp-row-phase" aria-label={`term ${i + 1} phase in degrees`} />
              </td>
              <td>
                <Button small minimal icon="cross" aria-label={`remove term ${i + 1}`} onClick={() => dispatch({ type: 'remove-row', id })} data-testid="cmp-row-remove" />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {draft.rowIds.map((id, i) =>
        (['n', 'l', 'm', 'mag', 'phase'] as const).map((k) =>
          errors[`row.${id}.${k}`] ? (
            <p key={`${id}-${k}`} className="pf-error-line" data-testid="cmp-row-error" role="alert">
              Term {i + 1}: {errors[`row.${id}.${k}`]}
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
        <Button small icon="plus" text="Add a term (|c| = 0)" disabled={terms.length >= RECIPE_LIMITS.termsMax} onClick={() => dispatch({ type: 'add-row' })} data-testid="cmp-add-row" />
        <Button small icon="percentage" text="Normalise" disabled={!norm || norm.sumSquares === 0} onClick={() => dispatch({ type: 'normalise' })} data-testid="cmp-normalise" />
      </div>
      {terms.length >= RECIPE_LIMITS.termsMax && <p className="pf-muted pf-small">At most {RECIPE_LIMITS.termsMax} terms.</p>}
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
  const { draft, dispatch, errors: e } = p;
  const recipe = draft.recipe;
  const terms = recipe.content.terms;
  const mode = draft.mode;
  const shows = viewShowsState(mode, terms);
  const editable = shows || draft.replacing;
  const named = namedState(terms);
  const unit = singleUnitTerm(terms);
  const Z = recipe.content.Z;
  const ion = e.Z ? '' : ionLabel(Z);
  const surface = recipe.surface;
  const percentText = fieldText(draft, 'percent');
  const percent = Number(percentText);
  const set = (key: string, value: string) => dispatch({ type: 'text', key, value });
  const hybrid = named?.kind === 'hybrid' ? /^(sp3d2|sp3d|sp3|sp2|sp)#(\d+)$/.exec(named.key) : null;

  return (
    <div className="pf-composer" data-testid="composer-panel">
      <h3>State</h3>
      <ButtonGroup className="pf-gap-sm" aria-label="How to choose the state">
        {MODES.map((m) => (
          <Button key={m.mode} text={m.text} active={mode === m.mode} onClick={() => dispatch({ type: 'mode', mode: m.mode })} data-testid={`cmp-mode-${m.mode}`} aria-pressed={mode === m.mode} />
        ))}
      </ButtonGroup>

      {mode !== 'superposition' && !shows && !draft.replacing && <CurrentTerms draft={draft} mode={mode} dispatch={dispatch} />}

      {mode === 'label' && editable && (
        <>
          <FormGroup
            label="Orbital label"
            labelFor="cmp-label"
            intent={intent(e.label)}
            helperText={<Msg id="cmp-label-error" text={e.label} help="Real forms 1s … 7f, e.g. 2pz, 3dxy, 3dz2, 4fxyz; complex 2p+1; hybrids sp3#2." />}
          >
            <InputGroup id="cmp-label" value={fieldText(draft, 'label')} onValueChange={(v) => set('label', v)} spellCheck={false} data-testid="cmp-label" />
          </FormGroup>
          <LabelPicker value={named?.key ?? ''} onPick={(key) => set('label', key)} />
        </>
      )}

      {mode === 'nlm' && editable && (
        <div className="pf-qn">
          {draft.replacing && !unit ? (
            <Button
              icon="tick"
              text="Start from 2p (n = 2, l = 1, m = 0)"
              onClick={() => dispatch({ type: 'replace', terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1, im: 0 }], label: '' })}
              data-testid="cmp-replace-nlm"
            />
          ) : (
            <>
              {(['n', 'l', 'm'] as const).map((k) => (
                <FormGroup key={k} label={k} labelFor={`cmp-${k}`} intent={intent(e[k])} helperText={<Msg id={`cmp-${k}-error`} text={e[k]} />}>
                  <InputGroup id={`cmp-${k}`} value={fieldText(draft, k)} onValueChange={(v) => set(k, v)} data-testid={`cmp-${k}`} />
                </FormGroup>
              ))}
              <FormGroup label="Angular form" labelFor="cmp-basis">
                <HTMLSelect
                  id="cmp-basis"
                  value={unit?.basis ?? 'real'}
                  onChange={(ev) => dispatch({ type: 'basis', basis: ev.currentTarget.value as 'real' | 'complex' })}
                  options={[
                    { value: 'real', label: 'Real (m > 0 cos-type, m < 0 sin-type)' },
                    { value: 'complex', label: 'Complex Y_lm' },
                  ]}
                  data-testid="cmp-basis"
                />
              </FormGroup>
            </>
          )}
        </div>
      )}

      {mode === 'superposition' && <RowsEditor draft={draft} dispatch={dispatch} errors={e} />}

      {mode === 'hybrid' && editable && (
        <div className="pf-form-row">
          <FormGroup label="Hybrid set" labelFor="cmp-hybrid-set">
            <HTMLSelect
              id="cmp-hybrid-set"
              value={hybrid?.[1] ?? ''}
              onChange={(ev) => ev.currentTarget.value && dispatch({ type: 'hybrid', set: ev.currentTarget.value, member: 1 })}
              options={[...(hybrid ? [] : [{ value: '', label: 'Choose…' }]), ...Object.keys(HYBRID_MEMBERS).map((s) => ({ value: s, label: HYBRID_PRETTY[s] }))]}
              data-testid="cmp-hybrid-set"
            />
          </FormGroup>
          {hybrid && (
            <FormGroup label="Member" labelFor="cmp-hybrid-member" helperText="Each member points its large lobe a different way.">
              <HTMLSelect
                id="cmp-hybrid-member"
                value={hybrid[2]}
                onChange={(ev) => dispatch({ type: 'hybrid', set: hybrid[1], member: Number(ev.currentTarget.value) })}
                options={Array.from({ length: HYBRID_MEMBERS[hybrid[1]] ?? 1 }, (_, i) => ({ value: String(i + 1), label: `#${i + 1}` }))}
                data-testid="cmp-hybrid-member"
              />
            </FormGroup>
          )}
        </div>
      )}

      {draft.replacing && !shows && (
        <Button minimal small text="Keep the current state" onClick={() => dispatch({ type: 'replacing', open: false })} data-testid="cmp-replace-cancel" />
      )}

      <div className="pf-form-row">
        <FormGroup label="Nuclear charge Z" labelFor="cmp-z" intent={intent(e.Z)} helperText={<Msg id="cmp-z-error" text={e.Z} help={ion ? `One-electron ion: ${ion}` : undefined} />}>
          <InputGroup
            id="cmp-z"
            value={fieldText(draft, 'Z')}
            onValueChange={(v) => set('Z', v)}
            data-testid="cmp-z"
            rightElement={
              ion ? (
                <span className="pf-ion" data-testid="cmp-ion">
                  <Typeset text={ion} />
                </span>
              ) : undefined
            }
          />
        </FormGroup>
        <FormGroup label="Common ions" labelFor="cmp-z-pick">
          <HTMLSelect
            id="cmp-z-pick"
            value={ION_PICKS.includes(Z) ? String(Z) : ''}
            onChange={(ev) => ev.currentTarget.value && set('Z', ev.currentTarget.value)}
            options={[{ value: '', label: 'Choose…' }, ...ION_PICKS.map((z) => ({ value: String(z), label: `${ionLabel(z)} (Z = ${z})` }))]}
            data-testid="cmp-z-pick"
          />
        </FormGroup>
      </div>

      <h3>Surface</h3>
      <ButtonGroup className="pf-gap-sm" aria-label="Surface rule">
        <Button
          text="Enclosed probability"
          active={surface.rule === 'enclosed'}
          onClick={() => surface.rule !== 'enclosed' && dispatch({ type: 'surface', surface: { rule: 'enclosed', fraction: p.enclosed !== null && p.enclosed > 0 && p.enclosed < 1 ? Number(p.enclosed.toFixed(3)) : 0.9 } })}
          data-testid="cmp-rule-enclosed"
        />
        <Button
          text="|ψ| value"
          active={surface.rule === 'psi'}
          onClick={() => surface.rule !== 'psi' && dispatch({ type: 'surface', surface: { rule: 'psi', value: p.isovalue !== null && p.isovalue > 0 ? Number(p.isovalue.toPrecision(3)) : 0.01 } })}
          data-testid="cmp-rule-psi"
        />
      </ButtonGroup>
      {surface.rule === 'enclosed' ? (
        <div className="pf-fraction">
          <Slider
            min={50}
            max={99}
            stepSize={0.5}
            labelStepSize={10}
            labelRenderer={(v) => `${v}%`}
            value={Number.isFinite(percent) ? Math.min(99, Math.max(50, percent)) : 90}
            onChange={(v) => set('percent', String(v))}
            data-testid="cmp-fraction-slider"
          />
          <FormGroup
            label="Enclosed probability (%)"
            labelFor="cmp-fraction"
            intent={intent(e.percent)}
            helperText={<Msg id="cmp-surface-error" text={e.percent} help="Share of the probability inside the surfaces (0 to 100, both excluded)." />}
          >
            <InputGroup id="cmp-fraction" value={percentText} onValueChange={(v) => set('percent', v)} data-testid="cmp-fraction" rightElement={<span className="pf-ion">%</span>} />
          </FormGroup>
        </div>
      ) : (
        <FormGroup
          label={
            <>
              |ψ| at the surface (<Typeset text={PSI_UNIT_TEXT} />)
            </>
          }
          labelFor="cmp-psi"
          intent={intent(e.psi ?? e.psiMax)}
          helperText={
            <Msg
              id="cmp-surface-error"
              text={e.psi ?? e.psiMax}
              help={
                <>
                  The surfaces are ψ = ±value (|ψ| = value for complex states)
                  {p.maxAbsPsi !== null && (
                    <>
                      ; this state's largest |ψ| over all space is <span data-testid="cmp-psi-max">{p.maxAbsPsi.toPrecision(3)}</span>
                    </>
                  )}
                  .
                </>
              }
            />
          }
        >
          <InputGroup id="cmp-psi" value={fieldText(draft, 'psi')} onValueChange={(v) => set('psi', v)} data-testid="cmp-psi" />
        </FormGroup>
      )}

      <h3>Grid</h3>
      <FormGroup
        label="Grid N (points per side)"
        labelFor="cmp-grid"
        intent={intent(e.grid)}
        helperText={
          e.grid ? (
            <Msg id="cmp-grid-error" text={e.grid} />
          ) : (
            <span data-testid="cmp-memory">
              {recipe.grid.n === 'auto' ? 'auto: the engine picks the grid that resolves the surface' : gridMemoryText(recipe.grid.n, p.complex)}. The live preview samples {p.previewN}³.
            </span>
          )
        }
      >
        <InputGroup id="cmp-grid" value={fieldText(draft, 'grid')} onValueChange={(v) => set('grid', v)} data-testid="cmp-grid" />
      </FormGroup>
      {Object.keys(e).some((k) => k !== 'title') && (
        <Callout intent="warning" className="pf-gap-sm" data-testid="cmp-invalid">
          Fix the fields marked in red to preview and save.
        </Callout>
      )}
    </div>
  );
}

/** The message when the |ψ| rule asks for a level the state never reaches anywhere (no surface), else null. */
export function psiMaxMessage(recipe: ComposerDraft['recipe'], maxAbsPsi: number | null): string | null {
  if (recipe.surface.rule !== 'psi' || maxAbsPsi === null || recipe.surface.value < maxAbsPsi) return null;
  return `No surface: |ψ| never reaches ${recipe.surface.value} for this state. Its largest |ψ| over all space is ${maxAbsPsi.toPrecision(3)} (same unit); choose a value below it.`;
}
