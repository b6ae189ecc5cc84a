import type { MeasurementView, RunView, StepOutline } from '@station-events';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

/** `GET /api/runs/:id`: the run with every stored measurement and the plan steps it ran. */
export type RunDetail = RunView & { measurements: MeasurementView[]; steps: StepOutline[] };

export function getRun(runId: number): Promise<RunDetail> {
  return api.get<RunDetail>(apiPaths.run(runId));
}
