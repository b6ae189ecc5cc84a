/*
 * The repair API's answers, typed by hand until the lead regenerates lib/api-types.ts (server:
 * station-api/src/repair/dto/). Field names and meanings as the server's DTOs state them.
 */
import type { RepairFailureDto } from '@/lib/api-schema';

export type RepairAction = 'receive' | 'return' | 'scrap';
export type QueueState = 'failed' | 'in_repair';
export type QueueSort = 'failedAt' | 'serial' | 'state' | 'lot' | 'station' | 'step' | 'tests';
export type SortDir = 'asc' | 'desc';

/** The first measurement of the last failing run that did not pass. */
export type RepairFailure = RepairFailureDto;

export interface RepairQueueItem {
  unitId: number;
  serial: string;
  state: QueueState;
  reason: 'no_attempts_left' | 'sent_by_operator' | 'in_repair';
  sentToRepairAt: string | null;
  testCount: number;
  lot: { id: number; code: string; partNumber: string };
  lastFailingRun: {
    id: number;
    station: { id: number; code: string; name: string };
    attempt: number;
    failedStepKey: string | null;
    finishedAt: string;
    firstFailure: RepairFailure | null;
  } | null;
}

export interface RepairQueue {
  /** one page */
  items: RepairQueueItem[];
  /** units matching the filters, all pages */
  total: number;
  /** failed steps in the queue as filtered (except by step), to filter by */
  steps: { key: string; name: string }[];
}

export interface RepairQueueQuery {
  search?: string;
  state?: QueueState;
  lotId?: number;
  step?: string;
  sort?: QueueSort;
  dir?: SortDir;
  limit: number;
  offset: number;
}

export interface RepairCause {
  id: number;
  name: string;
  active: boolean;
  recordCount: number;
}

export interface RepairRecord {
  id: number;
  unitId: number;
  serial: string;
  symptom: string;
  cause: { id: number; name: string };
  actionTaken: string;
  disposition: 'retest' | 'scrapped';
  technician: { id: number; displayName: string };
  recordedAt: string;
  failedRunId: number | null;
  correctsId: number | null;
  correctionReason: string | null;
  correctedById: number | null;
}

export interface RepairResult {
  action: RepairAction;
  fromState: string;
  toState: string;
  auditEventId: number;
  unit: { serial: string; state: string };
  /** written for return and scrap */
  record: RepairRecord | null;
}

export interface RepairParetoBar {
  key: string;
  label: string;
  causeId: number;
  count: number;
  percent: number;
  cumulativeCount: number;
  cumulativePercent: number;
}

export interface RepairPareto {
  records: number;
  bars: RepairParetoBar[];
}
