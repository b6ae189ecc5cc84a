import type { MeasurementDto, RunDetailDto, RunDto } from '@/lib/api-schema';

/*
 * The runs screens' REST shapes: the generated DTOs (station-ui/src/lib/api-types.ts), which carry the run's
 * end reason and each measurement's decision statement (ILAC-G8:09/2019 §4.2.3).
 */

/** One run as `GET /api/runs` lists it. */
export type RunRow = RunDto;

/** One stored measurement with its decision statement. */
export type RunMeasurement = MeasurementDto;

/** `GET /api/runs/:id`: the run with every stored measurement and the plan steps it ran. */
export type RunDetail = RunDetailDto;
