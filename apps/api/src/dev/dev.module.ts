import { Module } from '@nestjs/common';
import { DevController } from './dev.controller';
import { FileOutboxReader, OutboxReader } from './outbox-reader';

@Module({
  controllers: [DevController],
  providers: [{ provide: OutboxReader, useClass: FileOutboxReader }],
})
export class DevModule {}
