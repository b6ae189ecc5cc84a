import { EntityManager } from '@mikro-orm/sqlite';
import { currentCalibration } from '../fixtures/calibration/current-calibration';
import { Fixture } from '../fixtures/fixture.entity';
import { guardedLimits } from '../measure/acceptance';
import { uncertaintyFor, type UncertaintySource } from '../measure/judging';
import { PlanVersion } from '../plans/plan-version.entity';
import { PlansService } from '../plans/plans.service';
import { Station } from '../stations/station.entity';
import { readiness } from '../stations/station-readiness';
import { Unit, UnitState } from '../units/unit.entity';
import { ActiveRuns } from './active-runs';
import { normaliseSerial, RunRefusal } from './run-refusal';
import type { RunRequester, ScanResult } from './run-types';
import { toStepOutline, toUnitView } from './run-views';
import { stepProblems } from '../plans/step-kinds';
import { RunVerdict, TestRun } from './test-run.entity';

/** Everything checked before power: the loaded records a run needs. */
export interface Assessed {
  station: Station;
  fixture: Fixture;
  unit: Unit;
  plan: PlanVersion;
  attempt: number;
  retestOfPassed: boolean;
  /** The fixture's current calibration record (null when it has none) and the uncertainties judging uses */
  calibrationId: number | null;
  uncertainties: UncertaintySource;
}

export interface AssessOptions {
  requester?: RunRequester;
  checkPassed: boolean;
  overrideReason?: string;
  ignoreBusy?: boolean;
  now?: Date;
}

/**
 * Every pre-condition of a run that needs no fixture contact, and the scan result built from it. Refusals
 * are {@link RunRefusal}s carrying the contract's `details.code`.
 */
export class RunPreconditions {
  constructor(
    private readonly plans: PlansService,
    private readonly active: ActiveRuns,
    /** The fixture link's present fault of a fixture, if any (a fixture not confirmed off blocks testing) */
    private readonly faultOf: (fixtureId: number) => { code: string; message: string } | undefined = () => undefined,
  ) {}

  /** The plan version the product is tested with (newest released), or null. */
  releasedPlan(em: EntityManager, productId: number): Promise<PlanVersion | null> {
    return this.plans.releasedVersionForProduct(productId, em);
  }

  /**
   * Order: busy, station readiness, serial (can be one, pattern, known), lot, unit state, unit under test
   * elsewhere, attempts, plan sanity.
   */
  async assess(em: EntityManager, stationId: number, rawSerial: string, opts: AssessOptions): Promise<Assessed> {
    const station = await em.findOne(Station, { id: stationId }, { populate: ['fixture', 'activeLot.product'] });
    if (!station) throw new RunRefusal('station_not_found', `There is no station with id ${stationId}.`);
    const running = this.active.on(stationId);
    if (!opts.ignoreBusy && this.active.busy(stationId)) {
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
    // a fixture that did not read back load off and source off may still be powered: nobody opens or
    // re-powers it until a person has switched it off and it confirms (other faults are retried at start)
    const fault = this.faultOf(fixture.id);
    if (fault?.code === 'not_safe') {
      throw new RunRefusal('station_blocked', `Station ${station.code} cannot test now: ${fault.message}`, { reasons: [fault.message] });
    }

    const serial = normaliseSerial(rawSerial);
    const unit = await em.findOne(Unit, { serial }, { populate: ['lot', 'product'] });
    if (!unit) {
      const pattern = safeRegExp(lot.product.serialPattern);
      if (pattern && !pattern.test(serial)) {
        throw new RunRefusal(
          'pattern_mismatch',
          `"${serial}" does not match the serial form for ${lot.product.partNumber} (${lot.product.serialPattern}). Scan the label again.`,
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
    // the database refuses a second running run of the unit anyway; this gives the scan a plain answer first
    const elsewhere = await em.findOne(TestRun, { unit: unit.id, verdict: RunVerdict.Running }, { populate: ['station'] });
    if (elsewhere) throw unitBusy(serial, elsewhere.station.code);
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
    // the calibration in force now: its uncertainties set the guard bands of this run (docs/calibration.md)
    const calibration = await currentCalibration(em, fixture.id);
    const uncertainties: UncertaintySource = { voltageUncertaintyV: fixture.voltageUncertaintyV, calibrated: calibration?.uncertainties ?? {} };
    const problems = plan.steps.flatMap((s) => stepProblems(s));
    for (const step of plan.steps) {
      for (const limit of step.limits) {
        if (limit.rule !== 'guarded') continue;
        try {
          guardedLimits({ low: limit.low, high: limit.high, uncertainty: uncertaintyFor(limit, uncertainties), rule: 'guarded' });
        } catch (err) {
          problems.push(`step "${step.name}" limit ${limit.key}: ${(err as Error).message}`);
        }
      }
    }
    if (problems.length > 0) {
      throw new RunRefusal('station_blocked', `Plan ${plan.plan.code} v${plan.version} cannot be run: ${problems.join('; ')}.`, { reasons: problems });
    }
    return { station, fixture, unit, plan, attempt: unit.testCount + 1, retestOfPassed, calibrationId: calibration?.id ?? null, uncertainties };
  }

  scanResult(a: Assessed): ScanResult {
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
        steps: toStepOutline(a.plan.steps),
      },
    };
  }
}

/** The refusal for a unit already under test on another station. */
export function unitBusy(serial: string, stationCode?: string): RunRefusal {
  const where = stationCode ? `on station ${stationCode}` : 'on another station';
  return new RunRefusal('unit_busy', `${serial} is being tested ${where} right now; wait for that test to end.`, stationCode ? { station: stationCode } : {});
}

function safeRegExp(pattern: string): RegExp | null {
  try {
    return new RegExp(pattern);
  } catch {
    return null;
  }
}
