import type { Decision, EndReason } from '@contract/run-outcome';
import type { MeasurementDto, RunDetailDto, RunDto } from '@/lib/api-schema';

/*
 * The runs screens' REST shapes: the generated DTOs. `endReason` and `decision` are added to the server's
 * views by the run-integrity work (interfaces §5, §6); until its DTOs publish them they are optional here.
 */

/** One run as `GET /api/runs` lists it. */
export type RunRow = RunDto & { endReason?: EndReason | null };

/** One stored measurement with its decision statement (ILAC-G8:09/2019 §4.2.3). */
export type RunMeasurement = MeasurementDto & { decision?: Decision | null };

/** `GET /api/runs/:id`: the run with every stored measurement and the plan steps it ran. */
export type RunDetail = Omit<RunDetailDto, 'measurements'> & { endReason?: EndReason | null; measurements: RunMeasurement[] };
