import { act } from '@testing-library/react';

export interface FakeSocketOptions<Sent> {
  /** What `sent` keeps of each message the screen emits */
  record: (event: string, body: unknown) => Sent;
  /** The room the server names when it acknowledges a join */
  ackRoom: (body: unknown) => string;
}

/**
 * A stand-in for the socket.io client (mock `connectLive` of `@/lib/socket` with it): records what the
 * screen sends, acknowledges joins, and lets the test play server events with `fire`.
 */
export class FakeSocket<Sent> {
  handlers = new Map<string, ((...args: unknown[]) => void)[]>();
  sent: Sent[] = [];
  readonly #options: FakeSocketOptions<Sent>;

  constructor(options: FakeSocketOptions<Sent>) {
    this.#options = options;
  }
  on(event: string, fn: (...args: unknown[]) => void) {
    this.handlers.set(event, [...(this.handlers.get(event) ?? []), fn]);
    return this;
  }
  emit(event: string, body: unknown, ack?: (a: unknown) => void) {
    this.sent.push(this.#options.record(event, body));
    ack?.({ ok: true, room: this.#options.ackRoom(body) });
    return this;
  }
  fire(event: string, ...args: unknown[]) {
    for (const fn of this.handlers.get(event) ?? []) fn(...args);
  }
  removeAllListeners() {
    this.handlers.clear();
    return this;
  }
  disconnect() {
    return this;
  }
}

/** Plays one server event on `socket` and lets React finish the updates it causes. */
export const fireOn = (socket: FakeSocket<unknown>, event: string, payload: unknown) =>
  act(async () => {
    socket.fire(event, payload);
    await new Promise((r) => setTimeout(r, 0));
  });
