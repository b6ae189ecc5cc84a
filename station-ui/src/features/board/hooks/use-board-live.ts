import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { tokenStore } from '@/lib/api-client';
import { meQueryKey } from '@/lib/auth';
import { connectLive, type LiveLinkState } from '@/lib/socket';
import { boardQueryKey, type BoardStation } from '../api/get-board';
import { boardWithRunFinished, boardWithRunStarted, boardWithState, boardWithStepStarted, type StartedRunInfo } from '../board-events';

/** After a verdict, the shift figures come from the server; refetch at most this often (ms). */
const SHIFT_REFRESH_MS = 2_000;

/**
 * Joins the `board` room and patches the board in the query cache with every station's events. A
 * finished run also refetches the board (debounced) so shift yield and counts are the server's.
 */
export function useBoardLive(): LiveLinkState {
  const queryClient = useQueryClient();
  const [link, setLink] = useState<LiveLinkState>('connecting');

  useEffect(() => {
    const token = tokenStore.get();
    if (!token) return;
    const socket = connectLive(token);
    let refresh: number | undefined;
    // what `run:started` said about each running run: a refetched board may not have it
    const runs = new Map<number, StartedRunInfo>();
    const patch = (fn: (b: BoardStation[]) => BoardStation[]) =>
      queryClient.setQueryData<BoardStation[]>(boardQueryKey, (old) => (old ? fn(old) : old));
    const refreshSoon = () => {
      if (refresh !== undefined) return;
      refresh = window.setTimeout(() => {
        refresh = undefined;
        void queryClient.invalidateQueries({ queryKey: boardQueryKey });
      }, SHIFT_REFRESH_MS);
    };

    socket.on('connect', () => {
      socket.emit('board:join', {}, (ack) => {
        if (!ack?.ok) {
          setLink('refused');
          return;
        }
        setLink('live');
        // The join replays each station's last published state, which can be older than the board just
        // fetched (a settings change publishes nothing), and events are lost while the link is down: the
        // board computed now wins.
        void queryClient.invalidateQueries({ queryKey: boardQueryKey });
      });
    });
    socket.on('disconnect', (reason) => {
      if (reason !== 'io client disconnect') setLink('lost');
    });
    socket.on('connect_error', (err) => {
      if ((err as Error & { data?: { code?: string } }).data?.code === 'unauthorized') {
        setLink('refused');
        void queryClient.invalidateQueries({ queryKey: meQueryKey });
        socket.disconnect();
      } else {
        setLink('lost');
      }
    });
    socket.on('station:state', (p) => patch((b) => boardWithState(b, p)));
    socket.on('run:started', (p) => {
      runs.set(p.run.id, { serial: p.run.serial, startedAt: p.run.startedAt, stepNames: p.steps.map((s) => s.name) });
      patch((b) => boardWithRunStarted(b, p));
    });
    socket.on('step:started', (p) => patch((b) => boardWithStepStarted(b, p, runs.get(p.runId))));
    socket.on('run:finished', (p) => {
      runs.delete(p.runId);
      patch((b) => boardWithRunFinished(b, p));
      refreshSoon();
    });

    return () => {
      if (refresh !== undefined) window.clearTimeout(refresh);
      socket.removeAllListeners();
      socket.disconnect();
    };
  }, [queryClient]);

  return link;
}
