import { queryOptions, useQuery } from '@tanstack/react-query';
import type { StationState } from '@station-events';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { ShiftSummary } from '@/lib/shift-summary';

/** A station's shift so far, as the board and the station screen both receive it. */
export type BoardShift = ShiftSummary;

export type BoardVerdict = 'pass' | 'fail' | 'error' | 'aborted';

export interface BoardLastRun {
  id: number;
  serial: string;
  verdict: BoardVerdict;
  failedStepKey: string | null;
  /** ISO 8601 */
  finishedAt: string;
}

export interface BoardCurrentRun {
  id: number;
  serial: string;
  /** 0-based index of the step under way */
  stepIndex: number;
  stepCount: number;
  /** null when the server cannot name the step (the run has not reached one yet) */
  stepName: string | null;
  startedAt: string;
  /** Step names from `run:started`, so later `step:started` events can be named (screen-side only) */
  stepNames?: string[];
}

/** One tile of `GET /api/board`. */
export interface BoardStation {
  station: { id: number; code: string; name: string };
  state: StationState;
  reasons: string[];
  fixture: { code: string; calibrationDueAt?: string } | null;
  activeLot: { id: number; code: string; partNumber: string } | null;
  currentRun: BoardCurrentRun | null;
  /** Newest first */
  lastRuns: BoardLastRun[];
  shift: BoardShift | null;
}

export const boardQueryKey = ['board'] as const;

export async function getBoard(): Promise<BoardStation[]> {
  // the contract lists stations; accept a bare array or one wrapped in {stations} / {items}
  const body = await api.get<BoardStation[] | { stations?: BoardStation[]; items?: BoardStation[] }>(apiPaths.board);
  const rows = Array.isArray(body) ? body : (body.stations ?? body.items ?? []);
  return [...rows].sort((a, b) => a.station.code.localeCompare(b.station.code, undefined, { numeric: true }));
}

export const boardQueryOptions = () =>
  queryOptions({
    queryKey: boardQueryKey,
    queryFn: getBoard,
    // events keep it current; a slow refresh catches anything an event does not carry (shift change)
    staleTime: 60_000,
    refetchInterval: 60_000,
  });

export function useBoard() {
  return useQuery(boardQueryOptions());
}
