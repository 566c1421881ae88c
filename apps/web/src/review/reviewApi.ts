import type {
  AuditEntryDto,
  BatchDto,
  CommentDto,
  HouseStyleDto,
  HouseStyleImpactDto,
  ReviewTransitionDto,
} from '@psiform/contracts';
import { ApiError, type ApiClient } from '../api/client';

/** Review, comment, audit, house-style and batch calls; built on the one fetch wrapper (api.request). */

export type Decision = 'submit' | 'request_changes' | 'approve' | 'colour_signoff' | 'release';

const DECISION_PATHS: Record<Decision, string> = {
  submit: 'submit',
  request_changes: 'request-changes',
  approve: 'approve',
  colour_signoff: 'colour-signoff',
  release: 'release',
};

const enc = encodeURIComponent;

export interface NewComment {
  body: string;
  versionId?: string;
  pin?: { x: number; y: number };
}

export interface HouseStyleInput {
  swatchbookId: string;
  requireColourSignOff: boolean;
  allowOverride: boolean;
  /** A written reason to pin a swatchbook whose colour checks fail at error level. */
  override?: { reason: string };
}

export function decide(api: ApiClient, figureId: string, decision: Decision, note?: string): Promise<ReviewTransitionDto> {
  const body = decision === 'submit' || decision === 'release' ? undefined : note === undefined ? {} : { note };
  return api.request<ReviewTransitionDto>(`/api/figures/${enc(figureId)}/${DECISION_PATHS[decision]}`, { method: 'POST', body });
}

export function listComments(api: ApiClient, figureId: string, signal?: AbortSignal): Promise<CommentDto[]> {
  return api.request<CommentDto[]>(`/api/figures/${enc(figureId)}/comments`, { signal });
}

export function addComment(api: ApiClient, figureId: string, comment: NewComment): Promise<CommentDto> {
  return api.request<CommentDto>(`/api/figures/${enc(figureId)}/comments`, { method: 'POST', body: comment });
}

export function auditTrail(api: ApiClient, figureId: string, signal?: AbortSignal): Promise<AuditEntryDto[]> {
  return api.request<AuditEntryDto[]>(`/api/figures/${enc(figureId)}/audit`, { signal });
}

/** The publication's house style, or null when none is set yet (the server answers 404). */
export async function houseStyle(api: ApiClient, publicationId: string, signal?: AbortSignal): Promise<HouseStyleDto | null> {
  try {
    return await api.request<HouseStyleDto>(`/api/publications/${enc(publicationId)}/house-style`, { signal });
  } catch (err) {
    if (err instanceof ApiError && err.status === 404) return null;
    throw err;
  }
}

export function putHouseStyle(api: ApiClient, publicationId: string, body: HouseStyleInput): Promise<HouseStyleDto> {
  return api.request<HouseStyleDto>(`/api/publications/${enc(publicationId)}/house-style`, { method: 'PUT', body });
}

export function startRerender(api: ApiClient, publicationId: string, reason?: string): Promise<BatchDto> {
  return api.request<BatchDto>(`/api/publications/${enc(publicationId)}/rerender`, { method: 'POST', body: reason ? { override: { reason } } : {} });
}

/** What pinning `swatchbookId` (or a re-render with the pinned one) would do: the colour checks and every figure. */
export function houseStyleImpact(api: ApiClient, publicationId: string, mode: 'pin' | 'rerender', swatchbookId?: string): Promise<HouseStyleImpactDto> {
  const qs = new URLSearchParams({ for: mode, ...(swatchbookId ? { swatchbookId } : {}) });
  return api.request<HouseStyleImpactDto>(`/api/publications/${enc(publicationId)}/house-style/impact?${qs.toString()}`);
}

export function batch(api: ApiClient, batchId: string, signal?: AbortSignal): Promise<BatchDto> {
  return api.request<BatchDto>(`/api/batches/${enc(batchId)}`, { signal });
}
