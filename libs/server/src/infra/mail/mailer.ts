export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
}

/** Port for outgoing mail (api: health and account mails; worker: review notices). Only SmtpMailer talks SMTP. */
export abstract class Mailer {
  /** Resolves when the SMTP server answers. */
  abstract verify(): Promise<void>;
  /** Returns the recipients the server accepted. */
  abstract send(mail: OutgoingMail): Promise<string[]>;
  /** Releases connections (shutdown). */
  close(): void {}
}
