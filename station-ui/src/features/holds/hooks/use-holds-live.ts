import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useMemo, useRef } from 'react';
import { tokenStore } from '@/lib/api-client';
import { useLiveSocket, type LiveRoom, type LiveStatus } from '@/lib/use-live-socket';
import { holdsQueryRoot } from '../api/types';

/** Several events arrive together (a run ends, then the stations' states): refetch once after a short pause. */
const REFRESH_MS = 400;
/** A hold is decided after the run's end is announced; look again once it has surely been written. */
const AFTER_RUN_MS = 1_500;
const ROOMS: readonly LiveRoom[] = [{ event: 'board:join', body: {} }];

/**
 * Keeps the Holds page current without a reload: joins the `board` room and refetches every holds query
 * when a station's state changes (a lot put on hold or released announces the states of its stations) and
 * shortly after each finished run. The data itself always comes from the REST API.
 */
export function useHoldsLive(): LiveStatus {
  const queryClient = useQueryClient();
  const timer = useRef<number | undefined>(undefined);

  useEffect(
    () => () => {
      if (timer.current !== undefined) window.clearTimeout(timer.current);
    },
    [],
  );

  const handlers = useMemo(() => {
    const refreshIn = (ms: number) => {
      if (timer.current !== undefined) window.clearTimeout(timer.current);
      timer.current = window.setTimeout(() => {
        timer.current = undefined;
        void queryClient.invalidateQueries({ queryKey: holdsQueryRoot });
      }, ms);
    };
    return {
      on: { 'station:state': () => refreshIn(REFRESH_MS), 'run:finished': () => refreshIn(AFTER_RUN_MS) },
      // events sent while the link was down are lost: read everything again
      onJoined: ({ rejoin }: { rejoin: boolean }) => {
        if (rejoin) refreshIn(0);
      },
    };
  }, [queryClient]);

  return useLiveSocket({ token: tokenStore.get(), rooms: ROOMS, on: handlers.on, onJoined: handlers.onJoined }).status;
}
