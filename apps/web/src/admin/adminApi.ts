import type {
  InviteUserRequest,
  LinkInfoDto,
  MemberDto,
  MembershipDto,
  Page,
  PublicationAdminDto,
  PublicationKind,
  PublicationSortKey,
  Role,
  SetPasswordResponse,
  SubjectAuditEntryDto,
  UpdatePublicationRequest,
  UpdateUserRequest,
  UserAdminDto,
  UserSortKey,
  UserState,
  CreatePublicationRequest,
} from '@psiform/contracts';
import type { ApiClient } from '../api/client';

/** People, publications (admin) and one-time link calls; built on the one fetch wrapper (api.request). */

const enc = encodeURIComponent;

export interface UserListParams {
  page: number;
  pageSize: number;
  q?: string;
  role?: Role | '';
  state?: UserState | '';
  sort: UserSortKey;
  order: 'asc' | 'desc';
}

export interface PublicationListParams {
  page: number;
  pageSize: number;
  q?: string;
  kind?: PublicationKind | '';
  sort: PublicationSortKey;
  order: 'asc' | 'desc';
}

/** Query string in a fixed order, empty values left out. */
export function queryString(params: object): string {
  const qs = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) {
    if (v === undefined || v === null || v === '') continue;
    qs.set(k, typeof v === 'string' ? v.trim() : String(v));
  }
  const s = qs.toString();
  return s ? `?${s}` : '';
}

export const listUsers = (api: ApiClient, p: UserListParams, signal?: AbortSignal) => api.request<Page<UserAdminDto>>(`/api/users${queryString(p)}`, { signal });
export const getUser = (api: ApiClient, id: string, signal?: AbortSignal) => api.request<UserAdminDto>(`/api/users/${enc(id)}`, { signal });
export const inviteUser = (api: ApiClient, body: InviteUserRequest) => api.request<UserAdminDto>('/api/users/invitations', { method: 'POST', body });
export const updateUser = (api: ApiClient, id: string, body: UpdateUserRequest) => api.request<UserAdminDto>(`/api/users/${enc(id)}`, { method: 'PATCH', body });
export const resendInvitation = (api: ApiClient, id: string) => api.request<UserAdminDto>(`/api/users/${enc(id)}/invitation`, { method: 'POST' });
export const sendPasswordReset = (api: ApiClient, id: string) => api.request<UserAdminDto>(`/api/users/${enc(id)}/password-reset`, { method: 'POST' });

export const listPublicationsAdmin = (api: ApiClient, p: PublicationListParams, signal?: AbortSignal) =>
  api.request<Page<PublicationAdminDto>>(`/api/publications/directory${queryString(p)}`, { signal });
export const createPublication = (api: ApiClient, body: CreatePublicationRequest) => api.request<PublicationAdminDto>('/api/publications', { method: 'POST', body });
export const updatePublication = (api: ApiClient, id: string, body: UpdatePublicationRequest) =>
  api.request<PublicationAdminDto>(`/api/publications/${enc(id)}`, { method: 'PATCH', body });
export const listMembers = (api: ApiClient, id: string, signal?: AbortSignal) => api.request<MemberDto[]>(`/api/publications/${enc(id)}/members`, { signal });
export const addMember = (api: ApiClient, id: string, userId: string, role: Role) =>
  api.request<MembershipDto>(`/api/publications/${enc(id)}/members`, { method: 'POST', body: { userId, role } });
export const setMemberRole = (api: ApiClient, id: string, userId: string, role: Role) =>
  api.request<MembershipDto>(`/api/publications/${enc(id)}/members/${enc(userId)}`, { method: 'PUT', body: { role } });
export const removeMember = (api: ApiClient, id: string, userId: string) => api.request<null>(`/api/publications/${enc(id)}/members/${enc(userId)}`, { method: 'DELETE' });

export const subjectAudit = (api: ApiClient, subjectKind: 'user' | 'publication' | 'house_style', subjectId: string, signal?: AbortSignal) =>
  api.request<Page<SubjectAuditEntryDto>>(`/api/audit${queryString({ subjectKind, subjectId, pageSize: 50 })}`, { signal });

export const linkInfo = (api: ApiClient, token: string) => api.request<LinkInfoDto>('/api/auth/link', { method: 'POST', body: { token }, auth: false });
export const setPassword = (api: ApiClient, token: string, password: string) =>
  api.request<SetPasswordResponse>('/api/auth/set-password', { method: 'POST', body: { token, password }, auth: false });
export const requestPasswordReset = (api: ApiClient, email: string) =>
  api.request<{ message: string }>('/api/auth/password-reset', { method: 'POST', body: { email }, auth: false });

/**
 * Server messages name the field first ("email: … is already registered", "role must be one of …"); this sorts a
 * 400/409's messages under the form's fields so each shows beside its input. Unmatched ones go under "".
 */
export function messagesByField(messages: string[], fields: readonly string[]): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const m of messages) {
    const field = fields.find((f) => m === f || m.startsWith(`${f}:`) || m.startsWith(`${f} `)) ?? '';
    (out[field] ??= []).push(field && m.startsWith(`${field}:`) ? m.slice(field.length + 1).trim() : m);
  }
  return out;
}
