import { Controller, Get, Inject, NotFoundException } from '@nestjs/common';
import type { OutboxMessageDto } from '@psiform/contracts';
import { Roles } from '../auth/auth.decorators';
import { APP_CONFIG, type AppConfig } from '@psiform/server';
import { OutboxReader, parseOutbox } from './outbox-reader';

/** Development aids; they exist only while the local fakes are in use. */
@Controller('dev')
export class DevController {
  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    private readonly outbox: OutboxReader,
  ) {}

  /** Messages the local mail fake received, newest first; 404 unless MAIL_OUTBOX_FILE is set. */
  @Get('outbox')
  @Roles('admin')
  async list(): Promise<OutboxMessageDto[]> {
    const file = this.config.smtp.outboxFile;
    if (!file) throw new NotFoundException('no local mail outbox: MAIL_OUTBOX_FILE is not set');
    return parseOutbox(await this.outbox.read(file));
  }
}
