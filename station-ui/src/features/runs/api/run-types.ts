import type { MeasurementDto, RunDetailDto, RunDto } from '@/lib/api-schema';

/*
 * The runs screens' REST shapes: the generated DTOs (station-ui/src/lib/api-types.ts), which carry the run's
 * end reason and each measurement's decision statement (ILAC-G8:09/2019 §4.2.3).
 */

/**
 * One run as `GET /api/runs` lists it. `failedStepName` (issue 12) is typed by hand until the lead regenerates
 * lib/api-types.ts: the failed step as its plan version names it (null: none failed).
 */
export type RunRow = RunDto & { failedStepName?: string | null };

/** The columns the server sorts the runs list by (station-api runs/run-queries.ts RUN_SORTS). */
export const RUN_SORT_COLUMNS = ['startedAt', 'serial', 'product', 'lot', 'station', 'fixture', 'operator', 'attempt', 'plan', 'verdict', 'failedStep', 'duration'] as const;
export type RunSortColumn = (typeof RUN_SORT_COLUMNS)[number];

/** One stored measurement with its decision statement. */
export type RunMeasurement = MeasurementDto;

/** `GET /api/runs/:id`: the run with every stored measurement and the plan steps it ran. */
export type RunDetail = RunDetailDto;
