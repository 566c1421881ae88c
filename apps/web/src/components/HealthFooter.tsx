import { useQuery } from '@tanstack/react-query';
import type { HealthResponse } from '@psiform/contracts';
import { useApi } from '../auth/AuthProvider';

const SERVICES: { key: keyof HealthResponse['services']; label: string }[] = [
  { key: 'database', label: 'Database' },
  { key: 'redis', label: 'Queue' },
  { key: 'storage', label: 'Storage' },
  { key: 'mail', label: 'Mail' },
];

// Words the API uses for a healthy service; anything else is shown as a problem, in the API's own word.
const GOOD = new Set(['ok', 'up', 'ready', 'healthy']);

/** Quiet status line: what the API says about each backing service, refreshed every 30 s. */
export function HealthFooter() {
  const api = useApi();
  const health = useQuery({
    queryKey: ['health'],
    queryFn: ({ signal }) => api.health(signal),
    refetchInterval: 30_000,
    retry: false,
  });

  return (
    <footer className="pf-footer" data-testid="health-footer">
      <span className="pf-footer-note">
        Figures model one-electron, hydrogen-like atoms; many-electron orbitals differ.
      </span>
      <span className="pf-status" aria-live="polite">
        {health.isPending && <span className="pf-muted">Checking services…</span>}
        {health.isError && <span className="pf-status-bad">Service status unavailable</span>}
        {health.data &&
          SERVICES.map(({ key, label }) => {
            const word = health.data.services[key] ?? 'unknown';
            const good = GOOD.has(word.toLowerCase());
            return (
              <span key={key} className="pf-status-item" data-testid={`health-${key}`}>
                <span className={good ? 'pf-dot pf-dot-good' : 'pf-dot pf-dot-bad'} aria-hidden="true" />
                <span>
                  {label}: <span className={good ? undefined : 'pf-status-bad'}>{word}</span>
                </span>
              </span>
            );
          })}
      </span>
    </footer>
  );
}
