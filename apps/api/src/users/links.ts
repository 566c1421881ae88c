import { createHash, randomBytes } from 'node:crypto';
import { LINK_TTL_HOURS, SET_PASSWORD_PATH, type LinkPurpose } from '@psiform/contracts';

/**
 * One-time link tokens: 32 random bytes (256 bits, far beyond guessing) as base64url. Only the SHA-256 of a
 * token is stored; a plain hash is enough here (no salt or slow hash) because the token is random, not chosen
 * by a person (common practice, e.g. OWASP's Forgot Password Cheat Sheet).
 */
export function newLinkToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashLinkToken(token) };
}

export function hashLinkToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

export function linkExpiry(purpose: LinkPurpose, now = new Date()): Date {
  return new Date(now.getTime() + LINK_TTL_HOURS[purpose] * 3_600_000);
}

/** The token goes in the fragment: browsers never send it to a server, so it stays out of access logs and Referer headers. */
export function setPasswordUrl(publicBaseUrl: string, token: string): string {
  return `${publicBaseUrl}${SET_PASSWORD_PATH}#token=${token}`;
}
