import { ConflictError } from '../common/domain-errors';
import type { FigureStatus, ReviewAction, Role } from '@psiform/contracts';

/**
 * The proof state machine, as one table (architecture.md, "Proof states"). Services consult it before any
 * change; the database write then re-checks the status under a row lock.
 *   draft ──submit──▶ in_review ──request_changes──▶ changes_requested ──revise (PATCH)──▶ draft
 *   changes_requested ──submit──▶ in_review ──approve (+ colour sign-off where required)──▶ approved ──release──▶ released
 */
export interface TransitionRule {
  from: readonly FigureStatus[];
  /** Target when the action completes the step (approve and colour_signoff may leave the figure in_review). */
  to: FigureStatus;
  roles: readonly Role[];
  /** Human name used in messages. */
  verb: string;
}

export const REVIEW_TRANSITIONS: Record<ReviewAction, TransitionRule> = {
  submit: { from: ['draft', 'changes_requested'], to: 'in_review', roles: ['illustrator', 'admin'], verb: 'submit' },
  request_changes: { from: ['in_review'], to: 'changes_requested', roles: ['editor'], verb: 'request changes on' },
  revise: { from: ['draft', 'changes_requested'], to: 'draft', roles: ['illustrator', 'admin'], verb: 'edit' },
  approve: { from: ['in_review'], to: 'approved', roles: ['editor'], verb: 'approve' },
  colour_signoff: { from: ['in_review'], to: 'approved', roles: ['art_director'], verb: 'sign off the colour of' },
  release: { from: ['approved'], to: 'released', roles: ['editor', 'admin'], verb: 'release' },
};

/** A transition not allowed from the current state (HTTP 409). */
/** A review step the figure's state does not allow (409 through the domain-error filter). */
export class TransitionConflict extends ConflictError {}

/** Throws TransitionConflict naming the current and the allowed states. */
export function assertTransition(action: ReviewAction, status: FigureStatus): TransitionRule {
  const rule = REVIEW_TRANSITIONS[action];
  if (!rule.from.includes(status)) {
    throw new TransitionConflict(`cannot ${rule.verb} a figure that is ${status}: allowed only from ${rule.from.join(' or ')}`);
  }
  return rule;
}

export function isEditable(status: FigureStatus): boolean {
  return REVIEW_TRANSITIONS.revise.from.includes(status);
}

export type ApprovalPart = 'editor_approval' | 'colour_signoff';

/** Approval needs the editor's approve, and where the house style says so also an art director's colour sign-off. */
export function approvalOutcome(state: { requireColourSignOff: boolean; editorApproved: boolean; colourSignedOff: boolean }): { status: FigureStatus; missing: ApprovalPart[] } {
  const missing: ApprovalPart[] = [];
  if (!state.editorApproved) missing.push('editor_approval');
  if (state.requireColourSignOff && !state.colourSignedOff) missing.push('colour_signoff');
  return { status: missing.length === 0 ? 'approved' : 'in_review', missing };
}
