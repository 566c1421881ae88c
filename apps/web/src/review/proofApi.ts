import type { CreateJobResponse, DeskState, FigureVersionSummaryDto, ProofImageDto, ReviewDeskItemDto, VersionComparisonDto } from '@psiform/contracts';
import type { ApiClient } from '../api/client';

/** Versions, comparison and version renders of a proof; built on the one fetch wrapper (api.request). */
const enc = encodeURIComponent;

export const figureVersions = (api: ApiClient, figureId: string, signal?: AbortSignal) => api.request<FigureVersionSummaryDto[]>(`/api/figures/${enc(figureId)}/versions`, { signal });
export const compareVersions = (api: ApiClient, figureId: string, from: number, to: number, signal?: AbortSignal) =>
  api.request<VersionComparisonDto>(`/api/figures/${enc(figureId)}/compare?from=${from}&to=${to}`, { signal });
export const renderVersion = (api: ApiClient, figureId: string, n: number) => api.request<CreateJobResponse>(`/api/figures/${enc(figureId)}/versions/${n}/render`, { method: 'POST' });

export interface DeskFilter {
  publicationId?: string;
  state?: DeskState;
  minAgeHours?: number;
}

export function reviewDeskPath(f: DeskFilter): string {
  const qs = new URLSearchParams();
  if (f.publicationId) qs.set('publicationId', f.publicationId);
  if (f.state && f.state !== 'in_review') qs.set('state', f.state);
  if (f.minAgeHours) qs.set('minAgeHours', String(f.minAgeHours));
  const s = qs.toString();
  return `/api/review-desk${s ? `?${s}` : ''}`;
}

export const filteredReviewDesk = (api: ApiClient, f: DeskFilter, signal?: AbortSignal) => api.request<ReviewDeskItemDto[]>(reviewDeskPath(f), { signal });

/** "89 × 60 mm at 300 dpi (1051 × 709 px)": what the printer gets. */
export function printFacts(i: Pick<ProofImageDto, 'widthMm' | 'heightMm' | 'dpi' | 'widthPx' | 'heightPx'>): string {
  const mm = (v: number) => String(Number(v.toFixed(1)));
  return `${mm(i.widthMm)} × ${mm(i.heightMm)} mm at ${i.dpi} dpi (${i.widthPx} × ${i.heightPx} px)`;
}
