export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
}

/** Port for outgoing mail. Only SmtpMailer talks SMTP. */
export abstract class Mailer {
  /** Resolves when the SMTP server answers. */
  abstract verify(): Promise<void>;
  /** Returns the recipients the server accepted. */
  abstract send(mail: OutgoingMail): Promise<string[]>;
}
