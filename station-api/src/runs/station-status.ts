import { EntityManager } from '@mikro-orm/sqlite';
import { Logger } from '@nestjs/common';
import type { FixtureLinkService } from '../fixtures/transport/fixture-link.service';
import type { StationEventsPublisher } from '../realtime/station-events.publisher';
import { Station } from '../stations/station.entity';
import { calibrationWarnDays } from '../config/calibration.config';
import { readiness, ReadinessInput } from '../stations/station-readiness';
import { factsOfStation, releasedPlanProducts, stationFacts, type StationFacts } from './station-facts';
import type { ActiveRuns } from './active-runs';
import type { RunPreconditions } from './run-preconditions';
import { RunRefusal } from './run-refusal';
import type { StationStatus } from './run-types';

/**
 * A station's state and reasons (worked out by the one readiness rule in stations/station-readiness.ts),
 * and their announcement as `station:state`: at start-up, when a fixture's fault changes, when a run
 * starts and ends, and when master data they depend on is written (StationStateNotifier).
 */
export class StationStatusService {
  private readonly logger = new Logger(StationStatusService.name);
  /** State publications still under way (they query the database); awaited before shutdown */
  private readonly background = new Set<Promise<unknown>>();
  /** The last state publication of each station: the next one waits for it, so they go out in order */
  private readonly stateChains = new Map<number, Promise<void>>();
  /** Stations whose master data changed during a run: their state is worked out afresh when it ends */
  private readonly staleAfterRun = new Set<number>();

  constructor(
    private readonly em: EntityManager,
    private readonly links: FixtureLinkService,
    private readonly events: StationEventsPublisher,
    private readonly preconditions: RunPreconditions,
    private readonly active: ActiveRuns,
  ) {}

  /** Resolves once no state publication is under way (before closing the database). */
  async idle(): Promise<void> {
    while (this.background.size > 0) await Promise.allSettled([...this.background]);
  }

  track(work: Promise<unknown>): void {
    this.background.add(work);
    void work.finally(() => this.background.delete(work));
  }

  /** The station's state and reasons, computed now. */
  async status(stationId: number, em = this.em.fork()): Promise<StationStatus> {
    const station = await em.findOne(Station, { id: stationId }, { populate: ['fixture', 'activeLot.product'] });
    if (!station) throw new RunRefusal('station_not_found', `There is no station with id ${stationId}.`);
    return this.statusOfLoaded(station, em);
  }

  /** State and reasons of a station whose fixture and active lot (with product) are loaded. */
  async statusOfLoaded(station: Station, em = this.em.fork()): Promise<StationStatus> {
    const facts = factsOfStation(station);
    const released = facts.lot ? await releasedPlanProducts(em, [facts.lot.productId]) : new Set<number>();
    return this.statusOfFacts(facts, !!facts.lot && released.has(facts.lot.productId));
  }

  /**
   * The state of every station matching `activeOnly`, in code order, read with two statements (the stations with
   * their fixture, lot and product; which products have a released plan): the board's path. The same rule and
   * wording as {@link status}; the board e2e compares them station by station.
   */
  async statusesOfStations(em: EntityManager, activeOnly: boolean): Promise<{ facts: StationFacts; status: StationStatus }[]> {
    const facts = await stationFacts(em, activeOnly);
    const released = await releasedPlanProducts(
      em,
      facts.flatMap((f) => (f.lot ? [f.lot.productId] : [])),
    );
    return facts.map((f) => ({ facts: f, status: this.statusOfFacts(f, !!f.lot && released.has(f.lot.productId)) }));
  }

  /** State and reasons from plain facts (no query). */
  statusOfFacts(station: StationFacts, hasReleasedPlan: boolean): StationStatus {
    const { lot, fixture } = station;
    const a = this.active.on(station.id);
    const running = a ? { runId: a.runId, serial: a.serial } : undefined;
    const r = readiness({
      now: new Date(),
      station,
      fixture: fixture ?? undefined,
      lot: lot ? { code: lot.code, state: lot.state, holdReason: lot.holdReason, partNumber: lot.partNumber } : undefined,
      hasReleasedPlan,
      fixtureFault: fixture ? this.links.faultOf(fixture.id)?.message : undefined,
      running,
      calibrationWarnDays: calibrationWarnDays(),
    });
    return {
      stationId: station.id,
      stationCode: station.code,
      stationName: station.name,
      state: r.state,
      reasons: r.reasons,
      warnings: r.warnings,
      ...(running ? { currentRunId: running.runId, currentSerial: running.serial } : {}),
      fixture: fixture
        ? {
            id: fixture.id,
            code: fixture.code,
            calibrationDueAt: fixture.calibrationDueAt.toISOString(),
            contactCyclesUsed: fixture.contactCyclesUsed,
            contactCyclesAllowed: fixture.contactCyclesAllowed,
          }
        : null,
      activeLot: lot ? { id: lot.id, code: lot.code, partNumber: lot.partNumber, state: lot.state } : null,
    };
  }

  /** Announces that a run started on the station (with the warnings its start snapshot gives). */
  runStarted(stationId: number, runId: number, serial: string, snapshot?: Omit<ReadinessInput, 'now' | 'fixtureFault' | 'running'>): void {
    const warnings = snapshot ? readiness({ ...snapshot, now: new Date(), calibrationWarnDays: calibrationWarnDays() }).warnings : [];
    this.events.emit('station:state', { stationId, state: 'testing', reasons: [], warnings, currentRunId: runId, currentSerial: serial });
  }

  /**
   * Announces the station's state after a run, worked out without a query from what it looked like at the
   * start (`snapshot`), then afresh if its master data changed during the run.
   */
  runEnded(stationId: number, snapshot: Omit<ReadinessInput, 'now' | 'fixtureFault' | 'running'>, fixtureId: number): void {
    const r = readiness({ ...snapshot, now: new Date(), fixtureFault: this.links.faultOf(fixtureId)?.message, calibrationWarnDays: calibrationWarnDays() });
    this.events.emit('station:state', { stationId, state: r.state, reasons: r.reasons, warnings: r.warnings });
    if (this.staleAfterRun.delete(stationId)) this.track(this.publishState(stationId));
  }

  /**
   * Sends a fresh `station:state` (as `GET /api/stations/:id/status` computes it) for each station, in the
   * background. A station under test keeps its `testing` state; it gets the fresh state when its run ends.
   * Called when master data that the state depends on has changed (see StationStateNotifier).
   */
  announceState(stationIds: Iterable<number> | Promise<Iterable<number>>): void {
    // tracked from the start (the ids may still be looked up), so shutdown waits for the whole announcement
    this.track(
      Promise.resolve(stationIds).then(
        (ids) => {
          for (const id of new Set(ids)) {
            if (this.active.has(id)) this.staleAfterRun.add(id);
            else this.track(this.publishState(id));
          }
        },
        (err: Error) => this.logger.warn(`Could not work out which stations to announce: ${err.message}`),
      ),
    );
  }

  /** Publications of one station run one after the other, so the last one sent reflects the last change. */
  publishState(stationId: number): Promise<void> {
    const next = (this.stateChains.get(stationId) ?? Promise.resolve()).then(() => this.publishStateNow(stationId));
    this.stateChains.set(stationId, next);
    void next.finally(() => {
      if (this.stateChains.get(stationId) === next) this.stateChains.delete(stationId);
    });
    return next;
  }

  private async publishStateNow(stationId: number): Promise<void> {
    try {
      const s = await this.status(stationId);
      const runningNow = this.active.has(stationId);
      if ((s.state === 'testing') !== runningNow) {
        // a run started or ended while the database was read, and announced its own state: this one is
        // older. Catch up when the run ends, or now with a fresh read.
        if (runningNow) this.staleAfterRun.add(stationId);
        else this.track(this.publishState(stationId));
        return;
      }
      this.events.emit('station:state', {
        stationId,
        state: s.state,
        reasons: s.reasons,
        warnings: s.warnings,
        ...(s.currentRunId ? { currentRunId: s.currentRunId, currentSerial: s.currentSerial } : {}),
      });
    } catch (err) {
      if (err instanceof RunRefusal && err.code === 'station_not_found') return;
      this.logger.warn(`Could not publish the state of station ${stationId}: ${(err as Error).message}`);
    }
  }

  async publishStateForFixture(fixtureId: number): Promise<void> {
    try {
      const stations = await this.em.fork().find(Station, { fixture: fixtureId }, { fields: ['id'] });
      for (const s of stations) if (!this.active.has(s.id)) await this.publishState(s.id);
    } catch {
      // state events are a convenience; the status route stays authoritative
    }
  }
}
