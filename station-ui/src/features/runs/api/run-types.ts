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

/** One expanded uncertainty (k = 2) a calibration certificate states, in the quantity's unit. */
export interface StatedUncertainty {
  quantity: string;
  name: string;
  unit: string;
  uncertainty: number;
}

/**
 * The calibration record a run was judged with (station-api CalibrationRecordDto), typed by hand until the lead
 * regenerates lib/api-types.ts. `current`: still the fixture's calibration in force.
 */
export interface RunCalibration {
  id: number;
  fixtureId: number;
  calibratedAt: string | null;
  dueAt: string;
  recordedAt: string;
  recordedBy: string | null;
  certificateNumber: string | null;
  voltageUncertaintyV: number;
  currentUncertaintyA: number;
  uncertainties: StatedUncertainty[];
  certificateFile: { fileName: string; sizeBytes: number; href: string } | null;
  current: boolean;
}

/**
 * `GET /api/runs/:id`: the run with every stored measurement, the plan steps it ran and the calibration record it
 * was judged with (null for runs from before calibration records were kept).
 */
export type RunDetail = Omit<RunDetailDto, 'calibration'> & { calibration: RunCalibration | null };
