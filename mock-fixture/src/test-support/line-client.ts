import { ReadlineParser } from 'serialport';
import type { Duplex } from 'node:stream';

/**
 * Test helper: a minimal line client over any serialport stream (mock or real). Not exported from the
 * package; the station's own client lives in station-api.
 */
export class LineClient {
  private readonly lines: string[] = [];
  private waiters: Array<(line: string) => void> = [];

  constructor(private readonly port: Duplex) {
    const parser = port.pipe(new ReadlineParser({ delimiter: '\n' }));
    parser.on('data', (line: string) => {
      const waiter = this.waiters.shift();
      if (waiter) waiter(line);
      else this.lines.push(line);
    });
  }

  write(line: string): Promise<void> {
    return new Promise((resolve, reject) => this.port.write(`${line}\n`, (error: Error | null | undefined) => (error ? reject(error) : resolve())));
  }

  /** The next received line, or a rejection after timeoutMs. */
  next(timeoutMs = 2000): Promise<string> {
    const queued = this.lines.shift();
    if (queued !== undefined) return Promise.resolve(queued);
    return new Promise((resolve, reject) => {
      const timer = setTimeout(() => {
        this.waiters = this.waiters.filter((w) => w !== waiter);
        reject(new Error(`no reply within ${timeoutMs} ms`));
      }, timeoutMs);
      const waiter = (line: string) => {
        clearTimeout(timer);
        resolve(line);
      };
      this.waiters.push(waiter);
    });
  }

  async query(line: string, timeoutMs?: number): Promise<string> {
    await this.write(line);
    return this.next(timeoutMs);
  }
}
