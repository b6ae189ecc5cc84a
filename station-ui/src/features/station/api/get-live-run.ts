import { queryOptions, type QueryClient } from '@tanstack/react-query';
import type { UnitView } from '@station-events';
import { mergeLiveRuns, runFromDetail, type LiveRun } from '../live-run';
import { getRun, type RunDetail } from './get-run';
import { getStationStatus } from './get-station-status';

/**
 * The run shown on a station's screen. Socket events write it (hooks/use-station-live.ts); this fetch
 * only fills it at page load and after a lost live link, from the station's current run or the run
 * already on screen (so a verdict reached while the link was down still shows).
 */
export const liveRunQueryKey = (stationId: number) => ['stations', stationId, 'live-run'] as const;

/** The run detail has no unit block; the run carries enough to name the unit. */
function unitFromRun(detail: RunDetail): UnitView {
  return {
    id: detail.unitId,
    serial: detail.serial,
    state: detail.verdict === 'pass' ? 'passed' : detail.verdict === 'fail' ? 'failed' : 'untested',
    testCount: detail.attempt,
    lotCode: detail.lotCode,
    partNumber: detail.partNumber,
    lastTestedAt: detail.finishedAt,
  };
}

/**
 * @param cached reads the run in the cache; asked before the fetch (which run to reload) and after it, so
 *   events that arrived during the fetch are merged in rather than overwritten
 */
export async function loadLiveRun(stationId: number, cached: () => LiveRun | null | undefined): Promise<LiveRun | null> {
  const status = await getStationStatus(stationId);
  const known = cached();
  const runId = status.currentRunId ?? known?.run.id;
  if (!runId) return cached() ?? null;
  const detail = await getRun(runId);
  const unit = known && known.run.id === runId ? known.unit : unitFromRun(detail);
  const now = cached();
  return mergeLiveRuns(runFromDetail(detail, unit, now ?? known), now);
}

export const liveRunQueryOptions = (stationId: number, queryClient: QueryClient) =>
  queryOptions({
    queryKey: liveRunQueryKey(stationId),
    queryFn: () => loadLiveRun(stationId, () => queryClient.getQueryData<LiveRun | null>(liveRunQueryKey(stationId))),
    staleTime: Infinity,
  });
