import { useQueryClient } from '@tanstack/react-query';
import { useMemo, useRef } from 'react';
import { tokenStore } from '@/lib/api-client';
import { useLiveSocket, type LiveRoom, type LiveSocketState } from '@/lib/use-live-socket';
import { boardQueryKey, type BoardStation } from '../api/get-board';
import { boardWithRunFinished, boardWithRunStarted, boardWithState, boardWithStepStarted, type StartedRunInfo } from '../board-events';

/** After a verdict, the shift figures come from the server; refetch at most this often (ms). */
const SHIFT_REFRESH_MS = 2_000;

const BOARD_ROOMS: readonly LiveRoom[] = [{ event: 'board:join', body: {} }];

export interface BoardLiveOptions {
  /** The wall screen's display token; without it the signed-in person's token. */
  displayToken?: string;
  /** The server refused the token (display link expired or revoked). */
  onAuthError?: (message: string) => void;
}

/**
 * Joins the `board` room through the shared socket lifecycle and patches the board in the query cache
 * with every station's events. A finished run also refetches the board (debounced) so shift yield and
 * counts are the server's.
 */
export function useBoardLive(options: BoardLiveOptions = {}): LiveSocketState {
  const queryClient = useQueryClient();
  // what `run:started` said about each running run: a refetched board may not have it
  const runs = useRef(new Map<number, StartedRunInfo>());
  const refresh = useRef<number | undefined>(undefined);

  const handlers = useMemo(() => {
    const patch = (fn: (b: BoardStation[]) => BoardStation[]) =>
      queryClient.setQueryData<BoardStation[]>(boardQueryKey, (old) => (old ? fn(old) : old));
    const refreshSoon = () => {
      if (refresh.current !== undefined) return;
      refresh.current = window.setTimeout(() => {
        refresh.current = undefined;
        void queryClient.invalidateQueries({ queryKey: boardQueryKey });
      }, SHIFT_REFRESH_MS);
    };
    return {
      on: {
        'station:state': (p) => patch((b) => boardWithState(b, p)),
        'run:started': (p) => {
          runs.current.set(p.run.id, { serial: p.run.serial, startedAt: p.run.startedAt, stepNames: p.steps.map((s) => s.name) });
          patch((b) => boardWithRunStarted(b, p));
        },
        'step:started': (p) => patch((b) => boardWithStepStarted(b, p, runs.current.get(p.runId))),
        'run:finished': (p) => {
          runs.current.delete(p.runId);
          patch((b) => boardWithRunFinished(b, p));
          refreshSoon();
        },
      } satisfies Parameters<typeof useLiveSocket>[0]['on'],
      // The join replays each station's last published state, which can be older than the board just fetched
      // (a settings change publishes nothing), and events are lost while the link is down: the board computed
      // now wins, on the first join and on every rejoin.
      onJoined: () => void queryClient.invalidateQueries({ queryKey: boardQueryKey }),
    };
  }, [queryClient]);

  return useLiveSocket({
    token: options.displayToken ?? tokenStore.get(),
    rooms: BOARD_ROOMS,
    on: handlers.on,
    onJoined: handlers.onJoined,
    onAuthError: options.onAuthError,
  });
}
