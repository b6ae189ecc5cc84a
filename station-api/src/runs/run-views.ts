import type { DecisionStatementName, MeasurementVerdictName, MeasurementView, RunEndReasonName, RunVerdictName, RunView, StepOutline, UnitView } from '../realtime/station-events';

/*
 * The one view mapper of runs, units and measurements: REST answers and live events are built here, from
 * entities or from the engine's records in hand (which have the same shape), so they can never differ.
 */

const iso = (d?: Date | null): string | null => (d ? d.toISOString() : null);

/** What a run view is made of: a loaded TestRun entity, or the records the engine has in hand at the start. */
export interface RunSource {
  id: number;
  station: { id: number; code: string };
  unit: { id: number; serial: string };
  lot: { id: number; code: string };
  product: { id: number; partNumber: string };
  planVersion: { id: number; version: number; checksum?: string; plan: { code: string } };
  operator: { id: number; displayName: string };
  /** The operator's name when the run started (shown in preference to the user's current name) */
  operatorName?: string | null;
  fixture: { id: number; code: string };
  attempt: number;
  verdict: string;
  startedAt: Date;
  finishedAt?: Date | null;
  failedStepKey?: string | null;
  errorMessage?: string | null;
  endReason?: string | null;
  fixtureIdentity?: string | null;
  fixtureCalibrationDueAt?: Date | null;
  fixtureContactCycles?: number | null;
  overrideReason?: string | null;
  overrideBy?: { id: number; displayName: string } | null;
}

/** A run as REST and the live events show it. Expects unit, lot, product, station, fixture, plan, operator loaded. */
export function toRunView(run: RunSource): RunView {
  const operatorName = run.operatorName ?? run.operator.displayName;
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
    planChecksum: run.planVersion.checksum,
    operatorId: run.operator.id,
    operatorName,
    fixtureId: run.fixture.id,
    fixtureCode: run.fixture.code,
    attempt: run.attempt,
    verdict: run.verdict as RunVerdictName,
    startedAt: run.startedAt.toISOString(),
    finishedAt: iso(run.finishedAt),
    durationMs: run.finishedAt ? run.finishedAt.getTime() - run.startedAt.getTime() : null,
    failedStepKey: run.failedStepKey ?? null,
    errorMessage: run.errorMessage ?? null,
    endReason: (run.endReason ?? null) as RunEndReasonName | null,
    fixtureIdentity: run.fixtureIdentity ?? null,
    fixtureCalibrationDueAt: iso(run.fixtureCalibrationDueAt),
    fixtureContactCycles: run.fixtureContactCycles ?? null,
    overrideReason: run.overrideReason ?? null,
    // the override is given by the operator who starts the run: their name as it was then
    overrideByName: run.overrideBy ? (run.overrideBy.id === run.operator.id ? operatorName : run.overrideBy.displayName) : null,
  };
}

export function toUnitView(unit: {
  id: number;
  serial: string;
  state: string;
  testCount: number;
  lot: { code: string };
  product: { partNumber: string };
  lastTestedAt?: Date | null;
}): UnitView {
  return {
    id: unit.id,
    serial: unit.serial,
    state: unit.state as UnitView['state'],
    testCount: unit.testCount,
    lotCode: unit.lot.code,
    partNumber: unit.product.partNumber,
    lastTestedAt: iso(unit.lastTestedAt),
  };
}

/** What a measurement view is made of: a Measurement entity, or a judged row with the id its INSERT got. */
export interface MeasurementSource {
  id: number;
  stepIndex: number;
  stepKey: string;
  stepName: string;
  quantity: string;
  name: string;
  value?: number | null;
  unit: string;
  lowLimit?: number | null;
  highLimit?: number | null;
  guardedLow?: number | null;
  guardedHigh?: number | null;
  uncertainty: number;
  rule: string;
  verdict: string;
  decision?: string | null;
  raw?: Record<string, unknown> | null;
  startedAt: Date;
  measuredAt: Date;
}

/** The fields every view of a measurement shows together: the stored value, its unit and the limits it was judged against; absent values are `null`. */
export type MeasuredAgainstLimits = Pick<MeasurementView, 'value' | 'unit' | 'lowLimit' | 'highLimit' | 'guardedLow' | 'guardedHigh'>;

/**
 * A measurement's value (in `unit`) with its limits and guarded limits (same unit), absent ones as `null`.
 * Shared by the run views here and the floor's repair queue and repair tag, so all show a reading the same way.
 */
export function toMeasuredAgainstLimits(m: Pick<MeasurementSource, 'value' | 'unit' | 'lowLimit' | 'highLimit' | 'guardedLow' | 'guardedHigh'>): MeasuredAgainstLimits {
  return {
    value: m.value ?? null,
    unit: m.unit,
    lowLimit: m.lowLimit ?? null,
    highLimit: m.highLimit ?? null,
    guardedLow: m.guardedLow ?? null,
    guardedHigh: m.guardedHigh ?? null,
  };
}

export function toMeasurementView(m: MeasurementSource & { run?: { id: number } }, runId = m.run!.id): MeasurementView {
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
    verdict: m.verdict as MeasurementVerdictName,
    decision: (m.decision ?? null) as DecisionStatementName | null,
    raw: m.raw ?? null,
    startedAt: m.startedAt.toISOString(),
    measuredAt: m.measuredAt.toISOString(),
  };
}

/** A plan's steps as the operator screen lays them out before values arrive. */
export function toStepOutline(steps: { key: string; name: string; kind: string; limits: StepOutline['limits'] }[]): StepOutline[] {
  return steps.map((s) => ({ key: s.key, name: s.name, kind: s.kind, limits: s.limits.map((l) => ({ ...l })) }));
}
