import type { KeyboardEvent, MouseEvent } from 'react';
import { Callout, NonIdealState, Spinner } from '@blueprintjs/core';
import { useQuery } from '@tanstack/react-query';
import type { AssetDto } from '@psiform/contracts';
import { describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';

export interface Pin {
  x: number;
  y: number;
}

export interface NumberedPin extends Pin {
  n: number;
}

const clamp01 = (v: number) => Math.min(1, Math.max(0, v));

/** Where a click fell on the element, as fractions (0..1) of its width and height from the top left. */
export function pinFromClick(e: MouseEvent<HTMLElement>): Pin | null {
  const r = e.currentTarget.getBoundingClientRect();
  if (!(r.width > 0 && r.height > 0)) return null;
  const round = (v: number) => Math.round(clamp01(v) * 10_000) / 10_000;
  return { x: round((e.clientX - r.left) / r.width), y: round((e.clientY - r.top) / r.height) };
}

/**
 * The rendered proof (PNG asset, through a presigned link). A click places the pending pin; saved pins
 * are numbered markers in the order of the comments that carry them.
 */
export function ProofImage({ asset, pins, pending, onPlace }: { asset: AssetDto; pins: NumberedPin[]; pending: Pin | null; onPlace(pin: Pin): void }) {
  const api = useApi();
  const link = useQuery({
    queryKey: ['asset-link', asset.id],
    queryFn: ({ signal }) => api.assetLink(asset.id, signal),
    staleTime: 30_000,
    gcTime: 30_000,
  });
  if (link.isPending) return <NonIdealState icon={<Spinner size={28} />} title="Fetching the proof image…" />;
  if (link.isError)
    return (
      <Callout intent="danger" title="The proof image could not be fetched" data-testid="proof-image-error">
        {describeError(link.error)}
      </Callout>
    );
  const keyPlace = (e: KeyboardEvent<HTMLDivElement>) => {
    if (e.key === 'Enter' || e.key === ' ') {
      e.preventDefault();
      onPlace({ x: 0.5, y: 0.5 });
    }
  };
  return (
    <div
      className="pf-proof-image"
      role="button"
      tabIndex={0}
      aria-label="Proof image: click to place a pin for your comment"
      onClick={(e) => {
        const p = pinFromClick(e);
        if (p) onPlace(p);
      }}
      onKeyDown={keyPlace}
      data-testid="proof-image"
    >
      <img src={link.data.url} alt="Rendered proof" draggable={false} />
      {pins.map((p) => (
        <span key={`${p.n}`} className="pf-pin" style={{ left: `${p.x * 100}%`, top: `${p.y * 100}%` }} data-testid="proof-pin">
          {p.n}
        </span>
      ))}
      {pending && (
        <span className="pf-pin pf-pin-pending" style={{ left: `${pending.x * 100}%`, top: `${pending.y * 100}%` }} data-testid="proof-pin-pending">
          +
        </span>
      )}
    </div>
  );
}
