import { ApiProperty, ApiPropertyOptional, PickType } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsInt, Max, Min } from 'class-validator';
import type { RunVerdictName, StationState } from '../../realtime/station-events';
import { MeasurementDto } from '../../runs/dto/runs.dto';
import { Optional } from '../../common/validation/presence';

const STATES: StationState[] = ['idle', 'ready', 'testing', 'fault', 'blocked'];
const VERDICTS: RunVerdictName[] = ['running', 'pass', 'fail', 'error', 'aborted'];

/** Counters of one station in the current shift; definitions in src/floor/shift.ts (summarizeShift). */
export class ShiftSummaryDto {
  @ApiProperty() stationId!: number;
  @ApiProperty({ example: 'Shift 1 (06:00–14:00)' }) shiftName!: string;
  @ApiProperty({ description: 'inclusive, ISO 8601' }) shiftStart!: string;
  @ApiProperty({ description: 'exclusive, ISO 8601' }) shiftEnd!: string;
  @ApiProperty({ description: 'distinct units with a pass or fail run finished here in the shift' }) tested!: number;
  @ApiProperty({ description: 'of the tested units, those whose latest run in the shift passed' }) passed!: number;
  @ApiProperty({ description: 'of the tested units, those whose latest run in the shift failed' }) failed!: number;
  @ApiProperty({ description: 'runs ended by a fixture or software error (runs, not units)' }) errors!: number;
  @ApiProperty({ description: 'runs aborted (runs, not units)' }) aborted!: number;
  @ApiProperty({
    type: Number,
    nullable: true,
    description: 'units whose first-ever test (attempt 1) passed ÷ units first tested here in this shift, in %; null when none',
  })
  firstPassYieldPct!: number | null;
  @ApiProperty({ type: Number, nullable: true, description: 'pass/fail runs per hour of shift elapsed (at least 1 minute counted); null before the first' })
  unitsPerHour!: number | null;
}

export class BoardStationRefDto {
  @ApiProperty() id!: number;
  @ApiProperty() code!: string;
  @ApiProperty() name!: string;
}

export class BoardFixtureDto {
  @ApiProperty() code!: string;
  @ApiProperty({ description: 'ISO 8601' }) calibrationDueAt!: string;
}

export class BoardLotDto {
  @ApiProperty() id!: number;
  @ApiProperty() code!: string;
  @ApiProperty() partNumber!: string;
}

export class BoardCurrentRunDto {
  @ApiProperty() id!: number;
  @ApiProperty() serial!: string;
  @ApiProperty({ description: '0-based index of the step in progress' }) stepIndex!: number;
  @ApiProperty() stepCount!: number;
  @ApiProperty({ type: String, nullable: true }) stepName!: string | null;
  @ApiProperty({ description: 'ISO 8601' }) startedAt!: string;
}

export class BoardLastRunDto {
  @ApiProperty() id!: number;
  @ApiProperty() serial!: string;
  @ApiProperty({ enum: VERDICTS }) verdict!: RunVerdictName;
  @ApiProperty({ type: String, nullable: true }) failedStepKey!: string | null;
  @ApiProperty({ description: 'ISO 8601' }) finishedAt!: string;
}

export class BoardEntryDto {
  @ApiProperty({ type: BoardStationRefDto }) station!: BoardStationRefDto;
  @ApiProperty({ enum: STATES }) state!: StationState;
  @ApiProperty({ type: [String], description: 'why the station is not ready, in plain words' }) reasons!: string[];
  @ApiProperty({ type: BoardFixtureDto, nullable: true }) fixture!: BoardFixtureDto | null;
  @ApiProperty({ type: BoardLotDto, nullable: true }) activeLot!: BoardLotDto | null;
  @ApiProperty({ type: BoardCurrentRunDto, nullable: true }) currentRun!: BoardCurrentRunDto | null;
  @ApiProperty({ type: [BoardLastRunDto], description: 'the last 8 finished runs, newest first' }) lastRuns!: BoardLastRunDto[];
  @ApiProperty({ type: ShiftSummaryDto }) shift!: ShiftSummaryDto;
}

export class RepairQueueQueryDto {
  @ApiPropertyOptional({ description: 'only units of this lot' })
  @Optional() @Type(() => Number) @IsInt({ message: 'lotId must be a whole number' }) @Min(1, { message: 'lotId must be 1 or more' })
  lotId?: number;

  @ApiPropertyOptional({ description: 'only units whose last failing run was on this station' })
  @Optional() @Type(() => Number) @IsInt({ message: 'stationId must be a whole number' }) @Min(1, { message: 'stationId must be 1 or more' })
  stationId?: number;

  @ApiPropertyOptional({ default: 200, maximum: 1000 })
  @Optional() @Type(() => Number) @IsInt() @Min(1) @Max(1000, { message: 'limit must be at most 1000' })
  limit?: number;

  @ApiPropertyOptional({ default: 0 })
  @Optional() @Type(() => Number) @IsInt() @Min(0)
  offset?: number;
}

/** The first measurement of a run that did not pass: the run views' measurement fields that a repair bench needs. */
export class RepairFailureDto extends PickType(MeasurementDto, [
  'stepKey',
  'stepName',
  'quantity',
  'name',
  'value',
  'unit',
  'lowLimit',
  'highLimit',
  'guardedLow',
  'guardedHigh',
  'verdict',
] as const) {}

export class RepairRunDto {
  @ApiProperty() id!: number;
  @ApiProperty({ type: BoardStationRefDto }) station!: BoardStationRefDto;
  @ApiProperty() attempt!: number;
  @ApiProperty({ type: String, nullable: true }) failedStepKey!: string | null;
  @ApiProperty({ description: 'ISO 8601' }) finishedAt!: string;
  @ApiProperty({ type: RepairFailureDto, nullable: true, description: 'the first measurement that did not pass' })
  firstFailure!: RepairFailureDto | null;
}

export class RepairQueueItemDto {
  @ApiProperty() unitId!: number;
  @ApiProperty() serial!: string;
  @ApiProperty({ enum: ['failed', 'in_repair'] }) state!: 'failed' | 'in_repair';
  @ApiProperty() testCount!: number;
  @ApiProperty({ type: BoardLotDto }) lot!: BoardLotDto;
  @ApiProperty({ type: RepairRunDto, nullable: true, description: 'null only if no failing run is stored for the unit' })
  lastFailingRun!: RepairRunDto | null;
}

export class RepairQueueDto {
  @ApiProperty({ type: [RepairQueueItemDto], description: 'oldest failure first' }) items!: RepairQueueItemDto[];
  @ApiProperty() total!: number;
}
