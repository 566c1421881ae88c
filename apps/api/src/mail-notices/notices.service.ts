import { Injectable, Logger } from '@nestjs/common';
import type { MailNoticeJob } from '@psiform/contracts';
import { MailQueue } from './mail-queue';

/**
 * Queues notices after the change they announce is committed. A queue that is unreachable is logged, not
 * fatal: the review step itself has happened and its audit entry is the record.
 */
@Injectable()
export class NoticesService {
  private readonly log = new Logger('Notices');
  constructor(private readonly queue: MailQueue) {}

  async send(notice: MailNoticeJob): Promise<boolean> {
    if (notice.to.length === 0) return false;
    try {
      await this.queue.add(notice);
      return true;
    } catch (err) {
      this.log.warn(`notice "${notice.subject}" not queued: ${(err as Error).message}`);
      return false;
    }
  }
}
