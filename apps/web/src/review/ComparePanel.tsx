import { useEffect, useState } from 'react';
import { Button, ButtonGroup, Callout, HTMLSelect, NonIdealState, Spinner, Tag } from '@blueprintjs/core';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { FigureVersionSummaryDto } from '@psiform/contracts';
import { describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';
import { JobProgress } from '../figures/JobProgress';
import { formatDate } from '../figures/model';
import { useAssetUrl } from './ProofImage';
import { compareVersions, printFacts, renderVersion } from './proofApi';
import { CallFailed } from '../components/CallFailed';

export type CompareMode = 'side' | 'slider' | 'blink';
const MODES: { mode: CompareMode; label: string }[] = [
  { mode: 'side', label: 'Side by side' },
  { mode: 'slider', label: 'Slider' },
  { mode: 'blink', label: 'Blink' },
];
/** Blink period: long enough to see each image, short enough that a difference jumps out (our choice). */
export const BLINK_MS = 700;

const versionWords = (v: FigureVersionSummaryDto) => `Version ${v.number}${v.current ? ' (current)' : v.locked ? ' (proof)' : ''} · ${formatDate(v.createdAt)}`;

/** The default pair: the version before the newest, against the newest. */
export function defaultPair(versions: FigureVersionSummaryDto[]): [number, number] {
  const nums = versions.map((v) => v.number).sort((a, b) => a - b);
  const to = nums[nums.length - 1] ?? 1;
  return [nums.length > 1 ? nums[nums.length - 2] : to, to];
}

/** One version's print image, or a way to render it at its own print size. */
function VersionImage({ figureId, v, canRender, side, onRendered }: { figureId: string; v: FigureVersionSummaryDto; canRender: boolean; side: 'a' | 'b'; onRendered(): void }) {
  const api = useApi();
  const [jobId, setJobId] = useState<string | null>(null);
  const render = useMutation({ mutationFn: () => renderVersion(api, figureId, v.number), onSuccess: (r) => setJobId(r.jobId) });
  const link = useAssetUrl(v.image?.assetId ?? '');
  if (!v.image) {
    return (
      <div className="pf-compare-missing" data-testid={`compare-missing-${side}`}>
        <p className="pf-muted">Version {v.number} has no print image yet.</p>
        {jobId ? (
          <JobProgress jobId={jobId} onFinished={onRendered} />
        ) : canRender ? (
          <Button icon="media" text={`Render version ${v.number} at print size`} loading={render.isPending} onClick={() => render.mutate()} data-testid={`compare-render-${side}`} />
        ) : null}
        {render.isError && <Callout intent="danger" compact>{describeError(render.error)}</Callout>}
      </div>
    );
  }
  if (link.isPending) return <Spinner size={24} />;
  if (link.isError) return <Callout intent="danger">{describeError(link.error)}</Callout>;
  return <img className="pf-compare-img" src={link.data.url} alt={`Version ${v.number}`} draggable={false} data-testid={`compare-img-${side}`} />;
}

function Facts({ v }: { v: FigureVersionSummaryDto }) {
  return <p className="pf-small pf-muted">{v.image ? `${printFacts(v.image)} · ${v.image.colourMode}` : 'no print image'}</p>;
}

/** Two images stacked; the slider uncovers the second from the left. */
function Slider({ a, b }: { a: string; b: string }) {
  const [pos, setPos] = useState(50);
  return (
    <div className="pf-compare-stack" data-testid="compare-slider">
      <img src={a} alt="Earlier version" draggable={false} />
      <img src={b} alt="Later version" draggable={false} className="pf-compare-top" style={{ clipPath: `inset(0 ${100 - pos}% 0 0)` }} data-testid="compare-slider-top" />
      <div className="pf-compare-divider" style={{ left: `${pos}%` }} aria-hidden="true" />
      <input type="range" min={0} max={100} value={pos} onChange={(e) => setPos(Number(e.currentTarget.value))} aria-label="Uncover the later version" className="pf-compare-range" data-testid="compare-slider-range" />
    </div>
  );
}

/** The two images alternating in place; pause to hold one. */
function Blink({ a, b, labels }: { a: string; b: string; labels: [string, string] }) {
  const [showB, setShowB] = useState(false);
  const [running, setRunning] = useState(true);
  useEffect(() => {
    if (!running) return;
    const t = setInterval(() => setShowB((s) => !s), BLINK_MS);
    return () => clearInterval(t);
  }, [running]);
  return (
    <div data-testid="compare-blink">
      <div className="pf-compare-stack">
        <img src={showB ? b : a} alt={showB ? labels[1] : labels[0]} draggable={false} data-testid="compare-blink-img" />
      </div>
      <p className="pf-small">
        <Tag minimal data-testid="compare-blink-label">
          {showB ? labels[1] : labels[0]}
        </Tag>{' '}
        <Button size="small" variant="minimal" icon={running ? 'pause' : 'play'} text={running ? 'Hold' : 'Blink'} onClick={() => setRunning((r) => !r)} data-testid="compare-blink-toggle" />
      </p>
    </div>
  );
}

function Overlay({ mode, a, b }: { mode: 'slider' | 'blink'; a: FigureVersionSummaryDto; b: FigureVersionSummaryDto }) {
  const la = useAssetUrl(a.image?.assetId ?? '');
  const lb = useAssetUrl(b.image?.assetId ?? '');
  if (!a.image || !b.image) return <p className="pf-muted" data-testid="compare-overlay-needs-images">The overlay needs a print image of both versions: render the missing one in “Side by side”.</p>;
  if (la.isPending || lb.isPending) return <Spinner size={24} />;
  if (la.isError || lb.isError) return <Callout intent="danger">{describeError(la.error ?? lb.error)}</Callout>;
  const differentSize = a.image.widthPx !== b.image.widthPx || a.image.heightPx !== b.image.heightPx;
  return (
    <>
      {differentSize && (
        <Callout intent="warning" compact data-testid="compare-size-differs">
          The two images differ in size ({a.image.widthPx} × {a.image.heightPx} px and {b.image.widthPx} × {b.image.heightPx} px): the overlay scales them to the same width.
        </Callout>
      )}
      {mode === 'slider' ? <Slider a={la.data.url} b={lb.data.url} /> : <Blink a={la.data.url} b={lb.data.url} labels={[`Version ${a.number}`, `Version ${b.number}`]} />}
    </>
  );
}

/**
 * Compare any two versions of a proof: the recipe differences in words, and the print images side by side, under a
 * slider, or blinking in place. A version without a print image can be rendered at its own print size from here.
 */
export function ComparePanel({ figureId, versions, canRender }: { figureId: string; versions: FigureVersionSummaryDto[]; canRender: boolean }) {
  const api = useApi();
  const qc = useQueryClient();
  const [pair, setPair] = useState<[number, number]>(() => defaultPair(versions));
  const [mode, setMode] = useState<CompareMode>('side');
  const [from, to] = pair;
  const cmp = useQuery({ queryKey: ['compare', figureId, from, to], queryFn: ({ signal }) => compareVersions(api, figureId, from, to, signal) });
  const refresh = () => {
    void qc.invalidateQueries({ queryKey: ['figure-versions', figureId] });
    void qc.invalidateQueries({ queryKey: ['compare', figureId] });
  };
  const options = versions.map((v) => ({ value: String(v.number), label: versionWords(v) }));

  if (versions.length < 2) return <p className="pf-muted" data-testid="compare-single">This figure has one version so far: nothing to compare yet.</p>;
  return (
    <div className="pf-compare" data-testid="compare-panel">
      <div className="pf-toolbar pf-compare-bar">
        <HTMLSelect value={String(from)} onChange={(e) => setPair([Number(e.currentTarget.value), to])} options={options} aria-label="Compare from version" data-testid="compare-from" />
        <Button variant="minimal" icon="swap-horizontal" aria-label="Swap the versions" onClick={() => setPair([to, from])} data-testid="compare-swap" />
        <HTMLSelect value={String(to)} onChange={(e) => setPair([from, Number(e.currentTarget.value)])} options={options} aria-label="Compare to version" data-testid="compare-to" />
        <ButtonGroup className="pf-toolbar-end">
          {MODES.map((m) => (
            <Button key={m.mode} text={m.label} active={mode === m.mode} onClick={() => setMode(m.mode)} data-testid={`compare-mode-${m.mode}`} />
          ))}
        </ButtonGroup>
      </div>

      {cmp.isPending && <NonIdealState icon={<Spinner size={24} />} title="Comparing…" />}
      <CallFailed call={cmp} testId="compare-error" />
      {cmp.isSuccess && (
        <>
          <div className="pf-compare-changes">
            <h3>
              What changed from version {cmp.data.from.number} to version {cmp.data.to.number}
            </h3>
            {cmp.data.changes.length === 0 ? (
              <p className="pf-muted" data-testid="compare-no-changes">
                No change to the recipe.
              </p>
            ) : (
              <ul data-testid="compare-changes" aria-label={cmp.data.summary}>
                {cmp.data.changes.map((c) => (
                  <li key={c.path} data-testid="compare-change" data-path={c.path}>
                    <strong>{c.what}</strong> {c.from} → {c.to}
                  </li>
                ))}
              </ul>
            )}
          </div>
          {mode === 'side' ? (
            <div className="pf-compare-side" data-testid="compare-side">
              {(['a', 'b'] as const).map((side) => {
                const v = side === 'a' ? cmp.data.from : cmp.data.to;
                return (
                  <figure key={side} className="pf-compare-pane">
                    <figcaption>
                      <strong>Version {v.number}</strong>
                      {v.current && ' (current)'}
                      {v.authorName && <span className="pf-muted"> · {v.authorName}</span>}
                    </figcaption>
                    <VersionImage key={`${v.number}-${v.image?.assetId ?? 'none'}`} figureId={figureId} v={v} canRender={canRender} side={side} onRendered={refresh} />
                    <Facts v={v} />
                  </figure>
                );
              })}
            </div>
          ) : (
            <Overlay mode={mode} a={cmp.data.from} b={cmp.data.to} />
          )}
        </>
      )}
    </div>
  );
}
