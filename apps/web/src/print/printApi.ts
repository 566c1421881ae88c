import type { DeliveryProfile, DeliveryProfileDto, FigurePreflightDto, ReviewTransitionDto } from '@psiform/contracts';
import type { ApiClient } from '../api/client';

export const getDeliveryProfile = (api: ApiClient, publicationId: string) => api.request<DeliveryProfileDto>(`/api/publications/${encodeURIComponent(publicationId)}/delivery-profile`);
export const putDeliveryProfile = (api: ApiClient, publicationId: string, profile: DeliveryProfile) =>
  api.request<DeliveryProfileDto>(`/api/publications/${encodeURIComponent(publicationId)}/delivery-profile`, { method: 'PUT', body: profile });
export const getFigurePreflight = (api: ApiClient, figureId: string) => api.request<FigurePreflightDto>(`/api/figures/${encodeURIComponent(figureId)}/preflight`);
export const approveWithOverride = (api: ApiClient, figureId: string, reason: string) =>
  api.request<ReviewTransitionDto>(`/api/figures/${encodeURIComponent(figureId)}/approve`, { method: 'POST', body: { override: { reason } } });
