import type { StationEventMap, StationEventName } from '../realtime/station-events';
import type { EventInput, StationEventsPublisher } from '../realtime/station-events.publisher';

/**
 * A run's events in the order they happened, even when some wait for a database write. A measurement's
 * event goes out once its row is committed (so it carries its id), and every later event of the run waits
 * behind it; the fixture meanwhile goes on with the next commands. A failed write is kept in `error` for
 * the engine to act on; the events after it are still sent.
 */
export class OrderedEvents {
  private chain: Promise<void> = Promise.resolve();
  /** The first failed write, if any */
  error?: Error;

  constructor(private readonly publisher: StationEventsPublisher) {}

  emit<K extends StationEventName>(name: K, input: EventInput<K>): void {
    this.chain = this.chain.then(() => {
      this.publisher.emit(name, input);
    });
  }

  /** Emits what `make` builds from `work`'s result, in order, once `work` has settled. */
  emitWhen<T, K extends StationEventName>(work: Promise<T>, name: K, make: (result: T) => EventInput<K>): void {
    // handled at once so a write failing before its turn is not reported as unhandled
    work.catch(() => undefined);
    this.chain = this.chain.then(
      () =>
        work.then(
          (result) => {
            this.publisher.emit(name, make(result));
          },
          (err: Error) => {
            this.error ??= err;
          },
        ),
    );
  }

  /** Resolves once every event so far is out (and every write it waited for has settled). */
  drain(): Promise<void> {
    return this.chain;
  }
}

export type { StationEventMap };
