/** The plans API's shapes as this screen reads them (station-api src/plans/dto); the what-if answer is the server's own. */
import type { ProportionInterval } from '@contract/what-if-views';

export type { WhatIfResult } from '@contract/what-if-views';
/** A proportion with its Wilson interval, as the server sends it */
export type Interval = ProportionInterval;

export interface UserRef {
  id: number;
  username: string;
  displayName: string;
}

export type VersionStage = 'draft' | 'submitted' | 'released' | 'superseded' | 'retired';

export interface LimitSpec {
  key: string;
  name?: string;
  unit?: string;
  low?: number;
  high?: number;
  uncertainty?: number;
  rule?: 'simple' | 'guarded';
}

export interface PlanStep {
  key: string;
  name: string;
  kind: string;
  params: Record<string, unknown>;
  limits: LimitSpec[];
}

export interface VersionSummary {
  id: number;
  planId: number;
  version: number;
  state: string;
  stage: VersionStage;
  reason: string;
  stopAtFirstFailure: boolean;
  maxAttempts: number;
  checksum: string;
  stepCount: number;
  createdAt: string;
  createdBy: UserRef | null;
  releasedAt: string | null;
  releasedBy: UserRef | null;
  submittedAt: string | null;
  submittedBy: UserRef | null;
  changeReason: string | null;
  retiredAt: string | null;
}

export interface VersionDetail extends VersionSummary {
  plan: { id: number; code: string; name: string; product: { id: number; partNumber: string; name: string } };
  steps: PlanStep[];
}

export interface PlanSummary {
  id: number;
  code: string;
  name: string;
  product: { id: number; partNumber: string; name: string };
  releasedVersion: VersionSummary | null;
  versionCount: number;
}

export interface PlanDetail extends PlanSummary {
  versions: VersionSummary[];
}

export interface StepKindDescription {
  kind: string;
  summary: string;
  params: { name: string; need: 'required' | 'optional'; unit: string; description: string; schema: Record<string, unknown>; rating: string | null }[];
  quantities: { base: string; unit: string; name: string; perLoad: boolean; flag: boolean; range: { text: string }; limitKey: string }[];
}

export interface LimitPreview {
  stepIndex: number;
  limitIndex: number;
  key: string;
  acceptLow: number | null;
  acceptHigh: number | null;
  rule: 'simple' | 'guarded';
  problem: string | null;
}

export interface StepsPreview {
  valid: boolean;
  problems: { field: string; problems: string[] }[];
  limits: LimitPreview[];
}

export interface ValueChange {
  field: string;
  before: unknown;
  after: unknown;
}

export interface PlanComparison {
  fromVersion: number;
  toVersion: number;
  added: { key: string; name: string; position: number }[];
  removed: { key: string; name: string; position: number }[];
  reordered: { key: string; name: string; from: number; to: number }[];
  changed: { key: string; name: string; changes: ValueChange[] }[];
  settings: ValueChange[];
  identical: boolean;
}

export type WhatIfScope = { scope: 'last_units'; units: number } | { scope: 'lot'; lotId: number } | { scope: 'dates'; from: string; to: string };
