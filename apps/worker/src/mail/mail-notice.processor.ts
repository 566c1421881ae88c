import { Logger } from '@nestjs/common';
import type { MailNoticeJob } from '@psiform/contracts';
import type { Mailer, PlainJobHandler } from '@psiform/server';

/**
 * Sends the api's review notices (job "notice" on QUEUES.mail). A failure throws and the runner's retries take over
 * (NOTICE_JOB_OPTIONS: 1 s doubling to a try a minute, about an hour in all), so a mail server that is down delays a
 * notice but does not lose it; the outbox row marks it done once sent, so a re-delivery does not send it twice.
 * Without SMTP_URL (`mailer` null) this worker leaves the mail queue alone and notices wait for one that has it.
 */
export class MailNoticeProcessor implements PlainJobHandler<'notice'> {
  readonly kind = 'plain';
  readonly name = 'notice';
  readonly enabled: boolean;

  constructor(private readonly mailer: Mailer | null) {
    this.enabled = mailer !== null;
    if (!mailer) new Logger('Mail').warn('SMTP_URL is not set: this worker sends no mail; notices stay queued for a worker that has SMTP_URL');
  }

  async run(m: MailNoticeJob): Promise<{ accepted: string[] }> {
    if (!this.mailer) throw new Error('this worker has no SMTP_URL');
    const accepted = await this.mailer.send(m);
    if (accepted.length === 0) throw new Error(`the mail server accepted none of ${m.to.join(', ')}`);
    return { accepted };
  }
}
