import type { FixtureSimulator } from './fixture-simulator';

/** Longest run of bytes without a newline the session keeps before discarding it (a runaway sender). */
export const MAX_PENDING_CHARS = 65_536;

/**
 * Turns a byte stream into command lines for a simulator and sends its replies back, each followed by
 * `\n`, in command order. Used by the in-process binding and by the standalone fixture on a real port.
 */
export class LineSession {
  private buffer = '';
  private closed = false;
  private tail: Promise<void> = Promise.resolve();

  /**
   * @param simulator the fixture that answers
   * @param send writes reply text to the link; errors thrown here are ignored (the link is going away)
   */
  constructor(
    private readonly simulator: FixtureSimulator,
    private readonly send: (text: string) => void | Promise<void>,
  ) {}

  /** Bytes received from the link. Lines end with `\n`; a `\r` before it is dropped. */
  feed(chunk: Buffer | string): void {
    if (this.closed) return;
    // latin1 maps bytes one to one, so a multi-byte character split across chunks cannot corrupt framing;
    // the simulator refuses non-ASCII lines with a clear error
    this.buffer += typeof chunk === 'string' ? chunk : chunk.toString('latin1');
    let newline = this.buffer.indexOf('\n');
    while (newline >= 0) {
      const line = this.buffer.slice(0, newline);
      this.buffer = this.buffer.slice(newline + 1);
      this.dispatch(line);
      newline = this.buffer.indexOf('\n');
    }
    if (this.buffer.length > MAX_PENDING_CHARS) {
      this.simulator.reportError(-223, `${this.buffer.length} characters arrived without a newline; they were discarded`);
      this.buffer = '';
    }
  }

  /** Resolves once every line received so far has been answered. */
  idle(): Promise<void> {
    return this.tail;
  }

  /** The link is gone: stop answering and put the fixture in its safe state. */
  close(reason: string): void {
    if (this.closed) return;
    this.closed = true;
    this.buffer = '';
    this.simulator.enterSafeState(reason);
  }

  get isClosed(): boolean {
    return this.closed;
  }

  private dispatch(line: string): void {
    const reply = this.simulator.handleLine(line);
    this.tail = this.tail.then(async () => {
      const text = await reply;
      if (text === null || this.closed) return;
      try {
        await this.send(`${text}\n`);
      } catch {
        // the link closed under us; the owner's close handler makes the fixture safe
      }
    });
  }
}
