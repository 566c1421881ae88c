/**
 * Errors of the domain, thrown by stores and services and mapped to HTTP in ONE place (the api's HttpErrorFilter):
 * invalid → 400 (one message per field, as the ValidationPipe answers), forbidden → 403, not_found → 404,
 * conflict → 409, too_large → 413, unavailable → 503. Stores never throw HTTP exceptions.
 */
export type DomainErrorKind = 'invalid' | 'forbidden' | 'not_found' | 'conflict' | 'too_large' | 'unavailable';

export abstract class DomainError extends Error {
  abstract readonly kind: DomainErrorKind;
  /** The messages shown to the caller (one per field for `invalid`). */
  readonly messages: string[];

  constructor(messages: string | string[]) {
    const list = Array.isArray(messages) ? messages : [messages];
    super(list.join('; '));
    this.messages = list;
    this.name = new.target.name;
  }
}

/**
 * The base of each kind below: one class per kind (so callers can throw and catch by name) without writing the kind
 * out twice.
 */
function ofKind<K extends DomainErrorKind>(kind: K) {
  return class extends DomainError {
    readonly kind: K = kind;
  };
}

/** Bad input: each message names its field (`recipe.grid.n: …`). */
export class InvalidInputError extends ofKind('invalid') {}
export class ForbiddenError extends ofKind('forbidden') {}
export class NotFoundError extends ofKind('not_found') {}
/** The request is fine but the state does not allow it now (a proof in review, a locked swatchbook, a race lost). */
export class ConflictError extends ofKind('conflict') {}
export class TooLargeError extends ofKind('too_large') {}
/** A dependency is down or too slow; the message says which. */
export class UnavailableError extends ofKind('unavailable') {}

/**
 * A gate stopped the action (apps/api gates/gate.ts): the checks named in `failures` failed, and the action goes
 * ahead only with a written reason when `overridable`. 409 whose body names the gate and each failure (GateBlockedDto).
 */
export class GateBlockedError extends ConflictError {
  constructor(
    readonly gate: string,
    readonly failures: string[],
    readonly overridable: boolean,
  ) {
    super(`${gate} failed (${failures.length} ${failures.length === 1 ? 'failure' : 'failures'})${overridable ? '; to go ahead anyway, send override: { reason } saying why' : ''}: ${failures.join(' | ')}`);
  }
}
