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

  /** Observes every event in-process; returns the function that stops observing. */
  subscribe(listener: EventListener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }
}
