import { LINK_TTL_HOURS, type LinkPurpose, type MailNoticeJob } from '@psiform/contracts';

/**
 * Plain-text and HTML notices (every mail has both parts; the HTML part says the same as the text one). Subject
 * and body name the figure by its title; proof notices carry a link straight to the proof page. Our own wording.
 */
export interface NoticeFigure {
  title: string;
  publicationTitle: string;
  versionNumber: number;
  /** Absolute link to the proof page (PUBLIC_BASE_URL + /figures/:id/proof). */
  proofUrl: string;
}

export interface MailLink {
  url: string;
  label: string;
}

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

/** Our accent (deep verdigris) and paper colours, as in the client's styles.css. */
const ACCENT = '#1f5e5b';

export function composeMail(to: string[], subject: string, lines: string[], link?: MailLink, after: string[] = []): MailNoticeJob {
  const textParts = [...lines, ...(link ? [`${link.label}: ${link.url}`] : []), ...after];
  const text = `${textParts.join('\n\n')}\n\n-- Psiform\n`;
  const para = (l: string) => `<p style="margin:0 0 14px">${esc(l).replace(/\n/g, '<br>')}</p>`;
  const button = link
    ? `<p style="margin:20px 0"><a href="${esc(link.url)}" style="background:${ACCENT};color:#ffffff;padding:10px 16px;border-radius:3px;text-decoration:none;font-weight:bold">${esc(link.label)}</a></p>` +
      `<p style="margin:0 0 14px;font-size:13px;color:#5b5750">Or paste this address into your browser:<br><span style="word-break:break-all">${esc(link.url)}</span></p>`
    : '';
  const html =
    `<!doctype html><html><head><meta charset="utf-8"><title>${esc(subject)}</title></head>` +
    `<body style="margin:0;padding:24px;background:#f8f5ee;color:#1f1d1a;font-family:Lato,Helvetica,Arial,sans-serif;font-size:15px;line-height:1.5">` +
    `<div style="max-width:560px;margin:0 auto;background:#ffffff;padding:24px;border:1px solid #e4ded2">` +
    `${lines.map(para).join('')}${button}${after.map(para).join('')}` +
    `<p style="margin:24px 0 0;color:#5b5750;font-size:13px">Psiform</p></div></body></html>`;
  return { to, subject, text, html };
}

export function submittedNotice(to: string[], f: NoticeFigure, by: string): MailNoticeJob {
  return composeMail(
    to,
    `Proof ready for review: "${f.title}"`,
    [`${by} submitted version ${f.versionNumber} of "${f.title}" (${f.publicationTitle}) for review.`, 'It is waiting on your review desk.'],
    { url: f.proofUrl, label: 'Open the proof' },
  );
}

export function changesRequestedNotice(to: string[], f: NoticeFigure, by: string, note: string): MailNoticeJob {
  return composeMail(to, `Changes requested on "${f.title}"`, [`${by} asked for changes to version ${f.versionNumber} of "${f.title}" (${f.publicationTitle}):`, note], {
    url: f.proofUrl,
    label: 'Open the proof',
  });
}

export function approvedNotice(to: string[], f: NoticeFigure, by: string, note?: string | null): MailNoticeJob {
  return composeMail(
    to,
    `Approved: "${f.title}"`,
    [`Version ${f.versionNumber} of "${f.title}" (${f.publicationTitle}) was approved${by ? ` by ${by}` : ''}.`, ...(note ? [note] : [])],
    { url: f.proofUrl, label: 'Open the proof' },
  );
}

const hours = (h: number) => (h % 24 === 0 ? `${h / 24} day${h === 24 ? '' : 's'}` : `${h} hour${h === 1 ? '' : 's'}`);

/** Invitation or password reset: a one-time link that sets the password. */
export function linkMail(purpose: LinkPurpose, to: string, p: { displayName: string; invitedBy?: string | null; url: string }): MailNoticeJob {
  const ttl = hours(LINK_TTL_HOURS[purpose]);
  if (purpose === 'invite') {
    return composeMail(
      [to],
      'You are invited to Psiform',
      [
        `Hello ${p.displayName},`,
        `${p.invitedBy ? `${p.invitedBy} has` : 'An administrator has'} made you an account on Psiform, where the figures of your publications are made and reviewed.`,
        'Choose a password to start; then sign in with this address.',
      ],
      { url: p.url, label: 'Choose your password' },
      [`The link works once and for ${ttl}. If it has expired, ask your administrator to send a new invitation.`],
    );
  }
  return composeMail(
    [to],
    'Reset your Psiform password',
    [`Hello ${p.displayName},`, 'Someone asked to reset the password of your Psiform account. If it was you, choose a new password with the link below.'],
    { url: p.url, label: 'Choose a new password' },
    [`The link works once and for ${ttl}. If you did not ask for it, you can ignore this message: your password stays as it is.`],
  );
}

/** The proof page of a figure under the configured PUBLIC_BASE_URL: where every proof notice links to. */
export function proofUrl(publicBaseUrl: string, figureId: string): string {
  return `${publicBaseUrl}/figures/${encodeURIComponent(figureId)}/proof`;
}
