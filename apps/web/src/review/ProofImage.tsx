import type { KeyboardEvent, MouseEvent } from 'react';
import { Callout, NonIdealState, Spinner } from '@blueprintjs/core';
import { useQuery } from '@tanstack/react-query';
import { describeError } from '../api/client';
import { useApi } from '../auth/AuthProvider';

export interface Pin {
  x: number;
  y: number;
}

export interface NumberedPin extends Pin {
  n: number;
}

/** 'fit': the whole image in the column; 'pixels': one image pixel per device pixel (1:1 print pixels). */
export type ProofZoom = 'fit' | 'pixels';

const clamp01 = (v: number) => Math.min(1, Math.max(0, v));

/** Where a click fell on the element, as fractions (0..1) of its width and height from the top left. */
export function pinFromClick(e: MouseEvent<HTMLElement>): Pin | null {
  const r = e.currentTarget.getBoundingClientRect();
  if (!(r.width > 0 && r.height > 0)) return null;
  const round = (v: number) => Math.round(clamp01(v) * 10_000) / 10_000;
  return { x: round((e.clientX - r.left) / r.width), y: round((e.clientY - r.top) / r.height) };
}

/** CSS width that shows `widthPx` image pixels on as many device pixels (CSS px = device px / devicePixelRatio). */
export function onePixelWidth(widthPx: number, devicePixelRatio: number): number {
  return widthPx / (devicePixelRatio > 0 ? devicePixelRatio : 1);
}

/** The presigned link of an image asset (short-lived; refreshed on remount). */
export function useAssetUrl(assetId: string) {
  const api = useApi();
  return useQuery({ queryKey: ['asset-link', assetId], queryFn: ({ signal }) => api.assetLink(assetId, signal), staleTime: 30_000, gcTime: 30_000, enabled: assetId !== '' });
}

/** What stands in for an asset while its link is fetched, or when it could not be (`failed` titles the error); null once the link is there. */
export function assetLinkWait(link: ReturnType<typeof useAssetUrl>, { fetching, failed, testId }: { fetching: string; failed: string; testId: string }) {
  if (link.isPending) return <NonIdealState icon={<Spinner size={28} />} title={fetching} />;
  if (link.isError)
    return (
      <Callout intent="danger" title={failed} data-testid={testId}>
        {describeError(link.error)}
      </Callout>
    );
  return null;
}

/**
 * The rendered proof (PNG asset, through a presigned link). A click places the pending pin; saved pins are numbered
 * markers in the order of the comments that carry them. At zoom 'pixels' the image is shown at 1:1 print pixels
 * inside a scrolling frame; pins keep their places (they are fractions of the image).
 */
export function ProofImage({ assetId, widthPx, zoom = 'fit', pins, pending, onPlace }: { assetId: string; widthPx?: number; zoom?: ProofZoom; pins: NumberedPin[]; pending: Pin | null; onPlace(pin: Pin): void }) {
  const link = useAssetUrl(assetId);
  if (!link.isSuccess) return assetLinkWait(link, { fetching: 'Fetching the proof image…', failed: 'The proof image could not be fetched', testId: 'proof-image-error' });
  const keyPlace = (e: KeyboardEvent<HTMLDivElement>) => {
    if (e.key === 'Enter' || e.key === ' ') {
      e.preventDefault();
      onPlace({ x: 0.5, y: 0.5 });
    }
  };
  const pixels = zoom === 'pixels' && widthPx;
  const width = pixels ? onePixelWidth(widthPx, window.devicePixelRatio) : undefined;
  return (
    <div className={pixels ? 'pf-proof-scroll pf-proof-scroll-1to1' : 'pf-proof-scroll'} data-testid="proof-scroll" data-zoom={zoom}>
      <div
        className="pf-proof-image"
        role="button"
        tabIndex={0}
        aria-label="Proof image: click to place a pin for your comment"
        style={width ? { width, maxWidth: 'none' } : undefined}
        onClick={(e) => {
          const p = pinFromClick(e);
          if (p) onPlace(p);
        }}
        onKeyDown={keyPlace}
        data-testid="proof-image"
      >
        <img src={link.data.url} alt="Rendered proof" draggable={false} style={width ? { width, maxWidth: 'none' } : undefined} data-testid="proof-img" />
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
    </div>
  );
}
