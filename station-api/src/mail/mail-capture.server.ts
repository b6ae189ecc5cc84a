import { Logger } from '@nestjs/common';
import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import { parseSimpleMessage, type ReceivedMessage } from './received-message';

/** Messages kept in memory; older ones are dropped (the outbox table is the lasting record). */
const KEEP_MESSAGES = 500;
/** Largest message accepted, bytes: alerts are a few hundred bytes */
const MAX_MESSAGE_BYTES = 1_000_000;

/**
 * The small SMTP server the app starts for itself in the demo and in tests, on 127.0.0.1 only: it accepts
 * every message without authentication and keeps it in memory, so nothing leaves the computer and tests can
 * read what was "sent".
 */
export class MailCaptureServer {
  private readonly logger = new Logger(MailCaptureServer.name);
  private readonly messages: ReceivedMessage[] = [];
  private readonly waiters = new Set<() => void>();
  private server?: SMTPServer;
  private boundPort = 0;

  /** Starts listening; resolves with the port (the given one, or the one the OS chose for 0). */
  async start(port: number): Promise<number> {
    const server = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS', 'AUTH'],
      size: MAX_MESSAGE_BYTES,
      logger: false,
      banner: 'Railwright local mail capture',
      onData: (stream, session, callback) => {
        const chunks: Buffer[] = [];
        stream.on('data', (c: Buffer) => chunks.push(c));
        stream.on('end', () => {
          const { subject, text } = parseSimpleMessage(Buffer.concat(chunks).toString('utf8'));
          const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : '';
          this.keep({ from, to: session.envelope.rcptTo.map((r) => r.address), subject, text, receivedAt: new Date() });
          callback();
        });
      },
    });
    server.on('error', (err) => this.logger.warn(`Local mail capture: ${err.message}`));
    await new Promise<void>((resolve, reject) => {
      server.server.once('error', reject);
      server.listen(port, '127.0.0.1', () => {
        server.server.off('error', reject);
        resolve();
      });
    });
    this.server = server;
    this.boundPort = (server.server.address() as AddressInfo).port;
    return this.boundPort;
  }

  get port(): number {
    return this.boundPort;
  }

  /** Every message received so far, oldest first. */
  received(): ReceivedMessage[] {
    return [...this.messages];
  }

  /** Resolves once a message matching `match` has arrived (already or later). */
  waitFor(match: (m: ReceivedMessage) => boolean, timeoutMs = 10_000): Promise<ReceivedMessage> {
    const found = this.messages.find(match);
    if (found) return Promise.resolve(found);
    return new Promise((resolve, reject) => {
      const check = () => {
        const m = this.messages.find(match);
        if (!m) return;
        clearTimeout(timer);
        this.waiters.delete(check);
        resolve(m);
      };
      const timer = setTimeout(() => {
        this.waiters.delete(check);
        reject(new Error(`no matching message arrived within ${timeoutMs} ms (${this.messages.length} received)`));
      }, timeoutMs);
      this.waiters.add(check);
    });
  }

  async stop(): Promise<void> {
    const server = this.server;
    this.server = undefined;
    if (server) await new Promise<void>((resolve) => server.close(() => resolve()));
  }

  private keep(m: ReceivedMessage): void {
    this.messages.push(m);
    if (this.messages.length > KEEP_MESSAGES) this.messages.splice(0, this.messages.length - KEEP_MESSAGES);
    for (const w of [...this.waiters]) w();
  }
}
