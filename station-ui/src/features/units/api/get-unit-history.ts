import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api, isApiError } from '@/lib/api-client';

/** Shapes of GET /api/units/:serial/history (station-api/src/units/dto/unit-history.dto.ts), typed by hand. */
export interface HistoryMeasurement {
  id: number;
  stepIndex: number;
  stepKey: string;
  stepName: string;
  quantity: string;
  name: string;
  value: number | null;
  unit: string;
  lowLimit: number | null;
  highLimit: number | null;
  guardedLow: number | null;
  guardedHigh: number | null;
  uncertainty: number;
  rule: string;
  verdict: string;
  decision: string | null;
  measuredAt: string;
}

export interface HistoryRun {
  id: number;
  attempt: number;
  verdict: string;
  endReason: string | null;
  errorMessage: string | null;
  failedStepKey: string | null;
  startedAt: string;
  finishedAt: string | null;
  plan: { versionId: number; planId: number; code: string; version: number; checksum: string };
  station: { id: number; code: string; name: string };
  fixture: {
    id: number;
    code: string;
    identity: string | null;
    calibrationDueAtRun: string | null;
    calibrationId: number | null;
    calibratedAt: string | null;
    calibrationDueAt: string | null;
    certificate: string | null;
  };
  operator: { username: string | null; displayName: string };
  overrideReason: string | null;
  measurements: HistoryMeasurement[];
}

export interface HistoryEvent {
  id: number;
  at: string;
  actorName: string | null;
  actorDisplayName: string | null;
  action: string;
  what: string;
  entityType: string;
  entityId: string | null;
  reason: string | null;
  changes: { field: string; before: string | null; after: string | null }[];
}

export interface UnitHistory {
  unit: {
    id: number;
    serial: string;
    state: string;
    stateWords: string;
    disposition: string;
    testCount: number;
    sentToRepairAt: string | null;
    product: { id: number; partNumber: string; name: string };
    lot: { id: number; code: string; state: string };
  };
  runs: HistoryRun[];
  events: HistoryEvent[];
  repairRecords: Record<string, { field: string; value: string }[]>;
}

/** Serials are stored in upper case; scanners add spaces or a carriage return. */
export function normaliseSerial(raw: string): string {
  return raw.trim().toUpperCase();
}

export const unitHistoryQueryOptions = (serial: string) =>
  queryOptions({
    queryKey: ['units', 'history', normaliseSerial(serial)] as const,
    queryFn: () => api.get<UnitHistory>(apiPaths.unitHistory(normaliseSerial(serial))),
    // an unknown serial stays unknown: do not ask three times
    retry: (count, err) => !(isApiError(err) && err.status < 500) && count < 2,
  });

export function useUnitHistory(serial: string) {
  return useQuery(unitHistoryQueryOptions(serial));
}
