import { tokenStillValid, userState } from './user.entity';

describe('user state and token validity', () => {
  const cut = new Date('2026-03-01T10:00:00.500Z');
  it('states: deactivated wins; no password means invited', () => {
    expect(userState({ active: false, passwordHash: 'h' })).toBe('deactivated');
    expect(userState({ active: false, passwordHash: null })).toBe('deactivated');
    expect(userState({ active: true, passwordHash: null })).toBe('invited');
    expect(userState({ active: true, passwordHash: 'h' })).toBe('active');
  });
  it('a deactivated user has no valid token; without a cut-off every token of an active user is valid', () => {
    expect(tokenStillValid({ active: false, tokensValidAfter: null }, { iatMs: Date.now() })).toBe(false);
    expect(tokenStillValid({ active: true, tokensValidAfter: null }, {})).toBe(true);
  });
  it('millisecond claim decides against the cut-off; whole-second iat only when strictly after it', () => {
    const u = { active: true, tokensValidAfter: cut };
    expect(tokenStillValid(u, { iatMs: cut.getTime() - 1, iat: 1772359201 })).toBe(false);
    expect(tokenStillValid(u, { iatMs: cut.getTime() + 1 })).toBe(true);
    // iat = 10:00:00 (before the cut-off at .500) is refused; 10:00:01 is accepted.
    expect(tokenStillValid(u, { iat: Math.floor(cut.getTime() / 1000) })).toBe(false);
    expect(tokenStillValid(u, { iat: Math.floor(cut.getTime() / 1000) + 1 })).toBe(true);
    expect(tokenStillValid(u, {})).toBe(false);
  });
});
