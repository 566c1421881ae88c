/** "45 min", "3 h", "2 d": how long a proof has waited, rounded down to a whole unit. */
export function formatAge(hours: number): string {
  if (!Number.isFinite(hours) || hours < 0) return '—';
  if (hours < 1) return `${Math.max(1, Math.floor(hours * 60))} min`;
  if (hours < 48) return `${Math.floor(hours)} h`;
  return `${Math.floor(hours / 24)} d`;
}

const AUDIT_WORDS: Record<string, string> = {
  create: 'created the figure',
  submit: 'submitted for review',
  request_changes: 'requested changes',
  revise: 'revised',
  approve: 'approved',
  colour_signoff: 'signed off the colour',
  release: 'released',
  comment: 'commented',
  rerender: 're-rendered',
  colour_override: 'overrode the colour checks',
  // People and publications (admin audit).
  user_create: 'created the account',
  user_invite: 'invited',
  invite_resend: 'sent a new invitation',
  user_rename: 'renamed',
  user_role: 'changed the role',
  user_deactivate: 'deactivated the account',
  user_reactivate: 'reactivated the account',
  reset_sent: 'sent a password reset',
  reset_requested: 'asked for a password reset',
  password_set: 'chose a password',
  password_reset: 'changed the password',
  publication_create: 'created the publication',
  publication_edit: 'edited the publication',
  member_add: 'added a member',
  member_role: "changed a member's role",
  member_remove: 'removed a member',
  house_style_pin: 'pinned a house style',
};

export function auditWords(action: string): string {
  return AUDIT_WORDS[action] ?? action.replace(/_/g, ' ');
}
