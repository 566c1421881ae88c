import { useQuery } from '@tanstack/react-query';
import { useApi, useAuth } from '../auth/AuthProvider';

/** The publications the signed-in user belongs to (shared cache with the Publications page). */
export function usePublications() {
  const api = useApi();
  const { user } = useAuth();
  return useQuery({
    queryKey: ['publications', user?.id],
    queryFn: ({ signal }) => api.publications(signal),
  });
}
