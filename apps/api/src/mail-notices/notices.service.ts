import { Inject, Injectable, Logger } from '@nestjs/common';
import type { MailNoticeJob } from '@psiform/contracts';
import { APP_CONFIG, type AppConfig } from '@psiform/server';
import { MailQueue } from './mail-queue';

/**
 * Queues notices after the change they announce is committed. A queue that is unreachable is logged, not
 * fatal: the review step itself has happened and its audit entry is the record.
 */
@Injectable()
export class NoticesService {
  private readonly log = new Logger('Notices');
  constructor(
    private readonly queue: MailQueue,
    @Inject(APP_CONFIG) private readonly config: Pick<AppConfig, 'http'>,
  ) {}

  /** The proof page of a figure under the configured PUBLIC_BASE_URL: where every proof notice links to. */
  proofUrl(figureId: string): string {
    return `${this.config.http.publicBaseUrl}/figures/${encodeURIComponent(figureId)}/proof`;
  }

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
