import { gateOverrideSchema } from '@psiform/contracts';
import { GateBlockedError, InvalidInputError } from '@psiform/server';

/**
 * The one gate rule: an action must not go ahead while a check has failures, unless someone with the right to act
 * gives a written reason, which is audited in the action's transaction. Preflight gates approval (reviews); the
 * colour checks gate pinning a house style and batch re-renders (swatchbooks). Errors are domain errors: the
 * HttpErrorFilter answers 400 for a malformed override and 409 (GateBlockedDto, naming each failure) for a block.
 */
export type GateDecision = { overridden: false } | { overridden: true; reason: string; auditNote: string };

/** Throws InvalidInputError for a malformed override, GateBlockedError for failures without one; otherwise says what to audit. */
export function decideGate(gate: string, failures: string[], override: unknown): GateDecision {
  let reason: string | undefined;
  if (override !== undefined && override !== null) {
    const r = gateOverrideSchema.safeParse(override);
    if (!r.success) throw new InvalidInputError(r.error.issues.map((i) => `override.${i.path.join('.') || ('keys' in i ? i.keys.join(', ') : 'reason')}: ${i.message}`));
    reason = r.data.reason;
  }
  if (failures.length === 0) return { overridden: false };
  if (!reason) throw new GateBlockedError(gate, failures, true);
  return { overridden: true, reason, auditNote: `${gate} overridden: ${reason} — failures: ${failures.join(' | ')}` };
}
