import { useQueryClient } from '@tanstack/react-query';
import type { RunFinishedPayload, StationStatePayload } from '@station-events';
import { useEffect, useMemo, useRef } from 'react';
import { tokenStore } from '@/lib/api-client';
import type { LiveLinkState } from '@/lib/socket';
import { linkStateOf, useLiveSocket, type LiveHandlers, type LiveRoom } from '@/lib/use-live-socket';
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
    warnings: p.warnings ?? [],
    ...(p.currentRunId !== undefined ? { currentRunId: p.currentRunId } : {}),
    ...(p.currentSerial !== undefined ? { currentSerial: p.currentSerial } : {}),
  } as StationStatus;
}

/**
 * Joins the station's room through the shared socket lifecycle (lib/use-live-socket.ts: connect, rejoin after
 * a reconnect, a refused session leads to the sign-in page) and writes every event into the query cache: the
 * status, the run on screen, the shift counters. Returns how the link stands. After a lost link it refetches,
 * because events sent meanwhile are gone.
 */
export function useStationLive(stationId: number, handlers: StationLiveHandlers = {}): LiveLinkState {
  const queryClient = useQueryClient();
  const handlersRef = useRef(handlers);
  handlersRef.current = handlers;
  const lateRunTimer = useRef<number | undefined>(undefined);
  useEffect(() => () => window.clearTimeout(lateRunTimer.current), [stationId]);

  const rooms = useMemo<readonly LiveRoom[]>(() => [{ event: 'station:join', body: { stationId } }], [stationId]);

  const live = useMemo(() => {
    const runKey = liveRunQueryKey(stationId);
    const shownRun = () => queryClient.getQueryData<LiveRun | null>(runKey);
    const updateRun = (fn: (run: LiveRun) => LiveRun) => queryClient.setQueryData<LiveRun | null>(runKey, (old) => (old ? fn(old) : old));
    const on: LiveHandlers = {
      'station:state': (p) => {
        if (p.stationId !== stationId) return;
        queryClient.setQueryData<StationStatus>(stationStatusQueryKey(stationId), (old) => (old ? statusWithState(old, p) : old));
        queryClient.setQueryData<StationSummary[]>(stationsQueryKey, (old) =>
          old?.map((s) => (s.id === stationId ? { ...s, state: p.state, reasons: p.reasons } : s)),
        );
        const runId = p.currentRunId;
        if (p.state === 'testing' && runId !== undefined && shownRun()?.run.id !== runId) {
          // `run:started` normally follows at once; if it does not (the run began before this page joined),
          // load the run from the server
          window.clearTimeout(lateRunTimer.current);
          lateRunTimer.current = window.setTimeout(() => {
            if (shownRun()?.run.id !== runId) void queryClient.invalidateQueries({ queryKey: runKey });
          }, LATE_RUN_MS);
        }
      },
      'run:started': (p) => {
        if (p.stationId !== stationId) return;
        queryClient.setQueryData<LiveRun | null>(runKey, (old) =>
          // the REST answer may have laid the run out already; keep what arrived since
          old && old.run.id === p.run.id ? { ...old, run: p.run, unit: p.unit, steps: p.steps } : runFromStarted(p),
        );
      },
      'step:started': (p) => {
        if (p.stationId === stationId) updateRun((run) => withStepStarted(run, p));
      },
      'measurement:judged': (p) => {
        if (p.stationId === stationId) updateRun((run) => withMeasurement(run, p));
      },
      'run:finished': (p) => {
        if (p.stationId !== stationId) return;
        const shown = shownRun();
        updateRun((run) => withFinished(run, p));
        void queryClient.invalidateQueries({ queryKey: shiftSummaryQueryKey(stationId) });
        if (shown && shown.run.id === p.runId && !shown.finished) handlersRef.current.onRunFinished?.(p);
      },
    };
    const onJoined = ({ rejoin }: { rejoin: boolean }) => {
      // The join replays the last state the server published, which can be older than the status just
      // fetched (a settings change publishes nothing); the status computed now wins.
      void queryClient.invalidateQueries({ queryKey: stationStatusQueryKey(stationId) });
      if (rejoin) {
        // events sent while the link was down are lost: ask for the present state again
        void queryClient.invalidateQueries({ queryKey: runKey });
        void queryClient.invalidateQueries({ queryKey: shiftSummaryQueryKey(stationId) });
      }
    };
    return { on, onJoined };
  }, [queryClient, stationId]);

  // no onAuthError: the shared default asks who is signed in, which answers 401 and leads to the sign-in page
  const state = useLiveSocket({ token: tokenStore.get(), rooms, on: live.on, onJoined: live.onJoined });
  return linkStateOf(state);
}
