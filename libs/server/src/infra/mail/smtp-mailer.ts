import { Inject, Injectable, type OnApplicationShutdown } from '@nestjs/common';
import { createTransport, type Transporter } from 'nodemailer';
import { APP_CONFIG } from '../../config/config.tokens';
import type { AppConfig } from '../../config/config';
import { Mailer, type OutgoingMail } from './mailer';

@Injectable()
export class SmtpMailer extends Mailer implements OnApplicationShutdown {
  private readonly transport: Transporter;
  private readonly from: string;

  constructor(@Inject(APP_CONFIG) config: AppConfig) {
    super();
    const url = new URL(config.smtp.url);
    this.from = config.smtp.from;
    // Stack notes: the SMTP fake has STARTTLS off, so plain SMTP with ignoreTLS.
    this.transport = createTransport({
      host: url.hostname,
      port: Number(url.port || 25),
      secure: false,
      ignoreTLS: true,
      auth: url.username ? { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) } : undefined,
      connectionTimeout: 2000,
      greetingTimeout: 2000,
      socketTimeout: 5000,
    });
  }

  async verify(): Promise<void> {
    await this.transport.verify();
  }

  async send(mail: OutgoingMail): Promise<string[]> {
    const info = await this.transport.sendMail({ from: this.from, to: mail.to, subject: mail.subject, text: mail.text });
    return (info.accepted as (string | { address: string })[]).map((a) => (typeof a === 'string' ? a : a.address));
  }

  onApplicationShutdown(): void {
    this.transport.close();
  }
}
