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
};

export function auditWords(action: string): string {
  return AUDIT_WORDS[action] ?? action.replace(/_/g, ' ');
}
