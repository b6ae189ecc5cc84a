import { Module } from '@nestjs/common';
import { MailService } from './mail.service';

/** Outgoing e-mail (nodemailer over SMTP), its outbox, and the local capture server of the demo and tests. */
@Module({
  providers: [MailService],
  exports: [MailService],
})
export class MailModule {}
