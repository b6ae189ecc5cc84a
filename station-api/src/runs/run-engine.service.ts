import { EntityManager } from '@mikro-orm/sqlite';
import { BeforeApplicationShutdown, Injectable, Logger, OnApplicationBootstrap, Optional } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import { Fixture } from '../fixtures/fixture.entity';
import { isFixtureFault } from '../fixtures/transport/fixture-fault';
import { FixtureLinkService } from '../fixtures/transport/fixture-link.service';
import { PlansService } from '../plans/plans.service';
import { StationEventsPublisher } from '../realtime/station-events.publisher';
import { Station } from '../stations/station.entity';
import { User } from '../users/user.entity';
import { ActiveRun, ActiveRuns } from './active-runs';
import { systemClock } from './engine-clock';
import { MeasurementStore } from './measurement-store';
import { RunExecutor } from './run-executor';
import { RunPreconditions } from './run-preconditions';
import { RunRecords } from './run-records';
import { RunRefusal } from './run-refusal';
import type { RunOutcome, RunRequester, ScanResult, StartedRun, StartRunInput, StationStatus } from './run-types';
import { toRunView, toStepOutline, toUnitView } from './run-views';
import { StationStatusService } from './station-status';
import { TestRun } from './test-run.entity';

export type { RunOutcome, RunRequester, ScanResult, StartedRun, StartRunInput, StationStatus, StepTiming } from './run-types';

/**
 * The run engine's face: scan, start, abort, the active run, station status. The work is done by its
 * parts: preconditions and scan result (run-preconditions.ts), the step loop and finish (run-executor.ts),
 * the measurement store (measurement-store.ts), the run rows and start-up recovery (run-records.ts) and
 * station status (station-status.ts). One run per station and per unit at a time.
 */
@Injectable()
export class RunEngineService implements OnApplicationBootstrap, BeforeApplicationShutdown {
  private readonly logger = new Logger(RunEngineService.name);
  private readonly active = new ActiveRuns();
  private readonly preconditions: RunPreconditions;
  private readonly records: RunRecords;
  private readonly executor: RunExecutor;
  readonly stationStatus: StationStatusService;

  constructor(
    private readonly em: EntityManager,
    private readonly links: FixtureLinkService,
    private readonly events: StationEventsPublisher,
    plans: PlansService,
    @Optional() private readonly audit?: AuditService,
  ) {
    this.preconditions = new RunPreconditions(plans, this.active, (id) => this.links.faultOf(id));
    this.records = new RunRecords(em, audit);
    this.stationStatus = new StationStatusService(em, links, events, this.preconditions, this.active);
    this.executor = new RunExecutor(events, new MeasurementStore(em), this.records, this.active);
    this.links.onFaultChange((fixtureId) => this.stationStatus.track(this.stationStatus.publishStateForFixture(fixtureId)));
  }

  // ---- lifecycle --------------------------------------------------------------------------------

  /** Before the server accepts work: close runs a stopped server left open, prepare fixtures, announce states. */
  async onApplicationBootstrap(): Promise<void> {
    try {
      await this.records.recoverInterrupted(new Set(this.active.all().map((a) => a.runId)));
    } catch (err) {
      this.logger.error(`Could not close the runs left open by the last stop: ${(err as Error).message}`);
    }
    try {
      const em = this.em.fork();
      const fixtures = await em.find(Fixture, { active: true });
      this.links.prepare(fixtures);
      const stations = await em.find(Station, {}, { fields: ['id'] });
      for (const s of stations) await this.stationStatus.publishState(s.id);
    } catch (err) {
      // an empty or unmigrated database must not stop the server; the state appears with the first contact
      this.logger.warn(`Could not prepare the fixtures at start-up: ${(err as Error).message}`);
    }
  }

  /**
   * Stops running tests (recorded as stopped by the shutdown, not by an operator) and waits for their safe
   * state and stored verdict, so no fixture is left powered. Before shutdown: the database closes in the
   * shutdown hooks.
   */
  async beforeApplicationShutdown(): Promise<void> {
    const running = this.active.stopAll('server_shutdown');
    await Promise.race([Promise.all(running.map((r) => r.done)), new Promise((resolve) => setTimeout(resolve, 5000))]);
    await this.idle();
    await this.links.shutdown();
  }

  /** Resolves once no state publication is under way (before closing the database). */
  idle(): Promise<void> {
    return this.stationStatus.idle();
  }

  /**
   * Calls `listener` synchronously as each step of any run begins, before its first fixture command. (The
   * `step:started` event itself may follow a little later: it waits for the previous step's writes.)
   * @returns the function that stops listening
   */
  onStepStarting(listener: (runId: number, stepKey: string, stepIndex: number) => void): () => void {
    this.active.stepListeners.add(listener);
    return () => this.active.stepListeners.delete(listener);
  }

  // ---- queries ----------------------------------------------------------------------------------

  /** Whether a run is in progress on the station, and which. */
  activeRunOn(stationId: number): { runId: number; serial: string } | undefined {
    const a = this.active.on(stationId);
    return a ? { runId: a.runId, serial: a.serial } : undefined;
  }

  status(stationId: number, em?: EntityManager): Promise<StationStatus> {
    return this.stationStatus.status(stationId, em);
  }

  statusOfLoaded(station: Station, em?: EntityManager): Promise<StationStatus> {
    return this.stationStatus.statusOfLoaded(station, em);
  }

  /** See {@link StationStatusService.announceState}. */
  announceState(stationIds: Iterable<number> | Promise<Iterable<number>>): void {
    this.stationStatus.announceState(stationIds);
  }

  /** Checks a scanned serial against the station without touching the fixture. */
  async scan(stationId: number, serial: string, requester?: RunRequester): Promise<ScanResult> {
    const a = await this.preconditions.assess(this.em.fork(), stationId, serial, { requester, checkPassed: true });
    return this.preconditions.scanResult(a);
  }

  // ---- start / abort ----------------------------------------------------------------------------

  /**
   * Checks every pre-condition (including that the fixture answers `*IDN?`), writes the run row, and starts
   * the test in the background. Refuses with a {@link RunRefusal} before any power is applied.
   */
  async start(input: StartRunInput): Promise<StartedRun> {
    const { stationId } = input;
    if (this.active.busy(stationId)) {
      // checked before any await so two quick starts cannot both pass
      throw new RunRefusal('station_busy', `This station is already testing ${this.active.on(stationId)?.serial ?? 'a unit'}; wait for it to finish.`);
    }
    this.active.reserve(stationId);
    try {
      const clock = input.clock ?? systemClock;
      const em = this.em.fork();
      const a = await this.preconditions.assess(em, stationId, input.serial, {
        requester: input.requester,
        checkPassed: true,
        overrideReason: input.overrideReason,
        ignoreBusy: true,
        // calibration is judged at the run's own time (a seeded past run, or now)
        now: clock.now(),
      });
      if (!input.safetyConfirmed) {
        throw new RunRefusal('station_blocked', 'Confirm that the fixture lid is closed and the unit is clamped before starting.');
      }
      const link = this.links.linkFor(a.fixture);
      let identity: string;
      try {
        identity = (await link.scpi.identify()).raw;
      } catch (err) {
        const msg = isFixtureFault(err) ? err.message : String(err);
        this.stationStatus.track(this.stationStatus.publishState(stationId));
        throw new RunRefusal('station_blocked', `${msg}. Nothing was powered.`, { reasons: [msg] });
      }

      const operatorName = input.requester.displayName ?? (await em.findOneOrFail(User, { id: input.requester.id })).displayName;
      const startedAt = clock.now();
      const cycles = a.fixture.contactCyclesUsed + 1;
      const overrideReason = a.retestOfPassed ? input.overrideReason!.trim() : undefined;
      const lot = a.unit.lot;
      const product = a.unit.product;
      const runId = await this.records.open({
        unitId: a.unit.id,
        serial: a.unit.serial,
        lotId: lot.id,
        productId: product.id,
        stationId,
        stationCode: a.station.code,
        fixtureId: a.fixture.id,
        planVersionId: a.plan.id,
        operatorId: input.requester.id,
        operatorName,
        attempt: a.attempt,
        startedAt,
        fixtureIdentity: identity,
        fixtureCalibrationDueAt: a.fixture.calibrationDueAt,
        fixtureContactCycles: cycles,
        overrideReason,
        calibrationId: a.calibrationId,
      });
      if (input.audit !== false && this.audit) await this.auditStart(input.requester.id, runId, a.unit.serial, a.fixture.code, a.attempt, stationId, overrideReason);
      const operator = { id: input.requester.id, displayName: operatorName };
      const view = toRunView({
        id: runId,
        station: a.station,
        unit: a.unit,
        lot,
        product,
        planVersion: a.plan,
        operator,
        operatorName,
        fixture: a.fixture,
        attempt: a.attempt,
        verdict: 'running',
        startedAt,
        fixtureIdentity: identity,
        fixtureCalibrationDueAt: a.fixture.calibrationDueAt,
        fixtureContactCycles: cycles,
        overrideReason,
        overrideBy: overrideReason ? operator : null,
      });
      const abort = new AbortController();
      const active: ActiveRun = { runId, serial: a.unit.serial, abort, done: Promise.resolve(undefined as never) };
      this.active.set(stationId, active);

      // what the station looked like at the start; its state after the run is worked out from this without a query
      const snapshot = {
        station: { code: a.station.code, active: a.station.active },
        fixture: {
          code: a.fixture.code,
          active: a.fixture.active,
          calibrationDueAt: a.fixture.calibrationDueAt,
          contactCyclesUsed: cycles,
          contactCyclesAllowed: a.fixture.contactCyclesAllowed,
        },
        lot: { code: lot.code, state: lot.state, holdReason: lot.holdReason, partNumber: product.partNumber },
        hasReleasedPlan: true,
      };
      this.stationStatus.runStarted(stationId, runId, a.unit.serial, snapshot);
      this.events.emit('run:started', { stationId, run: view, unit: toUnitView(a.unit), steps: toStepOutline(a.plan.steps) });

      active.done = this.executor
        .execute({
          runId,
          stationId,
          link,
          clock,
          abort,
          steps: a.plan.steps,
          stopAtFirstFailure: a.plan.stopAtFirstFailure,
          unit: { id: a.unit.id, serial: a.unit.serial, lotCode: lot.code, view: toUnitView(a.unit) },
          product,
          fixture: a.uncertainties,
          startedAt,
          onStepStarted: input.onStepStarted,
          onStepTimed: input.onStepTimed,
          onStepStored: input.onStepStored,
        })
        .finally(() => {
          this.active.delete(stationId);
          this.stationStatus.runEnded(stationId, snapshot, a.fixture.id);
        });
      return { run: view, done: active.done };
    } finally {
      this.active.release(stationId);
    }
  }

  private async auditStart(actor: number, runId: number, serial: string, fixture: string, attempt: number, stationId: number, overrideReason?: string): Promise<void> {
    await this.audit!.record({ actor, action: 'run.safety_confirmed', entityType: 'test_run', entityId: runId, after: { stationId, serial, fixture } });
    if (overrideReason) {
      await this.audit!.record({ actor, action: 'run.retest_override', entityType: 'test_run', entityId: runId, reason: overrideReason, after: { serial, attempt } });
    }
  }

  /** Asks a running test to stop (the operator's stop); it stops before its next fixture command and goes safe. */
  async abort(runId: number): Promise<RunOutcome> {
    const a = this.active.byRunId(runId);
    if (a) {
      a.abort.abort('operator_stop');
      return a.done;
    }
    const run = await this.em.fork().findOne(TestRun, { id: runId });
    if (!run) throw new RunRefusal('run_not_found', `There is no run with id ${runId}.`);
    throw new RunRefusal('run_finished', `Run ${runId} has already finished (${run.verdict}); there is nothing to abort.`);
  }
}
