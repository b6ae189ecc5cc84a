import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { tokenStore } from '@/lib/api-client';
import { meQueryKey } from '@/lib/auth';
import { connectLive, type LiveLinkState } from '@/lib/socket';
import { boardQueryKey, type BoardStation } from '../api/get-board';
import { boardWithRunFinished, boardWithRunStarted, boardWithState, boardWithStepStarted } from '../board-events';

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
    let joinedBefore = false;
    let refresh: number | undefined;
    // step names per running run: a refetched board loses the names `run:started` brought
    const stepNames = new Map<number, string[]>();
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
        if (joinedBefore) void queryClient.invalidateQueries({ queryKey: boardQueryKey });
        joinedBefore = true;
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
      stepNames.set(p.run.id, p.steps.map((s) => s.name));
      patch((b) => boardWithRunStarted(b, p));
    });
    socket.on('step:started', (p) => patch((b) => boardWithStepStarted(b, p, stepNames.get(p.runId))));
    socket.on('run:finished', (p) => {
      stepNames.delete(p.runId);
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
