import { isRole, type UserDto } from '@psiform/contracts';

/** What we keep between page loads: the API's access token and the user it belongs to. */
export interface Session {
  accessToken: string;
  user: UserDto;
}

// sessionStorage: the sign-in lasts for this tab only, and closing the tab ends it.
const KEY = 'psiform.session';

function isUser(value: unknown): value is UserDto {
  if (typeof value !== 'object' || value === null) return false;
  const u = value as Record<string, unknown>;
  return (
    typeof u.id === 'string' &&
    typeof u.email === 'string' &&
    typeof u.displayName === 'string' &&
    isRole(u.role) &&
    typeof u.createdAt === 'string'
  );
}

export function isSession(value: unknown): value is Session {
  if (typeof value !== 'object' || value === null) return false;
  const s = value as Record<string, unknown>;
  return typeof s.accessToken === 'string' && s.accessToken.length > 0 && isUser(s.user);
}

export function loadSession(storage: Storage = window.sessionStorage): Session | null {
  try {
    const raw = storage.getItem(KEY);
    if (!raw) return null;
    const parsed: unknown = JSON.parse(raw);
    if (isSession(parsed)) return parsed;
  } catch {
    // unreadable entry: fall through and drop it
  }
  storage.removeItem(KEY);
  return null;
}

export function saveSession(session: Session, storage: Storage = window.sessionStorage): void {
  storage.setItem(KEY, JSON.stringify(session));
}

export function clearSession(storage: Storage = window.sessionStorage): void {
  storage.removeItem(KEY);
}

export const SESSION_STORAGE_KEY = KEY;
