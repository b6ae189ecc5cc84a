import { raw } from '@mikro-orm/core';
import { EntityManager } from '@mikro-orm/sqlite';
import { BeforeApplicationShutdown, Injectable, Logger, OnApplicationBootstrap, Optional } from '@nestjs/common';
import { performance } from 'node:perf_hooks';
import { AuditService } from '../audit/audit.service';
import { Fixture } from '../fixtures/fixture.entity';
import { FixtureFault, isFixtureFault } from '../fixtures/transport/fixture-fault';
import { FixtureLink, FixtureLinkService } from '../fixtures/transport/fixture-link.service';
import { CommandAborted } from '../fixtures/transport/scpi-client';
import { guardedLimits, judge } from '../measure/acceptance';
import type { LimitSpec, PlanStep } from '../plans/plan-definition';
import { PlanVersion } from '../plans/plan-version.entity';
import { PlansService } from '../plans/plans.service';
import type { MeasurementView, RunView, StationStatePayload, StepOutline, UnitView } from '../realtime/station-events';
import { StationEventsPublisher } from '../realtime/station-events.publisher';
import { Station } from '../stations/station.entity';
import { Unit, UnitState } from '../units/unit.entity';
import type { Role } from '../users/user.entity';
import { User } from '../users/user.entity';
import { EngineClock, systemClock } from './engine-clock';
import { MeasurementVerdict } from './measurement.entity';
import { OrderedEvents } from './ordered-events';
import { RunRefusal } from './run-refusal';
import { toUnitView } from './run-views';
import { readiness, ReadinessInput } from './station-readiness';
import { Quantity, quantityFor, runStep, stepProblems } from './step-runner';
import { RunVerdict, TestRun } from './test-run.entity';

/** Who asks for a run and with what authority. */
export interface RunRequester {
  id: number;
  roles: Role[];
  /** Shown on the run; looked up when not given */
  displayName?: string;
}

export interface StartRunInput {
  stationId: number;
  serial: string;
  requester: RunRequester;
  /** The operator confirmed the fixture is closed and safe to power (audited as `run.safety_confirmed`) */
  safetyConfirmed: boolean;
  /** Engineer's reason to retest a unit that already passed */
  overrideReason?: string;
  /** Time source for this run (the history seeder and the benchmark pass a virtual clock) */
  clock?: EngineClock;
  /** Write the safety confirmation to the audit trail (off for seeded history) */
  audit?: boolean;
  /** Called as each step begins, before its first fixture command (benchmark instrumentation) */
  onStepStarted?: (runId: number, stepKey: string, stepIndex: number) => void;
  /** Called after each step with its wall time (benchmark instrumentation) */
  onStepTimed?: (timing: StepTiming) => void;
}

export interface StepTiming {
  runId: number;
  stepKey: string;
  /** Wall time of the step: its fixture commands, judging, and issuing its measurements' writes, ms */
  wallMs: number;
}

export interface RunOutcome {
  runId: number;
  verdict: Exclude<RunVerdict, RunVerdict.Running>;
  failedStepKey?: string;
  errorMessage?: string;
  durationMs: number;
}

export interface StartedRun {
  run: RunView;
  /** Settles when the run has finished and everything is stored; never rejects */
  done: Promise<RunOutcome>;
}

/** What a scan checked and found. */
export interface ScanResult {
  unit: UnitView;
  lot: { id: number; code: string; state: string };
  product: { id: number; partNumber: string; name: string; vinNomV: number; voutNomV: number; ioutRatedA: number };
  attempt: number;
  plan: { versionId: number; code: string; name: string; version: number; stopAtFirstFailure: boolean; maxAttempts: number; steps: StepOutline[] };
}

export interface StationStatus {
  stationId: number;
  stationCode: string;
  stationName: string;
  state: StationStatePayload['state'];
  reasons: string[];
  currentRunId?: number;
  currentSerial?: string;
  fixture: { id: number; code: string; calibrationDueAt: string; contactCyclesUsed: number; contactCyclesAllowed: number } | null;
  activeLot: { id: number; code: string; partNumber: string; state: string } | null;
}

interface ActiveRun {
  runId: number;
  serial: string;
  abort: AbortController;
  done: Promise<RunOutcome>;
}

/** Everything checked before power: the loaded records a run needs. */
interface Assessed {
  station: Station;
  fixture: Fixture;
  unit: Unit;
  plan: PlanVersion;
  attempt: number;
  retestOfPassed: boolean;
}

/** Column order of {@link RunEngineService.store}; names as the initial migration creates them. */
const INSERT_MEASUREMENT =
  'insert into `measurements` (`created_at`, `updated_at`, `run_id`, `step_index`, `step_key`, `step_name`, `quantity`, `name`, ' +
  '`value`, `unit`, `low_limit`, `high_limit`, `guarded_low`, `guarded_high`, `uncertainty`, `rule`, `verdict`, `raw`, `started_at`, `measured_at`) ' +
  'values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)';

const NO_SAFE_STATE = 'the fixture did not confirm load off and source off — switch the fixture off by hand before opening it';

/**
 * The run engine: checks pre-conditions before any power is applied, drives the fixture through the plan's
 * steps, judges and stores each measurement in its own transaction as soon as it is judged, and leaves the
 * fixture safe whatever happens. One run per station at a time; each run uses its own EntityManager forks.
 */
@Injectable()
export class RunEngineService implements OnApplicationBootstrap, BeforeApplicationShutdown {
  private readonly logger = new Logger(RunEngineService.name);
  private readonly active = new Map<number, ActiveRun>();
  /** Stations between "start requested" and "run row written": a second start is refused as busy */
  private readonly reserving = new Set<number>();
  /** In-process observers of step starts (tests that act at a given step, instrumentation) */
  private readonly stepListeners = new Set<(runId: number, stepKey: string, stepIndex: number) => void>();
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
    private readonly plans: PlansService,
    @Optional() private readonly audit?: AuditService,
  ) {
    this.links.onFaultChange((fixtureId) => this.track(this.publishStateForFixture(fixtureId)));
  }

  // ---- lifecycle --------------------------------------------------------------------------------

  async onApplicationBootstrap(): Promise<void> {
    try {
      const em = this.em.fork();
      const fixtures = await em.find(Fixture, { active: true });
      this.links.prepare(fixtures);
      const stations = await em.find(Station, {}, { fields: ['id'] });
      for (const s of stations) await this.publishState(s.id);
    } catch (err) {
      // an empty or unmigrated database must not stop the server; the state appears with the first contact
      this.logger.warn(`Could not prepare the fixtures at start-up: ${(err as Error).message}`);
    }
  }

  /**
   * Aborts running tests and waits for their safe state and their stored verdict, so no fixture is left
   * powered. Before shutdown, not at it: the database closes in the shutdown hooks.
   */
  async beforeApplicationShutdown(): Promise<void> {
    const running = [...this.active.values()];
    for (const r of running) r.abort.abort();
    await Promise.race([Promise.all(running.map((r) => r.done)), new Promise((resolve) => setTimeout(resolve, 5000))]);
    await this.idle();
    await this.links.shutdown();
  }

  /** Resolves once no state publication is under way (before closing the database). */
  async idle(): Promise<void> {
    while (this.background.size > 0) await Promise.allSettled([...this.background]);
  }

  private track(work: Promise<unknown>): void {
    this.background.add(work);
    void work.finally(() => this.background.delete(work));
  }

  /**
   * Calls `listener` synchronously as each step of any run begins, before its first fixture command. (The
   * `step:started` event itself may follow a little later: it waits for the previous step's writes.)
   * @returns the function that stops listening
   */
  onStepStarting(listener: (runId: number, stepKey: string, stepIndex: number) => void): () => void {
    this.stepListeners.add(listener);
    return () => this.stepListeners.delete(listener);
  }

  // ---- queries ----------------------------------------------------------------------------------

  /** Whether a run is in progress on the station, and which. */
  activeRunOn(stationId: number): { runId: number; serial: string } | undefined {
    const a = this.active.get(stationId);
    return a ? { runId: a.runId, serial: a.serial } : undefined;
  }

  /** The station's state and reasons, computed now. */
  async status(stationId: number, em = this.em.fork()): Promise<StationStatus> {
    const station = await em.findOne(Station, { id: stationId }, { populate: ['fixture', 'activeLot.product'] });
    if (!station) throw new RunRefusal('station_not_found', `There is no station with id ${stationId}.`);
    return this.statusOfLoaded(station, em);
  }

  /** State and reasons of a station whose fixture and active lot (with product) are loaded. */
  async statusOfLoaded(station: Station, em = this.em.fork()): Promise<StationStatus> {
    const lot = station.activeLot;
    const plan = lot ? await this.releasedPlan(em, lot.product.id) : null;
    const fixture = station.fixture;
    const running = this.activeRunOn(station.id);
    const r = readiness({
      now: new Date(),
      station,
      fixture,
      lot: lot ? { code: lot.code, state: lot.state, holdReason: lot.holdReason, partNumber: lot.product.partNumber } : undefined,
      hasReleasedPlan: !!plan,
      fixtureFault: fixture ? this.links.faultOf(fixture.id)?.message : undefined,
      running,
    });
    return {
      stationId: station.id,
      stationCode: station.code,
      stationName: station.name,
      state: r.state,
      reasons: r.reasons,
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
      activeLot: lot ? { id: lot.id, code: lot.code, partNumber: lot.product.partNumber, state: lot.state } : null,
    };
  }

  /** The plan version the product is tested with (newest released), or null. */
  releasedPlan(em: EntityManager, productId: number): Promise<PlanVersion | null> {
    return this.plans.releasedVersionForProduct(productId, em);
  }

  /** Checks a scanned serial against the station without touching the fixture. */
  async scan(stationId: number, serial: string, requester?: RunRequester): Promise<ScanResult> {
    const em = this.em.fork();
    const a = await this.assess(em, stationId, serial, { requester, checkPassed: true });
    return this.scanResult(a);
  }

  private scanResult(a: Assessed): ScanResult {
    const lot = a.unit.lot;
    const product = a.unit.product;
    return {
      unit: toUnitView(a.unit),
      lot: { id: lot.id, code: lot.code, state: lot.state },
      product: {
        id: product.id,
        partNumber: product.partNumber,
        name: product.name,
        vinNomV: product.vinNomV,
        voutNomV: product.voutNomV,
        ioutRatedA: product.ioutRatedA,
      },
      attempt: a.attempt,
      plan: {
        versionId: a.plan.id,
        code: a.plan.plan.code,
        name: a.plan.plan.name,
        version: a.plan.version,
        stopAtFirstFailure: a.plan.stopAtFirstFailure,
        maxAttempts: a.plan.maxAttempts,
        steps: outline(a.plan.steps),
      },
    };
  }

  /**
   * Every pre-condition that needs no fixture contact. Refusals carry the contract's `details.code`.
   * Order: busy, station readiness, serial (pattern, known), lot, unit state, attempts, plan sanity.
   */
  private async assess(
    em: EntityManager,
    stationId: number,
    rawSerial: string,
    opts: { requester?: RunRequester; checkPassed: boolean; overrideReason?: string; ignoreBusy?: boolean; now?: Date },
  ): Promise<Assessed> {
    const station = await em.findOne(Station, { id: stationId }, { populate: ['fixture', 'activeLot.product'] });
    if (!station) throw new RunRefusal('station_not_found', `There is no station with id ${stationId}.`);
    const running = this.active.get(stationId);
    if (!opts.ignoreBusy && (running || this.reserving.has(stationId))) {
      throw new RunRefusal('station_busy', `Station ${station.code} is testing ${running ? running.serial : 'another unit'}; wait for it to finish.`, {
        currentRunId: running?.runId,
      });
    }
    const lot = station.activeLot;
    const plan = lot ? await this.releasedPlan(em, lot.product.id) : null;
    const fixture = station.fixture;
    const r = readiness({
      now: opts.now ?? new Date(),
      station,
      fixture,
      lot: lot ? { code: lot.code, state: lot.state, holdReason: lot.holdReason, partNumber: lot.product.partNumber } : undefined,
      hasReleasedPlan: !!plan,
    });
    if (r.blocking.length > 0 || !fixture || !lot || !plan) {
      throw new RunRefusal('station_blocked', `Station ${station.code} cannot test now: ${r.blocking.join('; ')}.`, { reasons: r.blocking });
    }

    const serial = rawSerial.trim();
    const unit = await em.findOne(Unit, { serial }, { populate: ['lot', 'product'] });
    if (!unit) {
      const pattern = safeRegExp(lot.product.serialPattern);
      if (pattern && !pattern.test(serial)) {
        throw new RunRefusal(
          'pattern_mismatch',
          `"${serial}" is not a ${lot.product.partNumber} serial (expected the form ${lot.product.serialPattern}). Scan the label again.`,
        );
      }
      throw new RunRefusal('unknown_serial', `Serial ${serial} is not registered. Check the label, or ask for the unit to be added to lot ${lot.code}.`);
    }
    if (unit.lot.id !== lot.id) {
      throw new RunRefusal('wrong_lot', `${serial} belongs to lot ${unit.lot.code}, but station ${station.code} is running lot ${lot.code}. Set it aside.`, {
        unitLot: unit.lot.code,
        activeLot: lot.code,
      });
    }
    if (unit.state === UnitState.InRepair || unit.state === UnitState.Scrapped) {
      const why =
        unit.state === UnitState.InRepair
          ? 'is in repair; it cannot be tested until repair returns it for retest'
          : 'has been scrapped; it cannot be tested again';
      throw new RunRefusal('unit_not_testable', `${serial} ${why}. Set it aside.`, { unitState: unit.state });
    }
    const retestOfPassed = unit.state === UnitState.Passed;
    if (retestOfPassed && opts.checkPassed) {
      const reason = opts.overrideReason?.trim();
      if (!reason) {
        throw new RunRefusal('already_passed', `${serial} has already passed. An engineer can retest it with a reason.`);
      }
      if (opts.requester && !opts.requester.roles.includes('engineer')) {
        throw new RunRefusal('override_not_allowed', `Only an engineer can retest a unit that has already passed (${serial}).`);
      }
    }
    // attempts count from the unit's last return from repair (a repaired unit gets a fresh set)
    const attemptsUsed = unit.testCount - unit.testCountAtReturn;
    if (attemptsUsed >= plan.maxAttempts) {
      const since = unit.testCountAtReturn > 0 ? ' since it came back from repair' : '';
      throw new RunRefusal(
        'retest_limit',
        `${serial} has been tested ${attemptsUsed} times${since}, the most plan ${plan.plan.code} v${plan.version} allows. Send it to repair.`,
        { testCount: unit.testCount, attemptsUsed, maxAttempts: plan.maxAttempts },
      );
    }
    const problems = plan.steps.flatMap((s) => stepProblems(s));
    for (const step of plan.steps) {
      for (const limit of step.limits) {
        if (limit.rule !== 'guarded') continue;
        try {
          guardedLimits({ low: limit.low, high: limit.high, uncertainty: uncertaintyFor(limit, fixture), rule: 'guarded' });
        } catch (err) {
          problems.push(`step "${step.name}" limit ${limit.key}: ${(err as Error).message}`);
        }
      }
    }
    if (problems.length > 0) {
      throw new RunRefusal('station_blocked', `Plan ${plan.plan.code} v${plan.version} cannot be run: ${problems.join('; ')}.`, { reasons: problems });
    }
    return { station, fixture, unit, plan, attempt: unit.testCount + 1, retestOfPassed };
  }

  // ---- start / abort ----------------------------------------------------------------------------

  /**
   * Checks every pre-condition (including that the fixture answers `*IDN?`), writes the run row, and starts
   * the test in the background. Refuses with a {@link RunRefusal} before any power is applied.
   */
  async start(input: StartRunInput): Promise<StartedRun> {
    const { stationId } = input;
    if (this.active.has(stationId) || this.reserving.has(stationId)) {
      // checked before any await so two quick starts cannot both pass
      throw new RunRefusal('station_busy', `This station is already testing ${this.active.get(stationId)?.serial ?? 'a unit'}; wait for it to finish.`);
    }
    this.reserving.add(stationId);
    try {
      const clock = input.clock ?? systemClock;
      const em = this.em.fork();
      const a = await this.assess(em, stationId, input.serial, {
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
        this.track(this.publishState(stationId));
        throw new RunRefusal('station_blocked', `${msg}. Nothing was powered.`, { reasons: [msg] });
      }

      const operatorName = input.requester.displayName ?? (await em.findOneOrFail(User, { id: input.requester.id })).displayName;
      const startedAt = clock.now();
      const cycles = a.fixture.contactCyclesUsed + 1;
      const overrideReason = a.retestOfPassed ? input.overrideReason!.trim() : undefined;
      const now = new Date();
      // one transaction: the run row and the fixture's contact cycle (one per clamped unit) go in together.
      // Native statements on a fresh fork: nothing else is flushed, and the cost stays two statements.
      const runId = Number(
        await this.em.fork().transactional(async (tx) => {
          await tx.nativeUpdate(Fixture, { id: a.fixture.id }, { contactCyclesUsed: raw('contact_cycles_used + 1'), updatedAt: now } as never);
          return tx.insert(TestRun, {
            unit: a.unit.id,
            lot: a.unit.lot.id,
            product: a.unit.product.id,
            station: a.station.id,
            fixture: a.fixture.id,
            planVersion: a.plan.id,
            operator: input.requester.id,
            attempt: a.attempt,
            verdict: RunVerdict.Running,
            startedAt,
            fixtureIdentity: identity,
            fixtureCalibrationDueAt: a.fixture.calibrationDueAt,
            fixtureContactCycles: cycles,
            overrideReason,
            overrideBy: overrideReason ? input.requester.id : undefined,
            createdAt: now,
            updatedAt: now,
          } as never);
        }),
      );
      if (input.audit !== false && this.audit) {
        await this.audit.record({
          actor: input.requester.id,
          action: 'run.safety_confirmed',
          entityType: 'test_run',
          entityId: runId,
          after: { stationId, serial: a.unit.serial, fixture: a.fixture.code },
        });
        if (overrideReason) {
          await this.audit.record({
            actor: input.requester.id,
            action: 'run.retest_override',
            entityType: 'test_run',
            entityId: runId,
            reason: overrideReason,
            after: { serial: a.unit.serial, attempt: a.attempt },
          });
        }
      }
      const view: RunView = {
        id: runId,
        stationId,
        stationCode: a.station.code,
        unitId: a.unit.id,
        serial: a.unit.serial,
        lotId: a.unit.lot.id,
        lotCode: a.unit.lot.code,
        productId: a.unit.product.id,
        partNumber: a.unit.product.partNumber,
        planVersionId: a.plan.id,
        planCode: a.plan.plan.code,
        planVersion: a.plan.version,
        operatorId: input.requester.id,
        operatorName,
        fixtureId: a.fixture.id,
        fixtureCode: a.fixture.code,
        attempt: a.attempt,
        verdict: 'running',
        startedAt: startedAt.toISOString(),
        finishedAt: null,
        durationMs: null,
        failedStepKey: null,
        errorMessage: null,
        fixtureIdentity: identity,
        fixtureCalibrationDueAt: a.fixture.calibrationDueAt.toISOString(),
        fixtureContactCycles: cycles,
        overrideReason: overrideReason ?? null,
        overrideByName: overrideReason ? operatorName : null,
      };
      const abort = new AbortController();
      const active: ActiveRun = { runId, serial: a.unit.serial, abort, done: Promise.resolve(undefined as never) };
      this.active.set(stationId, active);
      this.reserving.delete(stationId);

      this.events.emit('station:state', { stationId, state: 'testing', reasons: [], currentRunId: runId, currentSerial: a.unit.serial });
      this.events.emit('run:started', { stationId, run: view, unit: toUnitView(a.unit), steps: outline(a.plan.steps) });

      // what the station looked like at the start; its state after the run is worked out from this without a query
      const lot = a.unit.lot;
      const after: Omit<ReadinessInput, 'now'> = {
        station: { code: a.station.code, active: a.station.active },
        fixture: {
          code: a.fixture.code,
          active: a.fixture.active,
          calibrationDueAt: a.fixture.calibrationDueAt,
          contactCyclesUsed: cycles,
          contactCyclesAllowed: a.fixture.contactCyclesAllowed,
        },
        lot: { code: lot.code, state: lot.state, holdReason: lot.holdReason, partNumber: a.unit.product.partNumber },
        hasReleasedPlan: true,
      };
      active.done = this.execute({
        runId,
        stationId,
        link,
        clock,
        abort,
        steps: a.plan.steps,
        stopAtFirstFailure: a.plan.stopAtFirstFailure,
        unit: { id: a.unit.id, serial: a.unit.serial, lotCode: lot.code, view: toUnitView(a.unit) },
        product: a.unit.product,
        fixture: { voltageUncertaintyV: a.fixture.voltageUncertaintyV },
        startedAt,
        onStepStarted: input.onStepStarted,
        onStepTimed: input.onStepTimed,
      }).finally(() => {
        this.active.delete(stationId);
        const r = readiness({ ...after, now: new Date(), fixtureFault: this.links.faultOf(a.fixture.id)?.message });
        this.events.emit('station:state', { stationId, state: r.state, reasons: r.reasons });
        // the snapshot above predates any change made during the run (a calibration, a lot on hold)
        if (this.staleAfterRun.delete(stationId)) this.track(this.publishState(stationId));
      });
      return { run: view, done: active.done };
    } finally {
      this.reserving.delete(stationId);
    }
  }

  /** Asks a running test to stop; it stops before its next fixture command and goes safe. */
  async abort(runId: number): Promise<RunOutcome> {
    for (const a of this.active.values()) {
      if (a.runId === runId) {
        a.abort.abort();
        return a.done;
      }
    }
    const run = await this.em.fork().findOne(TestRun, { id: runId });
    if (!run) throw new RunRefusal('run_not_found', `There is no run with id ${runId}.`);
    throw new RunRefusal('run_finished', `Run ${runId} has already finished (${run.verdict}); there is nothing to abort.`);
  }

  // ---- the run ----------------------------------------------------------------------------------

  private async execute(ctx: {
    runId: number;
    stationId: number;
    link: FixtureLink;
    clock: EngineClock;
    abort: AbortController;
    steps: PlanStep[];
    stopAtFirstFailure: boolean;
    unit: { id: number; serial: string; lotCode: string; view: UnitView };
    product: { partNumber: string; vinMinV: number; vinNomV: number; vinMaxV: number; voutNomV: number; ioutRatedA: number };
    fixture: { voltageUncertaintyV: number };
    startedAt: Date;
    onStepStarted?: (runId: number, stepKey: string, stepIndex: number) => void;
    onStepTimed?: (t: StepTiming) => void;
  }): Promise<RunOutcome> {
    const { link, clock, runId, stationId } = ctx;
    const scpi = link.scpi;
    const failing: Promise<MeasurementView>[] = [];
    const events = new OrderedEvents(this.events);
    let failedStepKey: string | undefined;
    let errorMessage: string | undefined;
    let verdict: RunOutcome['verdict'];
    scpi.abortSignal = ctx.abort.signal;
    try {
      // a known start: everything off, error queue empty, then name the unit
      await scpi.reset();
      await scpi.clearStatus();
      await scpi.setUnit(ctx.unit.serial, ctx.product.partNumber, ctx.unit.lotCode);
      const generation = link.transport.generation;
      const linkIntact = () => {
        if (link.transport.generation !== generation) {
          throw new FixtureFault(
            'disconnected',
            link.config.code,
            'the link was lost during the run and the fixture switched itself off; check the cable, then test the unit again',
          );
        }
      };
      const stepCtx = {
        scpi,
        product: ctx.product,
        fixture: { sourceOn: false, loadOn: false },
        settle: (ms: number) => (link.instant ? (clock.elapse(ms), Promise.resolve()) : clock.sleep(ms)),
      };
      for (let i = 0; i < ctx.steps.length; i++) {
        const step = ctx.steps[i];
        if (ctx.abort.signal.aborted) throw new CommandAborted();
        ctx.onStepStarted?.(runId, step.key, i);
        for (const listener of this.stepListeners) listener(runId, step.key, i);
        const t0 = performance.now();
        const stepStartedAt = clock.now();
        events.emit('step:started', { stationId, runId, stepKey: step.key, stepIndex: i });
        const quantities = await runStep(step, stepCtx);
        await scpi.checkErrors(`step "${step.name}"`);
        linkIntact();
        let stepFailed = false;
        for (const limit of step.limits) {
          const row = judgeLimit(i, step, limit, quantities, ctx.fixture, stepStartedAt, clock.now());
          // the write starts now and commits while the fixture goes on; its event follows the commit
          const stored = this.store(runId, row);
          events.emitWhen(stored, 'measurement:judged', (measurement) => ({ stationId, runId, stepKey: step.key, measurement }));
          if (row.verdict !== MeasurementVerdict.Pass) {
            stepFailed = true;
            failing.push(stored);
          }
        }
        ctx.onStepTimed?.({ runId, stepKey: step.key, wallMs: performance.now() - t0 });
        if (events.error) throw events.error;
        if (stepFailed) failedStepKey ??= step.key;
        if (stepFailed && ctx.stopAtFirstFailure) break;
      }
      verdict = failing.length > 0 ? RunVerdict.Fail : RunVerdict.Pass;
    } catch (err) {
      if (err instanceof CommandAborted || ctx.abort.signal.aborted) {
        verdict = RunVerdict.Aborted;
        errorMessage = isFixtureFault(err) ? `Aborted by the operator (${err.message})` : 'Aborted by the operator';
      } else if (isFixtureFault(err)) {
        verdict = RunVerdict.Error;
        errorMessage = err.message;
      } else if (err === events.error) {
        verdict = RunVerdict.Error;
        errorMessage = `A measurement could not be stored (${(err as Error).message}); the run was stopped. Test the unit again.`;
        this.logger.error(`Run ${runId}: ${(err as Error).stack ?? err}`);
      } else {
        verdict = RunVerdict.Error;
        errorMessage = `Software fault in the test engine: ${(err as Error).message}. The unit was not judged.`;
        this.logger.error(`Run ${runId}: ${(err as Error).stack ?? err}`);
      }
    } finally {
      scpi.abortSignal = undefined;
    }
    // whatever happened: load off, then source off
    const safe = await scpi.safeState();
    if (!safe.loadOff || !safe.sourceOff) {
      this.logger.error(`Run ${runId}: ${NO_SAFE_STATE}`);
      errorMessage = errorMessage ? `${errorMessage}. Also: ${NO_SAFE_STATE}` : `Fixture ${link.config.code}: ${NO_SAFE_STATE}`;
    }
    // every measurement committed and announced before the verdict
    await events.drain();
    if (events.error && verdict !== RunVerdict.Error) {
      verdict = RunVerdict.Error;
      errorMessage = `A measurement could not be stored (${events.error.message}). Test the unit again.`;
    }
    const failures = verdict === RunVerdict.Error ? [] : await Promise.all(failing);
    return this.finish(ctx, verdict, failures, failedStepKey, errorMessage);
  }

  /**
   * Stores one judged measurement as a single INSERT (its own transaction, autocommit). Written as one
   * parameterised statement rather than through the unit of work: the record is written once and never
   * updated, and the ORM's per-row mapping was the largest cost left in the engine's hot path (see
   * docs/performance.md). Dates are stored as epoch milliseconds and JSON as text, as the ORM does on SQLite.
   */
  private async store(runId: number, row: JudgedRow): Promise<MeasurementView> {
    const now = Date.now();
    const result = await this.em.getConnection().execute<{ insertId: number }>(
      INSERT_MEASUREMENT,
      [
        now,
        now,
        runId,
        row.stepIndex,
        row.stepKey,
        row.stepName,
        row.quantity,
        row.name,
        row.value ?? null,
        row.unit,
        row.lowLimit ?? null,
        row.highLimit ?? null,
        row.guardedLow ?? null,
        row.guardedHigh ?? null,
        row.uncertainty,
        row.rule,
        row.verdict,
        JSON.stringify(row.raw),
        row.startedAt.getTime(),
        row.measuredAt.getTime(),
      ],
      'run',
    );
    return {
      id: Number(result.insertId),
      runId,
      ...row,
      value: row.value ?? null,
      lowLimit: row.lowLimit ?? null,
      highLimit: row.highLimit ?? null,
      guardedLow: row.guardedLow ?? null,
      guardedHigh: row.guardedHigh ?? null,
      startedAt: row.startedAt.toISOString(),
      measuredAt: row.measuredAt.toISOString(),
    };
  }

  private async finish(
    ctx: { runId: number; stationId: number; clock: EngineClock; startedAt: Date; unit: { id: number; view: UnitView } },
    verdict: RunOutcome['verdict'],
    failures: MeasurementView[],
    failedStepKey: string | undefined,
    errorMessage: string | undefined,
  ): Promise<RunOutcome> {
    const finishedAt = ctx.clock.now();
    const durationMs = finishedAt.getTime() - ctx.startedAt.getTime();
    const judged = verdict === RunVerdict.Pass || verdict === RunVerdict.Fail;
    let unit = ctx.unit.view;
    try {
      const now = new Date();
      await this.em.fork().transactional(async (tx) => {
        await tx.nativeUpdate(
          TestRun,
          { id: ctx.runId },
          { verdict, finishedAt, failedStepKey: verdict === RunVerdict.Fail ? (failedStepKey ?? null) : null, errorMessage: errorMessage ?? null, updatedAt: now } as never,
        );
        // only a judged run counts as a test of the unit; an error or abort leaves it as it was
        if (judged) {
          await tx.nativeUpdate(
            Unit,
            { id: ctx.unit.id },
            {
              state: verdict === RunVerdict.Pass ? UnitState.Passed : UnitState.Failed,
              testCount: raw('test_count + 1'),
              lastTestedAt: finishedAt,
              updatedAt: now,
            } as never,
          );
        }
      });
      if (judged) {
        unit = {
          ...unit,
          state: verdict === RunVerdict.Pass ? 'passed' : 'failed',
          testCount: unit.testCount + 1,
          lastTestedAt: finishedAt.toISOString(),
        };
      }
    } catch (err) {
      this.logger.error(`Run ${ctx.runId}: could not store the verdict ${verdict}: ${(err as Error).message}`);
    }
    this.events.emit('run:finished', {
      stationId: ctx.stationId,
      runId: ctx.runId,
      verdict,
      ...(verdict === RunVerdict.Fail && failedStepKey ? { failedStepKey } : {}),
      failures,
      ...(errorMessage ? { errorMessage } : {}),
      durationMs,
      unit,
    });
    return { runId: ctx.runId, verdict, failedStepKey: verdict === RunVerdict.Fail ? failedStepKey : undefined, errorMessage, durationMs };
  }

  // ---- station state events ---------------------------------------------------------------------

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
  private publishState(stationId: number): Promise<void> {
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
        ...(s.currentRunId ? { currentRunId: s.currentRunId, currentSerial: s.currentSerial } : {}),
      });
    } catch (err) {
      if (err instanceof RunRefusal && err.code === 'station_not_found') return;
      this.logger.warn(`Could not publish the state of station ${stationId}: ${(err as Error).message}`);
    }
  }

  private async publishStateForFixture(fixtureId: number): Promise<void> {
    try {
      const stations = await this.em.fork().find(Station, { fixture: fixtureId }, { fields: ['id'] });
      for (const s of stations) if (!this.active.has(s.id)) await this.publishState(s.id);
    } catch {
      // state events are a convenience; the status route stays authoritative
    }
  }
}

/** A judged limit, as it is stored. */
interface JudgedRow {
  stepIndex: number;
  stepKey: string;
  stepName: string;
  quantity: string;
  name: string;
  value?: number;
  unit: string;
  lowLimit?: number;
  highLimit?: number;
  guardedLow?: number;
  guardedHigh?: number;
  uncertainty: number;
  rule: string;
  verdict: MeasurementVerdict;
  raw: Record<string, unknown>;
  startedAt: Date;
  measuredAt: Date;
}

/**
 * Judges one limit of a step against the quantity the step produced, with the limit's decision rule and
 * the expanded uncertainty from {@link uncertaintyFor}. A missing value fails.
 */
export function judgeLimit(
  stepIndex: number,
  step: PlanStep,
  limit: LimitSpec,
  quantities: Quantity[],
  fixture: { voltageUncertaintyV: number },
  startedAt: Date,
  measuredAt: Date,
): JudgedRow {
  const q = quantityFor(limit.key, quantities);
  const uncertainty = uncertaintyFor(limit, fixture);
  const spec = { low: limit.low, high: limit.high, uncertainty, rule: limit.rule };
  let verdict: MeasurementVerdict;
  let guarded: { low?: number; high?: number } = {};
  if (q && q.value !== null) {
    const j = judge(q.value, spec);
    verdict = j.verdict as MeasurementVerdict;
    guarded = { low: j.guardedLow, high: j.guardedHigh };
  } else {
    // no value: the unit gave nothing to judge, which fails the limit
    verdict = MeasurementVerdict.Fail;
    if (limit.rule === 'guarded') guarded = guardedLimits(spec);
  }
  return {
    stepIndex,
    stepKey: step.key,
    stepName: step.name,
    quantity: limit.key,
    name: limit.name,
    value: q?.value ?? undefined,
    unit: limit.unit,
    lowLimit: limit.low,
    highLimit: limit.high,
    guardedLow: guarded.low,
    guardedHigh: guarded.high,
    uncertainty,
    rule: limit.rule,
    verdict,
    raw: q ? { ...q.raw, ...(q.problem ? { problem: q.problem } : {}) } : { problem: `step produced no ${limit.key}` },
    startedAt,
    measuredAt,
  };
}

/**
 * Expanded uncertainty for a limit, in the limit's unit: the limit's own value, else the fixture's
 * output-voltage uncertainty for volt quantities (V or mV), else 0.
 */
export function uncertaintyFor(limit: LimitSpec, fixture: { voltageUncertaintyV: number }): number {
  if (limit.uncertainty !== undefined && limit.uncertainty !== null) return limit.uncertainty;
  if (limit.unit === 'V') return fixture.voltageUncertaintyV;
  if (limit.unit === 'mV') return fixture.voltageUncertaintyV * 1000;
  return 0;
}

function outline(steps: PlanStep[]): StepOutline[] {
  return steps.map((s) => ({ key: s.key, name: s.name, kind: s.kind, limits: s.limits.map((l) => ({ ...l })) }));
}

function safeRegExp(pattern: string): RegExp | null {
  try {
    return new RegExp(pattern);
  } catch {
    return null;
  }
}
