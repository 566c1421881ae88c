import type { SwatchbookCheckDto, SwatchbookColorsDto, SwatchbookDto, SwatchbookFile, SwatchbookVersionDto } from '@psiform/contracts';
import type { ApiClient } from '../api/client';

const enc = encodeURIComponent;
const base = '/api/swatchbooks';

export const listSwatchbooks = (api: ApiClient, signal?: AbortSignal) => api.request<SwatchbookDto[]>(base, { signal });
export const getSwatchbook = (api: ApiClient, id: string, signal?: AbortSignal) => api.request<SwatchbookDto>(`${base}/${enc(id)}`, { signal });
export const createSwatchbook = (api: ApiClient, body: { name: string; colors: SwatchbookColorsDto }) =>
  api.request<SwatchbookDto>(base, { method: 'POST', body });
export const updateSwatchbook = (api: ApiClient, id: string, body: { name?: string; colors?: SwatchbookColorsDto }) =>
  api.request<SwatchbookDto>(`${base}/${enc(id)}`, { method: 'PATCH', body });
export const setSwatchbookLocked = (api: ApiClient, id: string, locked: boolean) =>
  api.request<SwatchbookDto>(`${base}/${enc(id)}/${locked ? 'lock' : 'unlock'}`, { method: 'POST' });
export const swatchbookVersions = (api: ApiClient, id: string, signal?: AbortSignal) =>
  api.request<SwatchbookVersionDto[]>(`${base}/${enc(id)}/versions`, { signal });
export const exportSwatchbook = (api: ApiClient, id: string) => api.request<SwatchbookFile>(`${base}/${enc(id)}/export`);
export const importSwatchbook = (api: ApiClient, file: unknown) => api.request<SwatchbookDto>(`${base}/import`, { method: 'POST', body: file });
export const swatchbookChecks = (api: ApiClient, id: string, signal?: AbortSignal) =>
  api.request<SwatchbookCheckDto>(`${base}/${enc(id)}/checks`, { signal });
