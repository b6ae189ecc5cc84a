/*
 * The Holds API's answers, typed by hand from the server's DTOs (station-api/src/holds/dto/) until the lead
 * regenerates lib/api-types.ts.
 */

export type HoldRuleKind = 'fpy' | 'cpk' | 'run_rule' | 'consecutive_failures';
export type RuleSet = 'western-electric' | 'nelson';

export interface HoldRule {
  id: number;
  productId: number;
  partNumber: string;
  kind: HoldRuleKind;
  /** the rule in plain words */
  description: string;
  windowUnits: number | null;
  minFpyPct: number | null;
  minCpk: number | null;
  stepKey: string | null;
  quantity: string | null;
  ruleSet: RuleSet | null;
  failuresInRow: number | null;
  active: boolean;
  createdByName: string | null;
  createdAt: string;
  switchedOffAt: string | null;
}

export interface NewHoldRule {
  productId: number;
  kind: HoldRuleKind;
  windowUnits?: number;
  minFpyPct?: number;
  minCpk?: number;
  stepKey?: string;
  quantity?: string;
  ruleSet?: RuleSet;
  failuresInRow?: number;
}

export interface QuantityChoice {
  stepKey: string;
  stepName: string;
  quantity: string;
  name: string;
  unit: string;
  hasLimits: boolean;
}

export interface Hold {
  id: number;
  lotId: number;
  lotCode: string;
  lotState: string;
  partNumber: string;
  ruleId: number;
  ruleDescription: string;
  reason: string;
  figures: Record<string, unknown>;
  runId: number | null;
  serial: string | null;
  stationCode: string | null;
  heldAt: string;
  liftedAt: string | null;
  liftedByName: string | null;
  liftReason: string | null;
}

export interface HoldAlert {
  id: number;
  kind: 'hold' | 'evaluation_failed';
  at: string;
  message: string;
  ruleId: number | null;
  ruleDescription: string | null;
  lotCode: string | null;
  runId: number | null;
  holdId: number | null;
  figures: Record<string, unknown> | null;
}

export interface OutboxMessage {
  id: number;
  to: string;
  subject: string;
  body: string;
  status: 'queued' | 'sent' | 'failed';
  attempts: number;
  lastError: string | null;
  createdAt: string;
  lastAttemptAt: string | null;
  sentAt: string | null;
  alertId: number | null;
}

export interface ProductChoice {
  id: number;
  partNumber: string;
  name: string;
  active: boolean;
}

/** Every holds query starts with this key, so one invalidation refreshes the whole page. */
export const holdsQueryRoot = ['holds-page'] as const;
