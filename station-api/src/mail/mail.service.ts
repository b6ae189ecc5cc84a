import { EntityManager } from '@mikro-orm/sqlite';
import { BeforeApplicationShutdown, Injectable, Logger, OnApplicationBootstrap, OnModuleDestroy } from '@nestjs/common';
import { createTransport, type Transporter } from 'nodemailer';
import { loadMailSettings, type MailSettings } from '../config/mail.config';
import { MailCaptureServer } from './mail-capture.server';
import { OutboxMessage, OutboxStatus } from './outbox-message.entity';

export interface MailToSend {
  to: string;
  subject: string;
  body: string;
  alertId?: number;
}

/** Longest SMTP error kept per message */
const MAX_ERROR_CHARS = 500;
/** Connection and greeting timeouts, ms: a mail server that does not answer must not hold messages for minutes */
const SMTP_TIMEOUT_MS = 10_000;

/**
 * Sends e-mail through nodemailer over SMTP and records each message in the outbox (queued → sent, or failed
 * with the server's error after MAIL_ATTEMPTS tries, the wait doubling each time). In the demo and in tests
 * (MAIL_CAPTURE) it first starts the local capture server and sends there.
 */
@Injectable()
export class MailService implements OnApplicationBootstrap, BeforeApplicationShutdown, OnModuleDestroy {
  private readonly logger = new Logger(MailService.name);
  readonly settings: MailSettings = loadMailSettings();
  readonly capture = new MailCaptureServer();
  private transporter?: Transporter;
  private readonly inFlight = new Set<Promise<void>>();
  private closing = false;
  /** Waits between attempts; shutdown ends them at once (the next attempt is then the last) */
  private readonly sleepers = new Set<() => void>();

  constructor(private readonly em: EntityManager) {}

  async onApplicationBootstrap(): Promise<void> {
    if (this.settings.capture) {
      let port: number;
      try {
        port = await this.capture.start(this.settings.capturePort);
      } catch (err) {
        // a demo must not fail to start because another program holds the port: any free port does as well
        if ((err as NodeJS.ErrnoException).code !== 'EADDRINUSE' || this.settings.capturePort === 0) throw err;
        port = await this.capture.start(0);
        this.logger.warn(`Port ${this.settings.capturePort} is taken (MAIL_CAPTURE_PORT); the local mail capture uses port ${port} instead`);
      }
      this.logger.log(`Local mail capture listening on 127.0.0.1:${port}; alerts are kept there, none leave this computer`);
      this.transporter = this.transport('127.0.0.1', port);
    } else if (this.settings.smtpHost) {
      this.transporter = this.transport(this.settings.smtpHost, this.settings.smtpPort);
    }
    // messages still queued when the server last stopped
    const pending = await this.em.fork().find(OutboxMessage, { status: OutboxStatus.Queued }, { fields: ['id'] });
    for (const m of pending) this.deliverLater(m.id);
  }

  async beforeApplicationShutdown(): Promise<void> {
    this.closing = true;
    for (const wake of [...this.sleepers]) wake();
    await this.idle();
  }

  async onModuleDestroy(): Promise<void> {
    this.transporter?.close();
    await this.capture.stop();
  }

  /** Resolves once no delivery is under way. */
  async idle(): Promise<void> {
    while (this.inFlight.size > 0) await Promise.allSettled([...this.inFlight]);
  }

  /** The address of a user (users have no e-mail field: `<username>@MAIL_DOMAIN`). */
  addressOf(username: string): string {
    return `${username}@${this.settings.domain}`;
  }

  /**
   * Adds the messages to the outbox in the caller's unit of work (written by its flush, with the change they
   * announce). Call {@link deliverQueued} after that flush.
   */
  queue(em: EntityManager, messages: MailToSend[]): OutboxMessage[] {
    return messages.map((m) =>
      em.create(OutboxMessage, { toAddress: m.to, subject: m.subject, body: m.body, alertId: m.alertId, status: OutboxStatus.Queued, attempts: 0 }, { partial: true }),
    );
  }

  /** Starts delivering stored messages in the background (never throws; the outbox shows the outcome). */
  deliverQueued(messages: OutboxMessage[]): void {
    for (const m of messages) this.deliverLater(m.id);
  }

  private deliverLater(id: number): void {
    const work = this.deliver(id).catch((err: Error) => this.logger.error(`Outbox message ${id}: ${err.message}`));
    this.inFlight.add(work);
    void work.finally(() => this.inFlight.delete(work));
  }

  private async deliver(id: number): Promise<void> {
    for (let attempt = 1; ; attempt++) {
      const em = this.em.fork();
      const m = await em.findOne(OutboxMessage, { id });
      if (!m || m.status !== OutboxStatus.Queued) return;
      m.attempts += 1;
      m.lastAttemptAt = new Date();
      try {
        if (!this.transporter) throw new Error('No mail server is set up: set SMTP_HOST (and SMTP_PORT), or MAIL_CAPTURE=1 for the local capture server');
        await this.transporter.sendMail({ from: this.settings.from, to: m.toAddress, subject: m.subject, text: m.body });
        m.status = OutboxStatus.Sent;
        m.sentAt = new Date();
        m.lastError = undefined;
        await em.flush();
        return;
      } catch (err) {
        m.lastError = String((err as Error).message ?? err).slice(0, MAX_ERROR_CHARS);
        const last = attempt >= this.settings.attempts || this.closing || !this.transporter;
        if (last) m.status = OutboxStatus.Failed;
        await em.flush();
        if (last) {
          this.logger.warn(`E-mail to ${m.toAddress} failed after ${m.attempts} attempt(s): ${m.lastError}`);
          return;
        }
        await this.sleep(this.settings.retryDelayMs * 2 ** (attempt - 1));
      }
    }
  }

  /** Newest first. */
  async list(limit = 100): Promise<OutboxMessage[]> {
    return this.em.fork().find(OutboxMessage, {}, { orderBy: { id: 'desc' }, limit });
  }

  private sleep(ms: number): Promise<void> {
    return new Promise((resolve) => {
      const wake = () => {
        clearTimeout(timer);
        this.sleepers.delete(wake);
        resolve();
      };
      const timer = setTimeout(wake, ms);
      this.sleepers.add(wake);
    });
  }

  private transport(host: string, port: number): Transporter {
    return createTransport({
      host,
      port,
      secure: false,
      // the local capture server has no certificate; an outside server upgrades with STARTTLS when it offers it
      ignoreTLS: host === '127.0.0.1' && this.settings.capture,
      connectionTimeout: SMTP_TIMEOUT_MS,
      greetingTimeout: SMTP_TIMEOUT_MS,
      socketTimeout: SMTP_TIMEOUT_MS,
    });
  }
}
