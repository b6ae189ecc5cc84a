import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable, Logger, OnApplicationBootstrap, OnApplicationShutdown, Optional } from '@nestjs/common';
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
import type { StationStatePayload, StepOutline, UnitView } from '../realtime/station-events';
import { StationEventsPublisher } from '../realtime/station-events.publisher';
import { Station } from '../stations/station.entity';
import { Unit, UnitState } from '../units/unit.entity';
import type { Role } from '../users/user.entity';
import { User } from '../users/user.entity';
import { EngineClock, systemClock } from './engine-clock';
import { Measurement, MeasurementVerdict } from './measurement.entity';
import { RunRefusal } from './run-refusal';
import { toMeasurementView, toRunView, toUnitView } from './run-views';
import { readiness } from './station-readiness';
import { Quantity, quantityFor, runStep, stepProblems } from './step-runner';
import { RunVerdict, TestRun } from './test-run.entity';

/** Who asks for a run and with what authority. */
export interface RunRequester {
  id: number;
  roles: Role[];
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
  /** Called after each step with its wall time (benchmark instrumentation) */
  onStepTimed?: (timing: StepTiming) => void;
}

export interface StepTiming {
  runId: number;
  stepKey: string;
  /** Wall time of the step including judging and storing its measurements, ms */
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
  run: ReturnType<typeof toRunView>;
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

const NO_SAFE_STATE = 'the fixture did not confirm load off and source off — switch the fixture off by hand before opening it';

/**
 * The run engine: checks pre-conditions before any power is applied, drives the fixture through the plan's
 * steps, judges and stores each measurement in its own transaction as soon as it is judged, and leaves the
 * fixture safe whatever happens. One run per station at a time; each run uses its own EntityManager forks.
 */
@Injectable()
export class RunEngineService implements OnApplicationBootstrap, OnApplicationShutdown {
  private readonly logger = new Logger(RunEngineService.name);
  private readonly active = new Map<number, ActiveRun>();
  /** Stations between "start requested" and "run row written": a second start is refused as busy */
  private readonly reserving = new Set<number>();

  constructor(
    private readonly em: EntityManager,
    private readonly links: FixtureLinkService,
    private readonly events: StationEventsPublisher,
    private readonly plans: PlansService,
    @Optional() private readonly audit?: AuditService,
  ) {
    this.links.onFaultChange((fixtureId) => void this.publishStateForFixture(fixtureId));
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

  /** Aborts running tests and waits for their safe state, so no fixture is left powered. */
  async onApplicationShutdown(): Promise<void> {
    const running = [...this.active.values()];
    for (const r of running) r.abort.abort();
    await Promise.race([Promise.all(running.map((r) => r.done)), new Promise((resolve) => setTimeout(resolve, 5000))]);
    await this.links.shutdown();
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
      const what = unit.state === UnitState.InRepair ? 'is in repair' : 'has been scrapped';
      throw new RunRefusal('unit_not_testable', `${serial} ${what}; it cannot be tested until repair releases it.`);
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
    if (unit.testCount >= plan.maxAttempts) {
      throw new RunRefusal(
        'retest_limit',
        `${serial} has been tested ${unit.testCount} times, the most plan ${plan.plan.code} v${plan.version} allows. Send it to repair.`,
        { testCount: unit.testCount, maxAttempts: plan.maxAttempts },
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
        void this.publishState(stationId);
        throw new RunRefusal('station_blocked', `${msg}. Nothing was powered.`, { reasons: [msg] });
      }

      const operator = em.getReference(User, input.requester.id);
      a.fixture.contactCyclesUsed += 1;
      const run = em.create(TestRun, {
        unit: a.unit,
        lot: a.unit.lot,
        product: a.unit.product,
        station: a.station,
        fixture: a.fixture,
        planVersion: a.plan,
        operator,
        attempt: a.attempt,
        verdict: RunVerdict.Running,
        startedAt: clock.now(),
        fixtureIdentity: identity,
        fixtureCalibrationDueAt: a.fixture.calibrationDueAt,
        fixtureContactCycles: a.fixture.contactCyclesUsed,
        ...(a.retestOfPassed ? { overrideReason: input.overrideReason!.trim(), overrideBy: operator } : {}),
      }, { partial: true });
      await em.flush();
      if (input.audit !== false && this.audit) {
        await this.audit.record({
          actor: input.requester.id,
          action: 'run.safety_confirmed',
          entityType: 'test_run',
          entityId: run.id,
          after: { stationId, serial: a.unit.serial, fixture: a.fixture.code },
        });
        if (a.retestOfPassed) {
          await this.audit.record({
            actor: input.requester.id,
            action: 'run.retest_override',
            entityType: 'test_run',
            entityId: run.id,
            reason: input.overrideReason!.trim(),
            after: { serial: a.unit.serial, attempt: a.attempt },
          });
        }
      }
      await em.populate(run, ['operator', 'overrideBy', 'planVersion.plan']);
      const view = toRunView(run);
      const abort = new AbortController();
      const active: ActiveRun = { runId: run.id, serial: a.unit.serial, abort, done: Promise.resolve(undefined as never) };
      this.active.set(stationId, active);
      this.reserving.delete(stationId);

      this.events.emit('station:state', { stationId, state: 'testing', reasons: [], currentRunId: run.id, currentSerial: a.unit.serial });
      this.events.emit('run:started', { stationId, run: view, unit: toUnitView(a.unit), steps: outline(a.plan.steps) });

      active.done = this.execute({
        runId: run.id,
        stationId,
        link,
        clock,
        abort,
        steps: a.plan.steps,
        stopAtFirstFailure: a.plan.stopAtFirstFailure,
        unit: { id: a.unit.id, serial: a.unit.serial, lotCode: a.unit.lot.code },
        product: a.unit.product,
        fixture: { voltageUncertaintyV: a.fixture.voltageUncertaintyV },
        startedAt: run.startedAt,
        onStepTimed: input.onStepTimed,
      }).finally(() => {
        this.active.delete(stationId);
        void this.publishState(stationId);
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
    unit: { id: number; serial: string; lotCode: string };
    product: { partNumber: string; vinMinV: number; vinNomV: number; vinMaxV: number; voutNomV: number; ioutRatedA: number };
    fixture: { voltageUncertaintyV: number };
    startedAt: Date;
    onStepTimed?: (t: StepTiming) => void;
  }): Promise<RunOutcome> {
    const { link, clock, runId, stationId } = ctx;
    const scpi = link.scpi;
    const failures: ReturnType<typeof toMeasurementView>[] = [];
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
        const t0 = performance.now();
        const stepStartedAt = clock.now();
        this.events.emit('step:started', { stationId, runId, stepKey: step.key, stepIndex: i });
        const quantities = await runStep(step, stepCtx);
        await scpi.checkErrors(`step "${step.name}"`);
        linkIntact();
        let stepFailed = false;
        for (const limit of step.limits) {
          const m = await this.judgeAndStore(runId, i, step, limit, quantities, ctx.fixture, stepStartedAt, clock.now());
          const view = toMeasurementView(m, runId);
          this.events.emit('measurement:judged', { stationId, runId, stepKey: step.key, measurement: view });
          if (m.verdict !== MeasurementVerdict.Pass) {
            stepFailed = true;
            failures.push(view);
          }
        }
        ctx.onStepTimed?.({ runId, stepKey: step.key, wallMs: performance.now() - t0 });
        if (stepFailed) failedStepKey ??= step.key;
        if (stepFailed && ctx.stopAtFirstFailure) break;
      }
      verdict = failures.length > 0 ? RunVerdict.Fail : RunVerdict.Pass;
    } catch (err) {
      if (err instanceof CommandAborted || ctx.abort.signal.aborted) {
        verdict = RunVerdict.Aborted;
        errorMessage = isFixtureFault(err) ? `Aborted by the operator (${err.message})` : 'Aborted by the operator';
      } else if (isFixtureFault(err)) {
        verdict = RunVerdict.Error;
        errorMessage = err.message;
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
    return this.finish(ctx, verdict, failures, failedStepKey, errorMessage);
  }

  private async judgeAndStore(
    runId: number,
    stepIndex: number,
    step: PlanStep,
    limit: LimitSpec,
    quantities: Quantity[],
    fixture: { voltageUncertaintyV: number },
    startedAt: Date,
    measuredAt: Date,
  ): Promise<Measurement> {
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
    const em = this.em.fork();
    const m = em.create(Measurement, {
      run: em.getReference(TestRun, runId),
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
    }, { partial: true });
    // one transaction per measurement: what was judged survives a crash later in the run
    await em.flush();
    return m;
  }

  private async finish(
    ctx: { runId: number; stationId: number; clock: EngineClock; startedAt: Date; unit: { id: number } },
    verdict: RunOutcome['verdict'],
    failures: ReturnType<typeof toMeasurementView>[],
    failedStepKey: string | undefined,
    errorMessage: string | undefined,
  ): Promise<RunOutcome> {
    const finishedAt = ctx.clock.now();
    const durationMs = finishedAt.getTime() - ctx.startedAt.getTime();
    let unitView: UnitView | undefined;
    try {
      const em = this.em.fork();
      const run = await em.findOneOrFail(TestRun, { id: ctx.runId });
      const unit = await em.findOneOrFail(Unit, { id: ctx.unit.id }, { populate: ['lot', 'product'] });
      run.verdict = verdict;
      run.finishedAt = finishedAt;
      run.failedStepKey = verdict === RunVerdict.Fail ? failedStepKey : undefined;
      run.errorMessage = errorMessage;
      // only a judged run counts as a test of the unit; an error or abort leaves it as it was
      if (verdict === RunVerdict.Pass || verdict === RunVerdict.Fail) {
        unit.state = verdict === RunVerdict.Pass ? UnitState.Passed : UnitState.Failed;
        unit.testCount += 1;
        unit.lastTestedAt = finishedAt;
      }
      await em.flush();
      unitView = toUnitView(unit);
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
      unit: unitView!,
    });
    return { runId: ctx.runId, verdict, failedStepKey: verdict === RunVerdict.Fail ? failedStepKey : undefined, errorMessage, durationMs };
  }

  // ---- station state events ---------------------------------------------------------------------

  private async publishState(stationId: number): Promise<void> {
    try {
      const s = await this.status(stationId);
      this.events.emit('station:state', {
        stationId,
        state: s.state,
        reasons: s.reasons,
        ...(s.currentRunId ? { currentRunId: s.currentRunId, currentSerial: s.currentSerial } : {}),
      });
    } catch (err) {
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
