import type { MailNoticeJob } from '@psiform/contracts';

/** Plain-text and HTML notices; subject and body name the figure by its title. Our own wording. */
export interface NoticeFigure {
  title: string;
  publicationTitle: string;
  versionNumber: number;
}

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

function build(to: string[], subject: string, lines: string[]): MailNoticeJob {
  const text = `${lines.join('\n\n')}\n\n-- Psiform\n`;
  const html = `<!doctype html><html><body style="font-family: Lato, sans-serif">${lines.map((l) => `<p>${esc(l).replace(/\n/g, '<br>')}</p>`).join('')}<p style="color:#666">Psiform</p></body></html>`;
  return { to, subject, text, html };
}

export function submittedNotice(to: string[], f: NoticeFigure, by: string): MailNoticeJob {
  return build(to, `Proof ready for review: "${f.title}"`, [
    `${by} submitted version ${f.versionNumber} of "${f.title}" (${f.publicationTitle}) for review.`,
    'It is waiting on your review desk.',
  ]);
}

export function changesRequestedNotice(to: string[], f: NoticeFigure, by: string, note: string): MailNoticeJob {
  return build(to, `Changes requested on "${f.title}"`, [
    `${by} asked for changes to version ${f.versionNumber} of "${f.title}" (${f.publicationTitle}):`,
    note,
  ]);
}

export function approvedNotice(to: string[], f: NoticeFigure, by: string, note?: string | null): MailNoticeJob {
  return build(to, `Approved: "${f.title}"`, [
    `Version ${f.versionNumber} of "${f.title}" (${f.publicationTitle}) was approved${by ? ` by ${by}` : ''}.`,
    ...(note ? [note] : []),
  ]);
}
