import { BadRequestException, ConflictException } from '@nestjs/common';
import { gateOverrideSchema, type GateBlockedDto } from '@psiform/contracts';

/**
 * A gate: an action that must not go ahead while a check has failures, unless someone with the right to act gives
 * a written reason, which is audited. Reusable: preflight gates approval now; swatchbook pinning and batch
 * re-renders can gate the same way (call decideGate with their failures, write `auditNote` in the same transaction).
 */
export class GateBlocked extends ConflictException {
  constructor(gate: string, failures: string[], overridable: boolean) {
    const body: GateBlockedDto = {
      statusCode: 409,
      error: 'Conflict',
      gate,
      message: `${gate} failed (${failures.length} ${failures.length === 1 ? 'failure' : 'failures'})${overridable ? '; to go ahead anyway, send override: { reason } saying why' : ''}: ${failures.join(' | ')}`,
      failures,
      overridable,
    };
    super(body);
  }
}

export type GateDecision = { overridden: false } | { overridden: true; reason: string; auditNote: string };

/** Throws 400 for a malformed override, 409 (GateBlocked) for failures without one; otherwise says what to audit. */
export function decideGate(gate: string, failures: string[], override: unknown): GateDecision {
  let reason: string | undefined;
  if (override !== undefined && override !== null) {
    const r = gateOverrideSchema.safeParse(override);
    if (!r.success) throw new BadRequestException(r.error.issues.map((i) => `override.${i.path.join('.') || 'reason'}: ${i.message}`));
    reason = r.data.reason;
  }
  if (failures.length === 0) return { overridden: false };
  if (!reason) throw new GateBlocked(gate, failures, true);
  return { overridden: true, reason, auditNote: `${gate} overridden: ${reason} — failures: ${failures.join(' | ')}` };
}
