import { Global, Module } from '@nestjs/common';
import { Mailer } from './mailer';
import { SmtpMailer } from './smtp-mailer';
import { MailHealthProbe } from './mail-health';

@Global()
@Module({
  providers: [{ provide: Mailer, useClass: SmtpMailer }, MailHealthProbe],
  exports: [Mailer, MailHealthProbe],
})
export class MailModule {}
