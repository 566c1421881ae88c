import type { ReactNode } from 'react';
import { Navigate, useLocation } from 'react-router-dom';
import type { Role } from '@psiform/contracts';
import { useAuth } from './AuthProvider';
import { Forbidden } from '../pages/Forbidden';

/** Sends anyone without a session to /sign-in, remembering where they were going. */
export function RequireAuth({ children }: { children: ReactNode }) {
  const { user } = useAuth();
  const location = useLocation();
  if (!user) {
    return <Navigate to="/sign-in" replace state={{ from: location.pathname + location.search }} />;
  }
  return <>{children}</>;
}

/** Shows a 403-style message (and stays on the URL) when the signed-in role may not open the page. */
export function RequireRole({ roles, what, children }: { roles: readonly Role[]; what: string; children: ReactNode }) {
  const { user } = useAuth();
  if (!user) return <Navigate to="/sign-in" replace />;
  if (!roles.includes(user.role)) return <Forbidden what={what} allowed={roles} role={user.role} />;
  return <>{children}</>;
}
