import { Logger } from '@nestjs/common';
import { createTransport, type Transporter } from 'nodemailer';
import type { MailNoticeJob } from '@psiform/contracts';

/** Port for sending one notice; only SmtpMailSender talks SMTP. Resolves to the accepted recipients. */
export abstract class MailSender {
  abstract send(mail: MailNoticeJob): Promise<string[]>;
  /** Releases connections (called on worker shutdown). */
  close(): void {}
}

export class SmtpMailSender extends MailSender {
  private readonly transport: Transporter;

  constructor(smtp: { url: string; from: string }, private readonly from = smtp.from) {
    super();
    const url = new URL(smtp.url);
    // Stack notes: the local SMTP fake has STARTTLS off, so plain SMTP with ignoreTLS.
    this.transport = createTransport({
      host: url.hostname,
      port: Number(url.port || 25),
      secure: false,
      ignoreTLS: true,
      auth: url.username ? { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) } : undefined,
      connectionTimeout: 3000,
      greetingTimeout: 3000,
      socketTimeout: 10000,
    });
  }

  async send(mail: MailNoticeJob): Promise<string[]> {
    const info = await this.transport.sendMail({ from: this.from, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html });
    return (info.accepted as (string | { address: string })[]).map((a) => (typeof a === 'string' ? a : a.address));
  }

  override close(): void {
    this.transport.close();
  }
}

/** Logged when SMTP_URL is not set: this worker then registers no mail processor (returns null for the provider). */
export function warnNoSmtp(): null {
  new Logger('Mail').warn('SMTP_URL is not set: this worker sends no mail; notices stay queued for a worker that has SMTP_URL');
  return null;
}
