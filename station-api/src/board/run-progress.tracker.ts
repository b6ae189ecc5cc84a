import { Injectable, OnModuleDestroy, OnModuleInit } from '@nestjs/common';
import type { StationEventMap, StationEventName } from '../realtime/station-events';
import { StationEventsPublisher } from '../realtime/station-events.publisher';

export interface RunProgress {
  runId: number;
  /** 0-based index of the step in progress */
  stepIndex: number;
  stepKey: string | null;
}

/**
 * Which step each running test is on, learnt from the engine's own live events (the engine does not keep
 * it), so the board snapshot shows the same step the live screens do.
 */
@Injectable()
export class RunProgressTracker implements OnModuleInit, OnModuleDestroy {
  private readonly byStation = new Map<number, RunProgress>();
  private unsubscribe?: () => void;

  constructor(private readonly events: StationEventsPublisher) {}

  onModuleInit(): void {
    this.unsubscribe = this.events.subscribe(<K extends StationEventName>(name: K, payload: StationEventMap[K]) => this.observe(name, payload));
  }

  onModuleDestroy(): void {
    this.unsubscribe?.();
  }

  /** The step a run is on, or undefined if the run is not the station's current one. */
  progressOf(stationId: number, runId: number): RunProgress | undefined {
    const p = this.byStation.get(stationId);
    return p && p.runId === runId ? p : undefined;
  }

  observe<K extends StationEventName>(name: K, payload: StationEventMap[K]): void {
    if (name === 'run:started') {
      const p = payload as StationEventMap['run:started'];
      this.byStation.set(p.stationId, { runId: p.run.id, stepIndex: 0, stepKey: null });
    } else if (name === 'step:started') {
      const p = payload as StationEventMap['step:started'];
      this.byStation.set(p.stationId, { runId: p.runId, stepIndex: p.stepIndex, stepKey: p.stepKey });
    } else if (name === 'run:finished') {
      const p = payload as StationEventMap['run:finished'];
      if (this.byStation.get(p.stationId)?.runId === p.runId) this.byStation.delete(p.stationId);
    }
  }
}
