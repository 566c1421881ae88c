import { useEffect, useState } from 'react';
import { Button, Callout, Dialog, DialogBody, DialogFooter, FormGroup, HTMLSelect, Spinner, Switch, Tag } from '@blueprintjs/core';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { FIGURE_STATUS_LABELS, type BatchDto, type GateBlockedDto, type HouseStyleImpactDto } from '@psiform/contracts';
import { ApiError, describeError } from '../api/client';
import { useApi, useAuth } from '../auth/AuthProvider';
import { OverrideReason } from '../components/OverrideReason';
import { formatDate } from '../figures/model';
import { useSwatchbooks } from '../swatchbooks/SwatchbooksPage';
import { BatchProgress } from './BatchProgress';
import { useHouseStyle } from './DecisionBar';
import { houseStyleImpact, putHouseStyle, startRerender } from './reviewApi';

/** The gate's 409 body, when a request was blocked by failing checks (the server re-checks at the time of the request). */
export function gateBlocked(err: unknown): GateBlockedDto | null {
  if (!(err instanceof ApiError) || err.status !== 409 || !err.body) return null;
  const b = err.body as unknown as Partial<GateBlockedDto>;
  return typeof b.gate === 'string' && Array.isArray(b.failures) ? (b as GateBlockedDto) : null;
}

/** The figures a pin or re-render touches, with their colour changes and what happens to each. */
function ImpactList({ impact }: { impact: HouseStyleImpactDto }) {
  const change = impact.figures.filter((f) => f.effect !== 'kept');
  const kept = impact.figures.filter((f) => f.effect === 'kept');
  const heading = impact.for === 'rerender' ? "Will get a new version with the swatchbook's current colours" : 'Take these colours at their next save';
  return (
    <>
      <h3>
        {heading} ({change.length})
      </h3>
      {change.length === 0 ? (
        <p className="pf-muted" data-testid={impact.for === 'rerender' ? 'rerender-none' : 'impact-none'}>
          {impact.for === 'rerender' ? 'No figure needs re-rendering.' : 'No figure changes colour now.'}
        </p>
      ) : (
        <ul data-testid={impact.for === 'rerender' ? 'rerender-change' : 'impact-change'}>
          {change.map((f) => (
            <li key={f.figureId} data-testid="impact-figure" data-figure-id={f.figureId}>
              <strong>{f.title}</strong> <span className="pf-muted">({FIGURE_STATUS_LABELS[f.status]}, v{f.versionNumber})</span>
              {f.changes.length > 0 && <span className="pf-small"> — {f.changes.map((c) => `${c.what} ${c.from} → ${c.to}`).join('; ')}</span>}
            </li>
          ))}
        </ul>
      )}
      <h3>Left as they are ({kept.length})</h3>
      {kept.length === 0 ? (
        <p className="pf-muted">None.</p>
      ) : (
        <ul data-testid={impact.for === 'rerender' ? 'rerender-skipped' : 'impact-kept'}>
          {kept.map((f) => (
            <li key={f.figureId}>
              {f.title} <span className="pf-muted">— {f.reason}</span>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}

/** The checks' verdict at the top of a confirmation: failures block without a reason; warnings are listed. */
function GateSummary({ impact, blocks }: { impact: HouseStyleImpactDto; blocks: boolean }) {
  const g = impact.gate;
  const count = (n: number, what: string) => `${n} ${what}${n === 1 ? '' : 's'}`;
  const found = [g.failures.length ? `${count(g.failures.length, 'error')} (this swatchbook is already pinned)` : '', g.warnings.length ? `${count(g.warnings.length, 'warning')} (see the swatchbook)` : ''].filter(Boolean);
  if (!blocks)
    return (
      <Callout intent={found.length ? 'warning' : 'success'} compact data-testid="impact-checks">
        Colour checks of “{impact.swatchbook.name}” v{impact.swatchbook.version}: {found.length ? found.join('; ') : 'no errors or warnings'}.
      </Callout>
    );
  return (
    <Callout intent="danger" compact data-testid="impact-blocked" title={impact.for === 'pin' ? 'Pinning is blocked by failing colour checks' : 'The re-render is blocked by failing colour checks'}>
      An art director may go ahead with a written reason; it is recorded in the house style's history and on every affected proof.
    </Callout>
  );
}

/** A publication's house style (pinned swatchbook, sign-off rule, override) and the batch re-render. */
export function HouseStylePanel({ publicationId }: { publicationId: string }) {
  const api = useApi();
  const { user } = useAuth();
  const queryClient = useQueryClient();
  const house = useHouseStyle(publicationId);
  const canEdit = user?.role === 'art_director';
  const books = useSwatchbooks(publicationId); // only this publication's (and its publisher's) may be pinned
  const [swatchbookId, setSwatchbookId] = useState('');
  const [requireColourSignOff, setRequire] = useState(false);
  const [allowOverride, setOverride] = useState(false);
  const [confirm, setConfirm] = useState<HouseStyleImpactDto | null>(null);
  const [blocked, setBlocked] = useState<GateBlockedDto | null>(null);
  const [running, setRunning] = useState<BatchDto | null>(null);

  useEffect(() => {
    if (house.data) {
      setSwatchbookId(house.data.swatchbookId);
      setRequire(house.data.requireColourSignOff);
      setOverride(house.data.allowOverride);
    }
  }, [house.data]);

  const close = () => {
    setConfirm(null);
    setBlocked(null);
  };
  const afterBlocked = (err: unknown) => setBlocked(gateBlocked(err));
  const prepare = useMutation({
    mutationFn: (mode: 'pin' | 'rerender') => houseStyleImpact(api, publicationId, mode, mode === 'pin' ? swatchbookId : undefined),
    onSuccess: (impact) => {
      setBlocked(null);
      setConfirm(impact);
    },
  });
  const save = useMutation({
    mutationFn: (reason?: string) => putHouseStyle(api, publicationId, { swatchbookId, requireColourSignOff, allowOverride, ...(reason ? { override: { reason } } : {}) }),
    onSuccess: (h) => {
      queryClient.setQueryData(['house-style', publicationId], h);
      void queryClient.invalidateQueries({ queryKey: ['figure-audit'] });
      void queryClient.invalidateQueries({ queryKey: ['subject-audit', 'house_style', publicationId] });
      close();
    },
    onError: afterBlocked,
  });
  const start = useMutation({
    mutationFn: (reason?: string) => startRerender(api, publicationId, reason),
    onSuccess: (b) => {
      close();
      setRunning(b);
      void queryClient.invalidateQueries({ queryKey: ['figures'] });
      void queryClient.invalidateQueries({ queryKey: ['figure-audit'] });
    },
    onError: afterBlocked,
  });

  if (house.isPending) return <Spinner size={24} />;
  if (house.isError)
    return (
      <Callout intent="danger" data-testid="house-style-error">
        The house style could not be loaded: {describeError(house.error)}
      </Callout>
    );

  const h = house.data;
  const dirty = !h || h.swatchbookId !== swatchbookId || h.requireColourSignOff !== requireColourSignOff || h.allowOverride !== allowOverride;
  const overrideNote = h?.colourOverride ? (
    <Callout intent="warning" compact className="pf-gap" data-testid="house-style-override" title="Pinned past failing colour checks">
      {h.colourOverride.byName ?? 'An art director'} pinned v{h.colourOverride.swatchbookVersion} on {formatDate(h.colourOverride.at)}: “{h.colourOverride.reason}”. Failures: {h.colourOverride.failures.join('; ')}.
    </Callout>
  ) : null;

  if (!canEdit) {
    return (
      <div data-testid="house-style">
        {h ? (
          <p data-testid="house-style-summary">
            Pinned swatchbook: <Link to={`/swatchbooks/${encodeURIComponent(h.swatchbookId)}`}>{h.swatchbookName}</Link>.{' '}
            {h.requireColourSignOff ? 'Approval needs an art director’s colour sign-off.' : 'No colour sign-off needed.'}{' '}
            {h.allowOverride ? 'Figures may use other colours.' : 'Figures must use these colours.'}
          </p>
        ) : (
          <p className="pf-muted" data-testid="house-style-none">
            No house style yet; an art director pins one.
          </p>
        )}
        {overrideNote}
      </div>
    );
  }

  const pinning = confirm?.for === 'pin';
  const failures = blocked?.failures ?? confirm?.gate.failures ?? [];
  // A (new) pin and every re-render pass the gate; the server's own 409 (blocked) always does.
  const needsReason = blocked !== null || (failures.length > 0 && (!pinning || !h || h.swatchbookId !== swatchbookId));
  const acting = pinning ? save : start;

  return (
    <div data-testid="house-style">
      <form
        onSubmit={(e) => {
          e.preventDefault();
          if (swatchbookId && dirty) prepare.mutate('pin');
        }}
        data-testid="house-style-form"
      >
        {!h && <p className="pf-muted" data-testid="house-style-none">No house style yet: pin a swatchbook to start one.</p>}
        <FormGroup label="Pinned swatchbook" labelFor="hs-swatchbook">
          {books.isError ? (
            <Callout intent="danger">Swatchbooks could not be loaded: {describeError(books.error)}</Callout>
          ) : (
            <HTMLSelect id="hs-swatchbook" value={swatchbookId} onChange={(e) => setSwatchbookId(e.target.value)} disabled={books.isPending} data-testid="hs-swatchbook">
              <option value="">Choose a swatchbook…</option>
              {(books.data ?? []).map((b) => (
                <option key={b.id} value={b.id}>
                  {b.name} (v{b.version}
                  {b.locked ? ', locked' : ''})
                </option>
              ))}
            </HTMLSelect>
          )}
        </FormGroup>
        <Switch checked={requireColourSignOff} onChange={(e) => setRequire(e.currentTarget.checked)} label="Require an art director's colour sign-off before approval" data-testid="hs-require-signoff" />
        <Switch checked={allowOverride} onChange={(e) => setOverride(e.currentTarget.checked)} label="Allow figures to override the pinned colours" data-testid="hs-allow-override" />
        <div className="pf-head-actions">
          <Button type="submit" intent="primary" text="Save house style…" disabled={!swatchbookId || !dirty} loading={prepare.isPending && prepare.variables === 'pin'} data-testid="hs-save" />
        </div>
        {prepare.isError && (
          <Callout intent="danger" className="pf-gap" data-testid="rerender-preview-error">
            Could not work out which figures would change: {describeError(prepare.error)}
          </Callout>
        )}
      </form>
      {overrideNote}

      <h3>Batch re-render</h3>
      <p className="pf-muted pf-small">
        After changing the pinned swatchbook's colours, give every draft figure that uses it a new version in the new colours. Proofs in review, approved and
        released figures are never changed silently.
      </p>
      <Button icon="refresh" text="Re-render affected figures" onClick={() => prepare.mutate('rerender')} disabled={!h || dirty} loading={prepare.isPending && prepare.variables === 'rerender'} data-testid="rerender" />
      {running && <BatchProgress key={running.batchId} initial={running} />}

      <Dialog isOpen={confirm !== null} onClose={close} title={pinning ? 'Save the house style' : 'Re-render affected figures'} icon={pinning ? 'tint' : 'refresh'} style={{ width: 640 }}>
        <DialogBody>
          {confirm && (
            <div data-testid={pinning ? 'pin-confirm' : 'rerender-dialog'}>
              {pinning && (
                <p>
                  Pin <strong>“{confirm.swatchbook.name}” v{confirm.swatchbook.version}</strong>
                  {requireColourSignOff ? ', approval needs a colour sign-off' : ''}
                  {allowOverride ? ', figures may use other colours' : ', figures must use these colours'}.
                </p>
              )}
              <GateSummary impact={confirm} blocks={needsReason} />
              <ImpactList impact={confirm} />
              {needsReason && (
                <div className="pf-gap">
                  <OverrideReason
                    failures={failures}
                    label={pinning ? 'Pin anyway: say why these failures are acceptable (recorded in the audit and on every affected proof)' : 'Re-render anyway: say why these failures are acceptable (recorded in the audit and on every new version)'}
                    submitText={pinning ? 'Pin with this reason' : 'Re-render with this reason'}
                    pending={acting.isPending}
                    onSubmit={(reason) => acting.mutate(reason)}
                    testIdPrefix="colour-override"
                  />
                </div>
              )}
              {acting.isError && !gateBlocked(acting.error) && (
                <Callout intent="danger" className="pf-gap" data-testid={pinning ? 'hs-save-error' : 'rerender-error'}>
                  {pinning ? 'Not saved' : 'Not started'}: {describeError(acting.error)}
                </Callout>
              )}
            </div>
          )}
        </DialogBody>
        <DialogFooter
          actions={
            <>
              <Button text="Cancel" onClick={close} data-testid="confirm-cancel" />
              {!needsReason && (
                <Button
                  intent="primary"
                  text={pinning ? 'Pin' : 'Re-render now'}
                  disabled={!confirm || (!pinning && !confirm.figures.some((f) => f.effect === 'rerender'))}
                  loading={acting.isPending}
                  onClick={() => acting.mutate(undefined)}
                  data-testid={pinning ? 'pin-confirm-submit' : 'rerender-confirm'}
                />
              )}
            </>
          }
        />
      </Dialog>
      {h && <Tag minimal className="pf-gap">Last changed {formatDate(h.updatedAt)}</Tag>}
    </div>
  );
}
