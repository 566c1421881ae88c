import type { OnApplicationShutdown } from '@nestjs/common';
import { MAIL_NOTICE_JOB, QUEUES, type MailNoticeJob } from '@psiform/contracts';
import type { JobProcessor, ProcessorJob } from '../queues/job-processor';
import { MailSender } from './mail-sender';

/**
 * Sends the api's review notices (queue QUEUES.mail). A failure throws, and BullMQ retries with the
 * job's backoff (the api queues 8 attempts, exponential from 1 s), so a mail server down for a moment
 * delays a notice but does not lose it.
 */
export class MailNoticeProcessor implements JobProcessor<MailNoticeJob, { accepted: string[] }>, OnApplicationShutdown {
  readonly queue = QUEUES.mail;

  constructor(private readonly sender: MailSender) {}

  async process(job: ProcessorJob<MailNoticeJob>): Promise<{ accepted: string[] }> {
    if (job.name !== MAIL_NOTICE_JOB) throw new Error(`unknown job name "${job.name}" on queue ${this.queue}`);
    const m = job.data;
    if (!m || !Array.isArray(m.to) || m.to.length === 0 || typeof m.subject !== 'string' || typeof m.text !== 'string' || typeof m.html !== 'string') {
      throw new Error('malformed mail notice: to[], subject, text and html are required');
    }
    const accepted = await this.sender.send(m);
    if (accepted.length === 0) throw new Error(`the mail server accepted none of ${m.to.join(', ')}`);
    return { accepted };
  }

  /** After WorkerHost closed the BullMQ workers (beforeApplicationShutdown). */
  onApplicationShutdown(): void {
    this.sender.close();
  }
}
