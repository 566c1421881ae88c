import type { Role } from './roles';
import type { LengthUnit, PublicationDto, PublicationKind, UserDto } from './api';

/**
 * People and publications (admin): accounts, one-time links, memberships with a role per publication, and the
 * admin audit trail. Shapes exchanged over HTTP; the API validates against the limits below.
 */

/** invited: has no password yet (waiting for the invitation link); active: may sign in; deactivated: may not. */
export const USER_STATES = ['invited', 'active', 'deactivated'] as const;
export type UserState = (typeof USER_STATES)[number];

export const USER_STATE_LABELS: Record<UserState, string> = {
  invited: 'Invited',
  active: 'Active',
  deactivated: 'Deactivated',
};

/** A user as the People page lists them. */
export interface UserAdminDto extends UserDto {
  state: UserState;
  /** When the newest invitation or reset link was sent; null when none. */
  lastLinkSentAt: string | null;
  /** Publications the user belongs to, with their role there. */
  memberships: UserMembershipDto[];
}

export interface UserMembershipDto {
  publicationId: string;
  publicationTitle: string;
  role: Role;
}

export const USER_SORT_KEYS = ['displayName', 'email', 'role', 'state', 'createdAt'] as const;
export type UserSortKey = (typeof USER_SORT_KEYS)[number];

export const PUBLICATION_SORT_KEYS = ['title', 'publisher', 'kind', 'members', 'createdAt'] as const;
export type PublicationSortKey = (typeof PUBLICATION_SORT_KEYS)[number];

/** Page sizes of the admin tables (query parameter pageSize). */
export const ADMIN_PAGE_SIZE = { default: 25, max: 100 } as const;

/** POST /api/users/invitations: the account is created without a password; the mail carries a one-time link. */
export interface InviteUserRequest {
  email: string;
  displayName: string;
  role: Role;
  /** Publications to add the new user to at once; role defaults to the user's role. */
  publications?: { publicationId: string; role?: Role }[];
}

/** PATCH /api/users/:id (admin): at least one field. */
export interface UpdateUserRequest {
  displayName?: string;
  role?: Role;
  /** false deactivates (every token of the user stops working at once), true reactivates. */
  active?: boolean;
}

/** One-time links: what they are for and how long they work. */
export const LINK_PURPOSES = ['invite', 'reset'] as const;
export type LinkPurpose = (typeof LINK_PURPOSES)[number];
/** Lifetimes in hours (our choice: an invitation waits a few days for a busy colleague; a reset link is short). */
export const LINK_TTL_HOURS: Record<LinkPurpose, number> = { invite: 72, reset: 2 };
/** The client page the links open; the token travels in the fragment (#token=...) so it never reaches a server log. */
export const SET_PASSWORD_PATH = '/set-password';

/** POST /api/auth/link (public): what a link is for, without using it up. */
export interface LinkInfoRequest {
  token: string;
}
export interface LinkInfoDto {
  purpose: LinkPurpose;
  email: string;
  displayName: string;
  expiresAt: string;
}

/** POST /api/auth/set-password (public): uses the link once. */
export interface SetPasswordRequest {
  token: string;
  password: string;
}
export interface SetPasswordResponse {
  email: string;
  message: string;
}

/** POST /api/auth/password-reset (public): always 202, whether or not the address is known. */
export interface PasswordResetRequest {
  email: string;
}

/** How each length unit (LENGTH_UNITS, api.ts) is written. */
export const LENGTH_UNIT_SYMBOLS: Record<LengthUnit, string> = { angstrom: 'Å', bohr: 'a₀' };

/** A publication as the Publications admin page lists it. */
export interface PublicationAdminDto extends PublicationDto {
  lengthUnit: LengthUnit;
  memberCount: number;
}

export interface UpdatePublicationRequest {
  title?: string;
  publisher?: string;
  kind?: PublicationKind;
  description?: string;
  lengthUnit?: LengthUnit;
}

/** GET /api/publications/:id/members rows: the user plus their role in this publication. */
export interface MemberDto extends UserDto {
  publicationRole: Role;
  state: UserState;
  addedAt: string;
}

export interface AddMemberWithRoleRequest {
  userId: string;
  /** Role in this publication; defaults to the user's role. */
  role?: Role;
}

/** Subjects of audit entries besides figures. */
export const AUDIT_SUBJECTS = ['figure', 'user', 'publication', 'house_style'] as const;
export type AuditSubject = (typeof AUDIT_SUBJECTS)[number];

/** GET /api/audit (admin): entries about users, publications and house styles, newest first. */
export interface SubjectAuditEntryDto {
  id: string;
  subjectKind: AuditSubject;
  subjectId: string;
  actorId: string | null;
  actorName?: string;
  action: string;
  note: string | null;
  at: string;
}
