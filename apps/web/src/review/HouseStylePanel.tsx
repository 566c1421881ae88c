import { useEffect, useState } from 'react';
import { Button, Callout, Dialog, DialogBody, DialogFooter, FormGroup, HTMLSelect, Spinner, Switch } from '@blueprintjs/core';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { BatchDto } from '@psiform/contracts';
import { describeError } from '../api/client';
import { useApi, useAuth } from '../auth/AuthProvider';
import { useSwatchbooks } from '../swatchbooks/SwatchbooksPage';
import { BatchProgress } from './BatchProgress';
import { useHouseStyle } from './DecisionBar';
import { putHouseStyle, startRerender } from './reviewApi';
import { previewRerender, type RerenderPreview } from './rerenderPreview';

function PreviewList({ preview }: { preview: RerenderPreview }) {
  return (
    <>
      <h3>Will get a new version with the swatchbook's current colours ({preview.change.length})</h3>
      {preview.change.length === 0 ? (
        <p className="pf-muted" data-testid="rerender-none">No figure needs re-rendering.</p>
      ) : (
        <ul data-testid="rerender-change">
          {preview.change.map((f) => (
            <li key={f.figureId}>{f.title}</li>
          ))}
        </ul>
      )}
      <h3>Left as they are ({preview.skipped.length})</h3>
      {preview.skipped.length === 0 ? (
        <p className="pf-muted">None.</p>
      ) : (
        <ul data-testid="rerender-skipped">
          {preview.skipped.map((f) => (
            <li key={f.figureId}>
              {f.title} <span className="pf-muted">— {f.reason}</span>
            </li>
          ))}
        </ul>
      )}
    </>
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
  const [preview, setPreview] = useState<RerenderPreview | null>(null);
  const [running, setRunning] = useState<BatchDto | null>(null);

  useEffect(() => {
    if (house.data) {
      setSwatchbookId(house.data.swatchbookId);
      setRequire(house.data.requireColourSignOff);
      setOverride(house.data.allowOverride);
    }
  }, [house.data]);

  const save = useMutation({
    mutationFn: () => putHouseStyle(api, publicationId, { swatchbookId, requireColourSignOff, allowOverride }),
    onSuccess: (h) => queryClient.setQueryData(['house-style', publicationId], h),
  });
  const prepare = useMutation({
    mutationFn: () => previewRerender(api, publicationId, house.data!.swatchbookId),
    onSuccess: setPreview,
  });
  const start = useMutation({
    mutationFn: () => startRerender(api, publicationId),
    onSuccess: (b) => {
      setPreview(null);
      setRunning(b);
      void queryClient.invalidateQueries({ queryKey: ['figures'] });
    },
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
      </div>
    );
  }

  return (
    <div data-testid="house-style">
      <form
        onSubmit={(e) => {
          e.preventDefault();
          if (swatchbookId && dirty) save.mutate();
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
          <Button type="submit" intent="primary" text="Save house style" disabled={!swatchbookId || !dirty} loading={save.isPending} data-testid="hs-save" />
        </div>
        {save.isError && (
          <Callout intent="danger" className="pf-gap" data-testid="hs-save-error">
            Not saved: {describeError(save.error)}
          </Callout>
        )}
      </form>

      <h3>Batch re-render</h3>
      <p className="pf-muted pf-small">
        After changing the pinned swatchbook's colours, give every draft figure that uses it a new version in the new colours. Proofs in review, approved and
        released figures are never changed silently.
      </p>
      <Button icon="refresh" text="Re-render affected figures" onClick={() => prepare.mutate()} disabled={!h || dirty} loading={prepare.isPending} data-testid="rerender" />
      {prepare.isError && (
        <Callout intent="danger" className="pf-gap" data-testid="rerender-preview-error">
          Could not work out which figures would change: {describeError(prepare.error)}
        </Callout>
      )}
      {running && <BatchProgress key={running.batchId} initial={running} />}

      <Dialog isOpen={preview !== null} onClose={() => setPreview(null)} title="Re-render affected figures" icon="refresh">
        <DialogBody>
          {preview && <PreviewList preview={preview} />}
          {start.isError && (
            <Callout intent="danger" data-testid="rerender-error">
              Not started: {describeError(start.error)}
            </Callout>
          )}
        </DialogBody>
        <DialogFooter
          actions={
            <>
              <Button text="Cancel" onClick={() => setPreview(null)} />
              <Button intent="primary" text="Re-render now" disabled={!preview || preview.change.length === 0} loading={start.isPending} onClick={() => start.mutate()} data-testid="rerender-confirm" />
            </>
          }
        />
      </Dialog>
    </div>
  );
}
