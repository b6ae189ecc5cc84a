import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { BoardCurrentRunDto, BoardEntryDto, BoardLastRunDto } from '@/lib/api-schema';
import type { ShiftSummary } from '@/lib/shift-summary';

/** A station's shift so far, as the board and the station screen both receive it. */
export type BoardShift = ShiftSummary;

export type BoardVerdict = BoardLastRunDto['verdict'];

/** A finished run on a tile; `finishedAt` may be missing from older servers, so the screen copes without it. */
export type BoardLastRun = Omit<BoardLastRunDto, 'finishedAt'> & { finishedAt?: string };

export type BoardCurrentRun = BoardCurrentRunDto & {
  /** Step names from `run:started`, so later `step:started` events can be named (screen-side only) */
  stepNames?: string[];
};

/** One tile of `GET /api/board` (the server's BoardEntryDto). */
export type BoardStation = Omit<BoardEntryDto, 'currentRun' | 'lastRuns' | 'shift'> & {
  currentRun: BoardCurrentRun | null;
  /** Newest first */
  lastRuns: BoardLastRun[];
  shift: BoardShift | null;
};

export const boardQueryKey = ['board'] as const;

/**
 * @param displayToken the wall screen's board-only token; without it the signed-in person's. A refused
 *   display token is shown on the board, never turned into a trip to the sign-in page.
 */
export async function getBoard(displayToken?: string): Promise<BoardStation[]> {
  const rows = await api.get<BoardStation[]>(
    apiPaths.board,
    displayToken ? { token: displayToken, skipUnauthorizedRedirect: true } : undefined,
  );
  return [...rows].sort((a, b) => a.station.code.localeCompare(b.station.code, undefined, { numeric: true }));
}

export const boardQueryOptions = (displayToken?: string) =>
  queryOptions({
    queryKey: boardQueryKey,
    queryFn: () => getBoard(displayToken),
    // events keep it current; a slow refresh catches anything an event does not carry (shift change)
    staleTime: 60_000,
    refetchInterval: 60_000,
    // a refused display token does not get better by asking again
    retry: (count, error) => !(error && 'status' in error && (error.status === 401 || error.status === 403)) && count < 3,
  });

export function useBoard(displayToken?: string) {
  return useQuery(boardQueryOptions(displayToken));
}
