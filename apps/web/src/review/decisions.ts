import type { AuditEntryDto, FigureStatus, Role } from '@psiform/contracts';
import type { Decision } from './reviewApi';

/** What the open review round already has (derived from the audit trail after the last submit). */
export interface RoundState {
  editorApproved: boolean;
  colourSignedOff: boolean;
}

export interface DecisionContext {
  role: Role;
  status: FigureStatus;
  /** The signed-in user owns the figure. */
  isOwner: boolean;
  /** The publication's house style asks for an art director's colour sign-off. */
  requireColourSignOff: boolean;
  round: RoundState;
}

export const DECISION_LABELS: Record<Decision, string> = {
  submit: 'Submit for review',
  request_changes: 'Request changes',
  approve: 'Approve',
  colour_signoff: 'Colour sign-off',
  release: 'Release',
};

/**
 * The decisions the role may take in this state, mirroring the server's transition table
 * (apps/api/src/reviews/review-transitions.ts). The server still decides; this only hides buttons
 * that could never succeed.
 */
export function availableDecisions(c: DecisionContext): Decision[] {
  const out: Decision[] = [];
  const editable = c.status === 'draft' || c.status === 'changes_requested';
  if (editable && ((c.role === 'illustrator' && c.isOwner) || c.role === 'admin')) out.push('submit');
  if (c.status === 'in_review') {
    if (c.role === 'editor') {
      out.push('request_changes');
      if (!c.round.editorApproved) out.push('approve');
    }
    if (c.role === 'art_director' && c.requireColourSignOff && !c.round.colourSignedOff) out.push('colour_signoff');
  }
  if (c.status === 'approved' && (c.role === 'editor' || c.role === 'admin')) out.push('release');
  return out;
}

/** Approvals recorded since the figure was last submitted (the open round). */
export function roundFromAudit(entries: readonly AuditEntryDto[]): RoundState {
  let start = -1;
  entries.forEach((e, i) => {
    if (e.action === 'submit') start = i;
  });
  const open = start < 0 ? [] : entries.slice(start + 1);
  let editorApproved = false;
  let colourSignedOff = false;
  for (const e of open) {
    if (e.action === 'approve') editorApproved = true;
    if (e.action === 'colour_signoff') colourSignedOff = true;
    if (e.action === 'request_changes') {
      editorApproved = false;
      colourSignedOff = false;
    }
  }
  return { editorApproved, colourSignedOff };
}
