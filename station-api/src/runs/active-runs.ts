import type { RunOutcome, StopCause } from './run-types';

export interface ActiveRun {
  runId: number;
  serial: string;
  abort: AbortController;
  done: Promise<RunOutcome>;
}

/**
 * The runs in progress in this process, one per station, and the stations between "start requested" and
 * "run row written". In memory only: the database's partial unique indexes are what guarantee one running
 * run per station and per unit across processes; this registry answers "busy" quickly and holds the abort.
 */
export class ActiveRuns {
  private readonly active = new Map<number, ActiveRun>();
  private readonly reserving = new Set<number>();
  /** In-process observers of step starts (tests that act at a given step, instrumentation) */
  readonly stepListeners = new Set<(runId: number, stepKey: string, stepIndex: number) => void>();

  on(stationId: number): ActiveRun | undefined {
    return this.active.get(stationId);
  }

  has(stationId: number): boolean {
    return this.active.has(stationId);
  }

  busy(stationId: number): boolean {
    return this.active.has(stationId) || this.reserving.has(stationId);
  }

  reserve(stationId: number): void {
    this.reserving.add(stationId);
  }

  release(stationId: number): void {
    this.reserving.delete(stationId);
  }

  set(stationId: number, run: ActiveRun): void {
    this.active.set(stationId, run);
    this.reserving.delete(stationId);
  }

  delete(stationId: number): void {
    this.active.delete(stationId);
  }

  byRunId(runId: number): ActiveRun | undefined {
    for (const a of this.active.values()) if (a.runId === runId) return a;
    return undefined;
  }

  all(): ActiveRun[] {
    return [...this.active.values()];
  }

  /** Asks every running test to stop with the given cause. */
  stopAll(cause: StopCause): ActiveRun[] {
    const running = this.all();
    for (const r of running) r.abort.abort(cause);
    return running;
  }
}
