import { Inject, Injectable, Optional } from '@nestjs/common';
import type { HealthResponse } from '@psiform/contracts';
import { HEALTH_PROBES, type HealthProbe, type ServiceName } from '@psiform/server';

export const HEALTH_TIMEOUT_MS = Symbol('HEALTH_TIMEOUT_MS');
const DEFAULT_TIMEOUT_MS = 2000;

class ProbeTimeout extends Error {}

const UNREACHABLE_CODES = new Set(['ECONNREFUSED', 'ENOTFOUND', 'EHOSTUNREACH', 'ENETUNREACH', 'ECONNRESET', 'EPIPE', 'EAI_AGAIN']);

/** One short word per failure, e.g. "timeout", "unreachable", "error: NoSuchBucket". */
export function describeFailure(err: unknown): string {
  if (err instanceof ProbeTimeout) return 'timeout';
  const e = err as { code?: unknown; originalCode?: unknown; name?: unknown; errors?: unknown[]; cause?: unknown } | null;
  const code = typeof e?.code === 'string' ? e.code : undefined;
  if (code && UNREACHABLE_CODES.has(code)) return 'unreachable';
  // nodemailer reports socket failures as ESOCKET with the system code in originalCode.
  if (typeof e?.originalCode === 'string' && UNREACHABLE_CODES.has(e.originalCode)) return 'unreachable';
  // AggregateError (Node's happy-eyeballs connect) and wrapped causes
  if (Array.isArray(e?.errors) && e.errors.length > 0) return describeFailure(e.errors[0]);
  if (e?.cause && e.cause !== err) {
    const inner = describeFailure(e.cause);
    if (inner === 'unreachable') return inner;
  }
  if (e?.name === 'MaxRetriesPerRequestError') return 'unreachable';
  // Some clients only keep the system code in the message (e.g. the AWS SDK's "error wrapper for Error: connect ECONNREFUSED").
  const message = err instanceof Error ? err.message : typeof (e as { message?: unknown })?.message === 'string' ? String((e as { message: string }).message) : '';
  if ([...UNREACHABLE_CODES].some((c) => new RegExp(`\\b${c}\\b`).test(message))) return 'unreachable';
  const label = code ?? (typeof e?.name === 'string' && e.name !== 'Error' ? e.name : undefined) ?? 'unknown';
  return `error: ${label}`;
}

@Injectable()
export class HealthService {
  private readonly timeoutMs: number;
  constructor(
    @Inject(HEALTH_PROBES) private readonly probes: HealthProbe[],
    @Optional() @Inject(HEALTH_TIMEOUT_MS) timeoutMs?: number,
  ) {
    this.timeoutMs = timeoutMs ?? DEFAULT_TIMEOUT_MS;
  }

  async check(): Promise<HealthResponse> {
    const results = await Promise.all(this.probes.map(async (p) => [p.name, await this.run(p)] as const));
    const services = { database: 'unknown', redis: 'unknown', storage: 'unknown', mail: 'unknown' } as Record<ServiceName, string>;
    for (const [name, word] of results) services[name] = word;
    const ok = Object.values(services).every((w) => w === 'ok');
    return { status: ok ? 'ok' : 'degraded', services };
  }

  private async run(probe: HealthProbe): Promise<string> {
    let timer: NodeJS.Timeout | undefined;
    const timeout = new Promise<never>((_, reject) => {
      timer = setTimeout(() => reject(new ProbeTimeout()), this.timeoutMs);
    });
    try {
      await Promise.race([probe.check(), timeout]);
      return 'ok';
    } catch (err) {
      return describeFailure(err);
    } finally {
      clearTimeout(timer);
    }
  }
}
