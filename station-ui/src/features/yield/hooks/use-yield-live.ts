import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { tokenStore } from '@/lib/api-client';
import { connectLive, type LiveLinkState } from '@/lib/socket';
import { yieldQueryRoot } from '../api/yield-filters';

/** Several units can finish within a second; refetch the views at most this often (ms). */
const REFRESH_MS = 3_000;

/**
 * Keeps the quality views current: joins the `board` room (every station's run events) and, when a run
 * finishes, refetches every yield query (debounced). The figures themselves always come from the server.
 */
export function useYieldLive(): LiveLinkState {
  const queryClient = useQueryClient();
  const [link, setLink] = useState<LiveLinkState>('connecting');

  useEffect(() => {
    const token = tokenStore.get();
    if (!token) return;
    const socket = connectLive(token);
    let refresh: number | undefined;
    const refreshSoon = () => {
      if (refresh !== undefined) return;
      refresh = window.setTimeout(() => {
        refresh = undefined;
        void queryClient.invalidateQueries({ queryKey: yieldQueryRoot });
      }, REFRESH_MS);
    };
    socket.on('connect', () => {
      socket.emit('board:join', {}, (ack) => {
        if (!ack?.ok) {
          setLink('refused');
          return;
        }
        setLink('live');
        // runs may have finished while the link was down
        refreshSoon();
      });
    });
    socket.on('disconnect', (reason) => {
      if (reason !== 'io client disconnect') setLink('lost');
    });
    socket.on('connect_error', () => setLink('lost'));
    socket.on('run:finished', refreshSoon);
    return () => {
      if (refresh !== undefined) window.clearTimeout(refresh);
      socket.removeAllListeners();
      socket.disconnect();
    };
  }, [queryClient]);

  return link;
}
