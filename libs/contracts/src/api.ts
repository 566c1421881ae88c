import type { Role } from './roles';

/** Shapes exchanged over HTTP between apps/api and its clients. */
export interface UserDto {
  id: string;
  email: string;
  displayName: string;
  role: Role;
  createdAt: string;
}

export interface LoginRequest {
  email: string;
  password: string;
}

export interface LoginResponse {
  accessToken: string;
  user: UserDto;
}

export interface PublicationDto {
  id: string;
  title: string;
  publisher: string;
  kind: PublicationKind;
  description: string;
  /** The one length unit of the publication's figures: scale bars, section-map axes, radial plots. */
  lengthUnit: LengthUnit;
  createdAt: string;
}

/** Length units a figure may state its lengths in (Å, or the Bohr radius a0). */
export const LENGTH_UNITS = ['angstrom', 'bohr'] as const;
export type LengthUnit = (typeof LENGTH_UNITS)[number];

/** PUT /api/publications/:id/length-unit (admins and the publication's art directors). */
export interface LengthUnitRequest {
  lengthUnit: LengthUnit;
}

export interface MembershipDto {
  publicationId: string;
  userId: string;
  /** The member's role in this publication. */
  role: Role;
}

export type ServiceWord = string;
export interface HealthResponse {
  status: 'ok' | 'degraded';
  services: { database: ServiceWord; redis: ServiceWord; storage: ServiceWord; mail: ServiceWord };
}

/** Error body returned by the API for 4xx answers. */
export interface ApiErrorBody {
  statusCode: number;
  error: string;
  message: string | string[];
}

/** Minimum password length (issue: foundation). */
export const MIN_PASSWORD_LENGTH = 10;

/** Kinds of publication (issue: foundation). */
export const PUBLICATION_KINDS = ['book', 'journal_volume'] as const;
export type PublicationKind = (typeof PUBLICATION_KINDS)[number];

export interface CreateUserRequest {
  email: string;
  displayName: string;
  password: string;
  role: Role;
}

export interface CreatePublicationRequest {
  title: string;
  publisher: string;
  kind: PublicationKind;
  description?: string;
  lengthUnit?: 'angstrom' | 'bohr';
}

export interface AddMemberRequest {
  userId: string;
}

/** Result of the worker's health ping job (queue QUEUES.health, job name HEALTH_PING_JOB). */
export const HEALTH_PING_JOB = 'ping';
export interface HealthPingResult {
  pong: true;
  /** "hostname/pid" of the worker process that answered. */
  worker: string;
}
