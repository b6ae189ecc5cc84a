/**
 * Time as the run engine sees it. The server uses the system clock; the history seeder and the benchmark
 * pass a virtual clock so runs carry historical timestamps without editing rows afterwards.
 */
export interface EngineClock {
  now(): Date;
  /** Waits for real (settling on a real fixture). */
  sleep(ms: number): Promise<void>;
  /**
   * Lets modelled time pass without waiting (a simulated fixture with instant timing settles at once).
   * The system clock does nothing; a virtual clock moves forward.
   */
  elapse(ms: number): void;
}

export const systemClock: EngineClock = {
  now: () => new Date(),
  sleep: (ms) => (ms > 0 ? new Promise((resolve) => setTimeout(resolve, ms)) : Promise.resolve()),
  elapse: () => undefined,
};

/** A clock that starts at a given instant and moves only when told to. */
export class VirtualClock implements EngineClock {
  private t: number;

  constructor(start: Date) {
    this.t = start.getTime();
  }

  now(): Date {
    return new Date(this.t);
  }

  async sleep(ms: number): Promise<void> {
    this.elapse(ms);
  }

  elapse(ms: number): void {
    if (ms > 0) this.t += ms;
  }

  set(at: Date): void {
    this.t = at.getTime();
  }
}
