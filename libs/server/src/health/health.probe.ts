import type { HealthResponse } from '@psiform/contracts';

export type ServiceName = keyof HealthResponse['services'];

/** A dependency check; resolves when the service answers, rejects otherwise. */
export interface HealthProbe {
  readonly name: ServiceName;
  check(): Promise<void>;
}

export const HEALTH_PROBES = Symbol('HEALTH_PROBES');
