import { Module } from '@nestjs/common';
import { MailQueue, BullMailQueue } from './mail-queue';
import { NoticesService } from './notices.service';

@Module({
  providers: [{ provide: MailQueue, useClass: BullMailQueue }, NoticesService],
  exports: [NoticesService],
})
export class MailNoticesModule {}
