import { FIGURE_STATUSES, REVIEW_ACTIONS, type FigureStatus, type ReviewAction } from '@psiform/contracts';
import { approvalOutcome, assertTransition, isEditable, REVIEW_TRANSITIONS, TransitionConflict } from './review-transitions';

describe('review transition table', () => {
  // The allowed (action, from) pairs, written out independently of the table.
  const allowed: Record<ReviewAction, FigureStatus[]> = {
    submit: ['draft', 'changes_requested'],
    request_changes: ['in_review'],
    revise: ['draft', 'changes_requested'],
    approve: ['in_review'],
    colour_signoff: ['in_review'],
    release: ['approved'],
  };

  it.each(REVIEW_ACTIONS.flatMap((a) => FIGURE_STATUSES.map((s) => [a, s] as const)))('%s from %s', (action, status) => {
    if (allowed[action].includes(status)) expect(assertTransition(action, status)).toBe(REVIEW_TRANSITIONS[action]);
    else expect(() => assertTransition(action, status)).toThrow(TransitionConflict);
  });

  it('names the current and the allowed states', () => {
    expect(() => assertTransition('approve', 'draft')).toThrow('cannot approve a figure that is draft: allowed only from in_review');
    expect(() => assertTransition('release', 'in_review')).toThrow('allowed only from approved');
    expect(() => assertTransition('submit', 'approved')).toThrow('allowed only from draft or changes_requested');
  });

  it('targets: submit -> in_review, request_changes -> changes_requested, revise -> draft, approve -> approved, release -> released', () => {
    expect(REVIEW_TRANSITIONS.submit.to).toBe('in_review');
    expect(REVIEW_TRANSITIONS.request_changes.to).toBe('changes_requested');
    expect(REVIEW_TRANSITIONS.revise.to).toBe('draft');
    expect(REVIEW_TRANSITIONS.approve.to).toBe('approved');
    expect(REVIEW_TRANSITIONS.release.to).toBe('released');
  });

  it('roles: only editors approve or request changes; art directors sign off colour; illustrators submit', () => {
    expect(REVIEW_TRANSITIONS.approve.roles).toEqual(['editor']);
    expect(REVIEW_TRANSITIONS.request_changes.roles).toEqual(['editor']);
    expect(REVIEW_TRANSITIONS.colour_signoff.roles).toEqual(['art_director']);
    expect(REVIEW_TRANSITIONS.submit.roles).toContain('illustrator');
    expect(REVIEW_TRANSITIONS.approve.roles).not.toContain('illustrator');
  });

  it('only draft and changes_requested figures are editable', () => {
    expect(FIGURE_STATUSES.filter(isEditable)).toEqual(['draft', 'changes_requested']);
  });
});

describe('approvalOutcome', () => {
  it('without a sign-off rule the editor approval alone approves', () => {
    expect(approvalOutcome({ requireColourSignOff: false, editorApproved: true, colourSignedOff: false })).toEqual({ status: 'approved', missing: [] });
  });
  it('with the rule both are needed, in either order', () => {
    expect(approvalOutcome({ requireColourSignOff: true, editorApproved: true, colourSignedOff: false })).toEqual({ status: 'in_review', missing: ['colour_signoff'] });
    expect(approvalOutcome({ requireColourSignOff: true, editorApproved: false, colourSignedOff: true })).toEqual({ status: 'in_review', missing: ['editor_approval'] });
    expect(approvalOutcome({ requireColourSignOff: true, editorApproved: true, colourSignedOff: true })).toEqual({ status: 'approved', missing: [] });
  });
  it('a colour sign-off never replaces the editor', () => {
    expect(approvalOutcome({ requireColourSignOff: false, editorApproved: false, colourSignedOff: true }).status).toBe('in_review');
  });
});
