import type { SwatchbookCheckDto, SwatchbookColorsDto, SwatchbookDto, SwatchbookFile, SwatchbookVersionDto } from '@psiform/contracts';
import type { ApiClient } from '../api/client';

const enc = encodeURIComponent;
const base = '/api/swatchbooks';

/** The caller's swatchbooks; with publicationId, those a figure or house style of that publication may use. */
export const listSwatchbooks = (api: ApiClient, signal?: AbortSignal, publicationId?: string) =>
  api.request<SwatchbookDto[]>(publicationId ? `${base}?publicationId=${enc(publicationId)}` : base, { signal });
export const getSwatchbook = (api: ApiClient, id: string, signal?: AbortSignal) => api.request<SwatchbookDto>(`${base}/${enc(id)}`, { signal });
/** A new swatchbook belongs to one publication (the server refuses one without it). */
export const createSwatchbook = (api: ApiClient, body: { name: string; colors: SwatchbookColorsDto; publicationId: string }) =>
  api.request<SwatchbookDto>(base, { method: 'POST', body });
export const updateSwatchbook = (api: ApiClient, id: string, body: { name?: string; colors?: SwatchbookColorsDto }) =>
  api.request<SwatchbookDto>(`${base}/${enc(id)}`, { method: 'PATCH', body });
export const setSwatchbookLocked = (api: ApiClient, id: string, locked: boolean) =>
  api.request<SwatchbookDto>(`${base}/${enc(id)}/${locked ? 'lock' : 'unlock'}`, { method: 'POST' });
export const swatchbookVersions = (api: ApiClient, id: string, signal?: AbortSignal) =>
  api.request<SwatchbookVersionDto[]>(`${base}/${enc(id)}/versions`, { signal });
export const exportSwatchbook = (api: ApiClient, id: string) => api.request<SwatchbookFile>(`${base}/${enc(id)}/export`);
export const importSwatchbook = (api: ApiClient, file: unknown, publicationId: string) =>
  api.request<SwatchbookDto>(`${base}/import`, { method: 'POST', body: { ...(file as object), publicationId } });
export const swatchbookChecks = (api: ApiClient, id: string, signal?: AbortSignal) =>
  api.request<SwatchbookCheckDto>(`${base}/${enc(id)}/checks`, { signal });
