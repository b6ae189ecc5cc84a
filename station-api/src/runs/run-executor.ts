import { Logger } from '@nestjs/common';
import { performance } from 'node:perf_hooks';
import { FixtureFault, isFixtureFault } from '../fixtures/transport/fixture-fault';
import type { FixtureLink } from '../fixtures/transport/fixture-link.service';
import { CommandAborted } from '../fixtures/transport/scpi-client';
import { judgeLimit, type UncertaintySource } from '../measure/judging';
import type { PlanStep } from '../plans/plan-definition';
import type { MeasurementView, RunEndReasonName, UnitView } from '../realtime/station-events';
import type { StationEventsPublisher } from '../realtime/station-events.publisher';
import type { ActiveRuns } from './active-runs';
import type { EngineClock } from './engine-clock';
import type { MeasurementStore } from './measurement-store';
import { OrderedEvents } from './ordered-events';
import type { RunRecords } from './run-records';
import type { RunOutcome, StepStored, StepTiming, StopCause } from './run-types';
import { quantityFor, runStep } from '../plans/step-kinds';
import { RunVerdict } from './test-run.entity';

const NO_SAFE_STATE = 'the fixture did not confirm load off and source off — switch the fixture off by hand before opening it';

/** What the executor needs of a started run. */
export interface RunContext {
  runId: number;
  stationId: number;
  link: FixtureLink;
  clock: EngineClock;
  abort: AbortController;
  steps: PlanStep[];
  stopAtFirstFailure: boolean;
  unit: { id: number; serial: string; lotCode: string; view: UnitView };
  product: { partNumber: string; vinMinV: number; vinNomV: number; vinMaxV: number; voutNomV: number; ioutRatedA: number };
  /** The fixture's uncertainties, with the current calibration's per-quantity values */
  fixture: UncertaintySource;
  startedAt: Date;
  onStepStarted?: (runId: number, stepKey: string, stepIndex: number) => void;
  onStepTimed?: (t: StepTiming) => void;
  /** After a step's measurements are committed and their events handed on: how long that took from the judgment */
  onStepStored?: (t: StepStored) => void;
}

/** A reading outside its quantity's physical range: the run ends in error, the unit is not judged. */
class ImplausibleReading extends Error {}

/** A step's measurements could not be committed (none of them was): the run ends in error, `store_failed`. */
class StoreFailed extends Error {}

interface Ending {
  verdict: RunOutcome['verdict'];
  endReason?: RunEndReasonName;
  errorMessage?: string;
}

/**
 * Runs a started test: drives the fixture through the plan's steps, judges each limit and commits a step's
 * measurements together as soon as the step is judged, leaves the fixture safe whatever happens, and stores and announces the verdict.
 */
export class RunExecutor {
  private readonly logger = new Logger(RunExecutor.name);

  constructor(
    private readonly events: StationEventsPublisher,
    private readonly store: MeasurementStore,
    private readonly records: RunRecords,
    private readonly active: ActiveRuns,
  ) {}

  /** Settles when the run has finished and everything is stored; never rejects. */
  async execute(ctx: RunContext): Promise<RunOutcome> {
    const { link, clock, runId, stationId } = ctx;
    const scpi = link.scpi;
    const failing: MeasurementView[] = [];
    const events = new OrderedEvents(this.events);
    let failedStepKey: string | undefined;
    let end: Ending;
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
        settle: (ms: number) => link.settle(ms, clock),
      };
      for (let i = 0; i < ctx.steps.length; i++) {
        const step = ctx.steps[i];
        if (ctx.abort.signal.aborted) throw new CommandAborted();
        ctx.onStepStarted?.(runId, step.key, i);
        for (const listener of this.active.stepListeners) listener(runId, step.key, i);
        const t0 = performance.now();
        const stepStartedAt = clock.now();
        events.emit('step:started', { stationId, runId, stepKey: step.key, stepIndex: i });
        const quantities = await runStep(step, stepCtx);
        await scpi.checkErrors(`step "${step.name}"`);
        linkIntact();
        let stepFailed = false;
        let implausible: string | undefined;
        const rows = step.limits.map((limit) =>
          judgeLimit(i, step, limit, quantityFor(limit.key, quantities), ctx.fixture, stepStartedAt, clock.now()),
        );
        // the step is judged: its measurements are committed together (one transaction) before anything
        // about them is shown, and the fixture waits for that commit, so a write that fails stops the run
        const judgedAt = performance.now();
        const stored = await this.storeStep(runId, rows);
        for (const measurement of stored) events.emit('measurement:judged', { stationId, runId, stepKey: step.key, measurement });
        await events.drain();
        ctx.onStepStored?.({ runId, stepKey: step.key, measurements: stored.length, judgedToStoredMs: performance.now() - judgedAt });
        for (const [k, row] of rows.entries()) {
          implausible ??= row.implausible;
          if (row.verdict !== 'pass') {
            stepFailed = true;
            failing.push(stored[k]);
          }
        }
        ctx.onStepTimed?.({ runId, stepKey: step.key, wallMs: performance.now() - t0 });
        // the readings of the step are stored; an impossible one stops the run before the unit is judged
        if (implausible) throw new ImplausibleReading(implausible);
        if (stepFailed) failedStepKey ??= step.key;
        if (stepFailed && ctx.stopAtFirstFailure) break;
      }
      end = { verdict: failing.length > 0 ? RunVerdict.Fail : RunVerdict.Pass };
    } catch (err) {
      end = this.ending(runId, err, ctx.abort.signal);
    } finally {
      scpi.abortSignal = undefined;
    }
    // whatever happened: load off, then source off
    const safe = await scpi.safeState();
    if (!safe.loadOff || !safe.sourceOff) {
      this.logger.error(`Run ${runId}: ${NO_SAFE_STATE}`);
      end.errorMessage = end.errorMessage ? `${end.errorMessage}. Also: ${NO_SAFE_STATE}` : `Fixture ${link.config.code}: ${NO_SAFE_STATE}`;
    }
    // every measurement committed and announced before the verdict
    await events.drain();
    const failures = end.verdict === RunVerdict.Error ? [] : failing;
    return this.finish(ctx, end, failures, failedStepKey);
  }

  /** How a run that threw ends: its verdict, end reason and message. */
  private ending(runId: number, err: unknown, signal: AbortSignal): Ending {
    if (err instanceof CommandAborted || signal.aborted) {
      if ((signal.reason as StopCause | undefined) === 'server_shutdown') {
        return { verdict: RunVerdict.Aborted, endReason: 'server_shutdown', errorMessage: 'Stopped: station server shut down' };
      }
      return {
        verdict: RunVerdict.Aborted,
        endReason: 'operator_stop',
        // one word for a stopped run everywhere (issue 12): "Stopped", never "aborted", in what people read
        errorMessage: isFixtureFault(err) ? `Stopped by the operator (${err.message})` : 'Stopped by the operator',
      };
    }
    if (isFixtureFault(err)) return { verdict: RunVerdict.Error, endReason: 'fixture_fault', errorMessage: err.message };
    if (err instanceof ImplausibleReading) {
      return { verdict: RunVerdict.Error, endReason: 'implausible_reading', errorMessage: `${err.message}. The unit was not judged.` };
    }
    this.logger.error(`Run ${runId}: ${(err as Error).stack ?? err}`);
    if (err instanceof StoreFailed) {
      return {
        verdict: RunVerdict.Error,
        endReason: 'store_failed',
        errorMessage: `The measurements of a step could not be stored (${err.message}); none of that step was kept and the run was stopped. Test the unit again.`,
      };
    }
    return {
      verdict: RunVerdict.Error,
      endReason: 'software_fault',
      errorMessage: `Software fault in the test engine: ${(err as Error).message}. The unit was not judged.`,
    };
  }

  /** Commits a step's judged rows in one transaction; a failure becomes {@link StoreFailed}. */
  private async storeStep(runId: number, rows: Parameters<MeasurementStore['storeStep']>[1]): Promise<MeasurementView[]> {
    try {
      return await this.store.storeStep(runId, rows);
    } catch (err) {
      // the driver's message repeats the whole statement; the cause is after its last " - "
      const message = (err as Error).message;
      throw new StoreFailed(message.includes(' - ') ? message.slice(message.lastIndexOf(' - ') + 3) : message);
    }
  }

  private async finish(ctx: RunContext, end: Ending, failures: MeasurementView[], failedStepKey: string | undefined): Promise<RunOutcome> {
    const finishedAt = ctx.clock.now();
    const durationMs = finishedAt.getTime() - ctx.startedAt.getTime();
    const fail = end.verdict === RunVerdict.Fail;
    const outcome: RunOutcome = {
      runId: ctx.runId,
      verdict: end.verdict,
      failedStepKey: fail ? failedStepKey : undefined,
      errorMessage: end.errorMessage,
      endReason: end.endReason,
      durationMs,
    };
    const counted = await this.records.close(ctx.runId, ctx.unit.id, outcome, finishedAt);
    let unit = ctx.unit.view;
    if (counted) {
      unit = { ...unit, state: end.verdict === RunVerdict.Pass ? 'passed' : 'failed', testCount: unit.testCount + 1, lastTestedAt: finishedAt.toISOString() };
    }
    this.events.emit('run:finished', {
      stationId: ctx.stationId,
      runId: ctx.runId,
      verdict: end.verdict,
      ...(fail && failedStepKey ? { failedStepKey } : {}),
      failures,
      ...(end.errorMessage ? { errorMessage: end.errorMessage } : {}),
      ...(end.endReason ? { endReason: end.endReason } : {}),
      durationMs,
      unit,
    });
    return outcome;
  }
}
