import { createContext, useCallback, useContext, useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import type { LoginRequest, UserDto } from '@psiform/contracts';
import { createApiClient, type ApiClient } from '../api/client';
import { clearSession, loadSession, saveSession, type Session } from './session';

export type SignOutReason = 'user' | 'expired';

interface AuthValue {
  user: UserDto | null;
  api: ApiClient;
  signIn(credentials: LoginRequest): Promise<UserDto>;
  signOut(reason?: SignOutReason): void;
  /** Why the last session ended, for the sign-in page to explain. */
  lastSignOut: SignOutReason | null;
}

const AuthContext = createContext<AuthValue | null>(null);

export function AuthProvider({ children }: { children: ReactNode }) {
  const queryClient = useQueryClient();
  const [session, setSession] = useState<Session | null>(() => loadSession());
  const [lastSignOut, setLastSignOut] = useState<SignOutReason | null>(null);
  // The client reads the token through a ref so one client instance serves the whole app.
  const tokenRef = useRef<string | null>(session?.accessToken ?? null);

  const signOut = useCallback(
    (reason: SignOutReason = 'user') => {
      tokenRef.current = null;
      clearSession();
      setSession(null);
      setLastSignOut(reason);
      // Nothing fetched for the previous user may be shown to the next one.
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== 'health' });
    },
    [queryClient],
  );

  const api = useMemo(
    () =>
      createApiClient({
        getToken: () => tokenRef.current,
        onUnauthorized: () => signOut('expired'),
      }),
    [signOut],
  );

  const signIn = useCallback(
    async (credentials: LoginRequest) => {
      const res = await api.login(credentials);
      const next: Session = { accessToken: res.accessToken, user: res.user };
      saveSession(next);
      tokenRef.current = next.accessToken;
      setSession(next);
      setLastSignOut(null);
      return res.user;
    },
    [api],
  );

  // A stored session may be stale (renamed user, changed role, expired token): confirm it once.
  const token = session?.accessToken ?? null;
  const me = useQuery({
    queryKey: ['me', token],
    queryFn: ({ signal }) => api.me(signal),
    enabled: token !== null,
    staleTime: Infinity,
  });
  useEffect(() => {
    const fresh = me.data;
    if (!fresh) return;
    setSession((cur) => {
      if (!cur || cur.accessToken !== token) return cur;
      const same =
        cur.user.id === fresh.id &&
        cur.user.displayName === fresh.displayName &&
        cur.user.role === fresh.role &&
        cur.user.email === fresh.email;
      if (same) return cur;
      const next = { ...cur, user: fresh };
      saveSession(next);
      return next;
    });
  }, [me.data, token]);

  const value = useMemo<AuthValue>(
    () => ({ user: session?.user ?? null, api, signIn, signOut, lastSignOut }),
    [session, api, signIn, signOut, lastSignOut],
  );
  return <AuthContext.Provider value={value}>{children}</AuthContext.Provider>;
}

export function useAuth(): AuthValue {
  const value = useContext(AuthContext);
  if (!value) throw new Error('useAuth must be used inside <AuthProvider>');
  return value;
}

export function useApi(): ApiClient {
  return useAuth().api;
}
