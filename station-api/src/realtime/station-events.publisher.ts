import { Injectable, Logger } from '@nestjs/common';
import type { Server } from 'socket.io';
import { BOARD_ROOM, StationEventMap, StationEventName, StationStatePayload, stationRoom } from './station-events';

/** A payload as its producer hands it over; the publisher stamps `emittedAt`. */
export type EventInput<K extends StationEventName> = Omit<StationEventMap[K], 'emittedAt'>;
export type EventListener = <K extends StationEventName>(name: K, payload: StationEventMap[K]) => void;

/**
 * The one seam every live event goes through: stamps `emittedAt`, sends to the station's room and the
 * board, remembers each station's last state (replayed to a client that joins), and lets in-process
 * listeners (tests, the benchmark) observe the same stream.
 */
@Injectable()
export class StationEventsPublisher {
  private readonly logger = new Logger(StationEventsPublisher.name);
  private server?: Server;
  private readonly lastState = new Map<number, StationStatePayload>();
  private readonly listeners = new Set<EventListener>();

  /** Called by the gateway once socket.io is up. Before that, events reach only in-process listeners. */
  bind(server: Server): void {
    this.server = server;
  }

  emit<K extends StationEventName>(name: K, input: EventInput<K>): StationEventMap[K] {
    const payload = { ...input, emittedAt: Date.now() } as StationEventMap[K];
    if (name === 'station:state') this.lastState.set(payload.stationId, payload as StationStatePayload);
    // a socket in both rooms still receives the event once
    this.server?.to([stationRoom(payload.stationId), BOARD_ROOM]).emit(name, payload);
    for (const listener of this.listeners) {
      try {
        listener(name, payload);
      } catch (err) {
        this.logger.warn(`An event listener failed on ${name}: ${(err as Error).message}`);
      }
    }
    return payload;
  }

  /** The last state sent for a station, if any. */
  lastStateOf(stationId: number): StationStatePayload | undefined {
    return this.lastState.get(stationId);
  }

  /** Last states of every station that has one. */
  allLastStates(): StationStatePayload[] {
    return [...this.lastState.values()];
  }

  /**
   * Calls `listener` after every event of one name (in-process, after the sockets were sent to); returns the
   * function that stops it. A listener that throws, or whose promise rejects, is logged and never disturbs the
   * producer: hold-rule evaluation after `run:finished` hangs here, off the run's path.
   */
  onEmitted<K extends StationEventName>(name: K, listener: (payload: StationEventMap[K]) => void | Promise<void>): () => void {
    return this.subscribe((emitted, payload) => {
      if ((emitted as StationEventName) !== name) return;
      const result = listener(payload as unknown as StationEventMap[K]);
      if (result && typeof (result as Promise<void>).catch === 'function') {
        (result as Promise<void>).catch((err: Error) => this.logger.warn(`A ${name} listener failed: ${err.message}`));
      }
    });
  }

  /** Observes every event in-process; returns the function that stops observing. */
  subscribe(listener: EventListener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }
}
