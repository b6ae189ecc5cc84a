/*
 * What a what-if re-judging answers (POST /api/plan-versions/:id/what-if): the one definition, read by the
 * server's re-judging and, through the `@contract/*` alias, by the plans screen.
 */
import type { ProportionInterval } from '../stats/yield';

export type { ProportionInterval };

export interface LimitChangeCount {
  stepKey: string;
  stepName: string;
  limitKey: string;
  limitName: string;
  unit: string;
  passToFail: number;
  failToPass: number;
  /** units with a stored measurement for this limit */
  measured: number;
}

export interface AffectedUnit {
  unitId: number;
  serial: string;
  runId: number;
  before: 'pass' | 'fail';
  after: 'pass' | 'fail';
  /** limits whose verdict changed, `step/limit` */
  limits: { stepKey: string; limitKey: string; value: number | null; before: 'pass' | 'fail'; after: 'pass' | 'fail' }[];
}

export interface RejudgeResult {
  unitsInScope: number;
  measurementsJudged: number;
  passToFail: number;
  failToPass: number;
  unknown: number;
  perStep: { stepKey: string; stepName: string; passToFail: number; failToPass: number }[];
  perLimit: LimitChangeCount[];
  unmeasuredLimits: { stepKey: string; limitKey: string }[];
  /** first-pass yield of the units in scope as stored */
  currentFpy: ProportionInterval;
  /** predicted first-pass yield under the draft (units with a predicted verdict), Wilson 95 % */
  predictedFpy: ProportionInterval;
  affected: AffectedUnit[];
}


/** The route's answer: the re-judging with its scope in words and the version it judged against. */
export interface WhatIfResult extends RejudgeResult {
  planVersionId: number;
  /** the scope in words */
  scopeText: string;
  elapsedMs: number;
}
