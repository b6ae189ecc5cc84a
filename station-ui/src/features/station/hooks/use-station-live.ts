import { useQueryClient } from '@tanstack/react-query';
import type { RunFinishedPayload, StationStatePayload } from '@station-events';
import { useEffect, useRef, useState } from 'react';
import { tokenStore } from '@/lib/api-client';
import { meQueryKey } from '@/lib/auth';
import { connectLive, type LiveLinkState } from '@/lib/socket';
import { liveRunQueryKey } from '../api/get-live-run';
import { shiftSummaryQueryKey } from '../api/get-shift-summary';
import { stationStatusQueryKey, type StationStatus } from '../api/get-station-status';
import { stationsQueryKey, type StationSummary } from '../api/get-stations';
import { runFromStarted, withFinished, withMeasurement, withStepStarted, type LiveRun } from '../live-run';

/** How long to wait for `run:started` after a `testing` state names a run this screen does not show (ms). */
const LATE_RUN_MS = 1_000;

export interface StationLiveHandlers {
  /** A run on this station finished (for the audible cue) */
  onRunFinished?: (payload: RunFinishedPayload) => void;
}

/** The status as a `station:state` event leaves it; fields the event leaves out are cleared. */
export function statusWithState(old: StationStatus, p: StationStatePayload): StationStatus {
  const { currentRunId: _run, currentSerial: _serial, ...rest } = old;
  return {
    ...rest,
    state: p.state,
    reasons: p.reasons,
    ...(p.currentRunId !== undefined ? { currentRunId: p.currentRunId } : {}),
    ...(p.currentSerial !== undefined ? { currentSerial: p.currentSerial } : {}),
  };
}

/**
 * Joins the station's room on the live link and writes every event into the query cache: the status,
 * the run on screen, the shift counters. Returns how the link stands. After a lost link it refetches,
 * because events sent meanwhile are gone.
 */
export function useStationLive(stationId: number | null, handlers: StationLiveHandlers = {}): LiveLinkState {
  const queryClient = useQueryClient();
  const [link, setLink] = useState<LiveLinkState>('connecting');
  const handlersRef = useRef(handlers);
  handlersRef.current = handlers;

  useEffect(() => {
    const token = tokenStore.get();
    if (stationId === null || !token) return;
    setLink('connecting');
    const socket = connectLive(token);
    let joinedBefore = false;
    let lateRunTimer: number | undefined;
    const runKey = liveRunQueryKey(stationId);
    const updateRun = (fn: (live: LiveRun) => LiveRun) =>
      queryClient.setQueryData<LiveRun | null>(runKey, (old) => (old ? fn(old) : old));

    socket.on('connect', () => {
      socket.emit('station:join', { stationId }, (ack) => {
        if (!ack?.ok) {
          setLink('refused');
          return;
        }
        setLink('live');
        // The join replays the last state the server published, which can be older than the status just
        // fetched (a settings change publishes nothing); the status computed now wins.
        void queryClient.invalidateQueries({ queryKey: stationStatusQueryKey(stationId) });
        if (joinedBefore) {
          // events sent while the link was down are lost: ask for the present state again
          void queryClient.invalidateQueries({ queryKey: runKey });
          void queryClient.invalidateQueries({ queryKey: shiftSummaryQueryKey(stationId) });
        }
        joinedBefore = true;
      });
    });
    socket.on('disconnect', (reason) => {
      if (reason !== 'io client disconnect') setLink('lost');
    });
    socket.on('connect_error', (err) => {
      const code = (err as Error & { data?: { code?: string } }).data?.code;
      if (code === 'unauthorized') {
        setLink('refused');
        // the session has ended: asking who is signed in answers 401, which leads to the sign-in page
        void queryClient.invalidateQueries({ queryKey: meQueryKey });
        socket.disconnect();
      } else {
        setLink('lost');
      }
    });
    socket.on('auth:error', () => {
      setLink('refused');
      void queryClient.invalidateQueries({ queryKey: meQueryKey });
    });

    socket.on('station:state', (p) => {
      if (p.stationId !== stationId) return;
      queryClient.setQueryData<StationStatus>(stationStatusQueryKey(stationId), (old) => (old ? statusWithState(old, p) : old));
      queryClient.setQueryData<StationSummary[]>(stationsQueryKey, (old) =>
        old?.map((s) => (s.id === stationId ? { ...s, state: p.state, reasons: p.reasons } : s)),
      );
      const runId = p.currentRunId;
      if (p.state === 'testing' && runId !== undefined && queryClient.getQueryData<LiveRun | null>(runKey)?.run.id !== runId) {
        // `run:started` normally follows at once; if it does not (the run began before this page joined),
        // load the run from the server
        window.clearTimeout(lateRunTimer);
        lateRunTimer = window.setTimeout(() => {
          if (queryClient.getQueryData<LiveRun | null>(runKey)?.run.id !== runId) void queryClient.invalidateQueries({ queryKey: runKey });
        }, LATE_RUN_MS);
      }
    });
    socket.on('run:started', (p) => {
      if (p.stationId !== stationId) return;
      queryClient.setQueryData<LiveRun | null>(runKey, (old) =>
        // the REST answer may have laid the run out already; keep what arrived since
        old && old.run.id === p.run.id ? { ...old, run: p.run, unit: p.unit, steps: p.steps } : runFromStarted(p),
      );
    });
    socket.on('step:started', (p) => {
      if (p.stationId === stationId) updateRun((live) => withStepStarted(live, p));
    });
    socket.on('measurement:judged', (p) => {
      if (p.stationId === stationId) updateRun((live) => withMeasurement(live, p));
    });
    socket.on('run:finished', (p) => {
      if (p.stationId !== stationId) return;
      const shown = queryClient.getQueryData<LiveRun | null>(runKey);
      updateRun((live) => withFinished(live, p));
      void queryClient.invalidateQueries({ queryKey: shiftSummaryQueryKey(stationId) });
      if (shown && shown.run.id === p.runId && !shown.finished) handlersRef.current.onRunFinished?.(p);
    });

    return () => {
      window.clearTimeout(lateRunTimer);
      socket.removeAllListeners();
      socket.disconnect();
    };
  }, [stationId, queryClient]);

  return link;
}
