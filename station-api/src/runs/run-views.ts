import type { MeasurementView, RunView, UnitView } from '../realtime/station-events';
import type { Unit } from '../units/unit.entity';
import type { Measurement } from './measurement.entity';
import type { TestRun } from './test-run.entity';

const iso = (d?: Date | null): string | null => (d ? d.toISOString() : null);

/** A run as REST and the live events show it. Expects unit, lot, product, station, fixture, plan, operator loaded. */
export function toRunView(run: TestRun): RunView {
  return {
    id: run.id,
    stationId: run.station.id,
    stationCode: run.station.code,
    unitId: run.unit.id,
    serial: run.unit.serial,
    lotId: run.lot.id,
    lotCode: run.lot.code,
    productId: run.product.id,
    partNumber: run.product.partNumber,
    planVersionId: run.planVersion.id,
    planCode: run.planVersion.plan.code,
    planVersion: run.planVersion.version,
    operatorId: run.operator.id,
    operatorName: run.operator.displayName,
    fixtureId: run.fixture.id,
    fixtureCode: run.fixture.code,
    attempt: run.attempt,
    verdict: run.verdict,
    startedAt: run.startedAt.toISOString(),
    finishedAt: iso(run.finishedAt),
    durationMs: run.finishedAt ? run.finishedAt.getTime() - run.startedAt.getTime() : null,
    failedStepKey: run.failedStepKey ?? null,
    errorMessage: run.errorMessage ?? null,
    fixtureIdentity: run.fixtureIdentity ?? null,
    fixtureCalibrationDueAt: iso(run.fixtureCalibrationDueAt),
    fixtureContactCycles: run.fixtureContactCycles ?? null,
    overrideReason: run.overrideReason ?? null,
    overrideByName: run.overrideBy?.displayName ?? null,
  };
}

export function toUnitView(unit: Unit): UnitView {
  return {
    id: unit.id,
    serial: unit.serial,
    state: unit.state,
    testCount: unit.testCount,
    lotCode: unit.lot.code,
    partNumber: unit.product.partNumber,
    lastTestedAt: iso(unit.lastTestedAt),
  };
}

/** The fields every view of a measurement shows together: the stored value, its unit and the limits it was judged against; absent values are `null`. */
export type MeasuredAgainstLimits = Pick<MeasurementView, 'value' | 'unit' | 'lowLimit' | 'highLimit' | 'guardedLow' | 'guardedHigh'>;

/**
 * A measurement's value (in `unit`) with its limits and guarded limits (same unit), absent ones as `null`.
 * Shared by the run views here and the floor's repair queue and repair tag, so all show a reading the same way.
 */
export function toMeasuredAgainstLimits(m: Measurement): MeasuredAgainstLimits {
  return {
    value: m.value ?? null,
    unit: m.unit,
    lowLimit: m.lowLimit ?? null,
    highLimit: m.highLimit ?? null,
    guardedLow: m.guardedLow ?? null,
    guardedHigh: m.guardedHigh ?? null,
  };
}

export function toMeasurementView(m: Measurement, runId = m.run.id): MeasurementView {
  return {
    id: m.id,
    runId,
    stepIndex: m.stepIndex,
    stepKey: m.stepKey,
    stepName: m.stepName,
    quantity: m.quantity,
    name: m.name,
    ...toMeasuredAgainstLimits(m),
    uncertainty: m.uncertainty,
    rule: m.rule,
    verdict: m.verdict,
    raw: m.raw ?? null,
    startedAt: m.startedAt.toISOString(),
    measuredAt: m.measuredAt.toISOString(),
  };
}
