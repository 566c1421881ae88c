import { Inject, Injectable, type OnApplicationShutdown } from '@nestjs/common';
import { createTransport, type Transporter } from 'nodemailer';
import { APP_CONFIG } from '../../config/config.tokens';
import type { SmtpConfig } from '../../config/config';
import { Mailer, type OutgoingMail } from './mailer';

/** SMTP adapter of both apps; the worker builds one directly from its own config (`new SmtpMailer({ smtp })`). */
@Injectable()
export class SmtpMailer extends Mailer implements OnApplicationShutdown {
  private readonly transport: Transporter;
  private readonly from: string;

  constructor(@Inject(APP_CONFIG) config: { smtp: SmtpConfig }) {
    super();
    const url = new URL(config.smtp.url);
    this.from = config.smtp.from;
    // Stack notes: the SMTP fake has STARTTLS off, so plain SMTP with ignoreTLS. Short connect/greeting timeouts so a
    // mail server that is down fails a try quickly (the notice is retried); a slow transfer gets 10 s.
    this.transport = createTransport({
      host: url.hostname,
      port: Number(url.port || 25),
      secure: false,
      ignoreTLS: true,
      auth: url.username ? { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) } : undefined,
      connectionTimeout: 2000,
      greetingTimeout: 2000,
      socketTimeout: 10000,
    });
  }

  async verify(): Promise<void> {
    await this.transport.verify();
  }

  async send(mail: OutgoingMail): Promise<string[]> {
    const info = await this.transport.sendMail({ from: this.from, to: mail.to, subject: mail.subject, text: mail.text, ...(mail.html ? { html: mail.html } : {}) });
    return (info.accepted as (string | { address: string })[]).map((a) => (typeof a === 'string' ? a : a.address));
  }

  override close(): void {
    this.transport.close();
  }

  onApplicationShutdown(): void {
    this.close();
  }
}
