import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform, Type } from 'class-transformer';
import { Equals, IsBoolean, IsIn, IsInt, IsISO8601, IsString, Max, MaxLength, Min, MinLength } from 'class-validator';
import type { LimitView, MeasurementView, RunView, StepOutline, UnitView } from '../../realtime/station-events';
import { Optional } from '../../common/validation/presence';
import { DECISIONS as DECISION_STATEMENTS, END_REASONS as RUN_END_REASONS } from '../../contract/run-outcome';
import { RUN_SORT_KEYS, type RunSort } from '../run-queries';
import { CalibrationRecordDto } from '../../fixtures/dto/calibration.dto';

const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class ScanDto {
  @ApiProperty({ example: 'K5A-2648-00017', description: 'the serial as scanned; surrounding spaces are ignored' })
  @Transform(trim)
  @IsString()
  @MinLength(1, { message: 'serial is empty: scan the unit label' })
  @MaxLength(64)
  serial!: string;
}

export class StartRunDto extends ScanDto {
  @ApiProperty({ example: true, description: 'the operator confirms the lid is closed and the unit clamped; must be true' })
  @IsBoolean()
  @Equals(true, { message: 'safetyConfirmed must be true: confirm the fixture is closed before power is applied' })
  safetyConfirmed!: boolean;

  @ApiPropertyOptional({ description: 'engineer only: why a unit that already passed is tested again' })
  @Optional()
  @Transform(trim)
  @IsString()
  @MinLength(5, { message: 'overrideReason must say why, in at least 5 characters' })
  @MaxLength(500)
  overrideReason?: string;
}

export const RUN_VERDICTS = ['running', 'pass', 'fail', 'error', 'aborted'] as const;
export { DECISIONS as DECISION_STATEMENTS, END_REASONS as RUN_END_REASONS } from '../../contract/run-outcome';

export class RunsQueryDto {
  @ApiPropertyOptional() @Optional() @Type(() => Number) @IsInt() @Min(1) stationId?: number;
  @ApiPropertyOptional() @Optional() @Type(() => Number) @IsInt() @Min(1) lotId?: number;
  @ApiPropertyOptional({ description: 'any part of the serial, any case (e.g. "00017" or "k5a-2648")' }) @Optional() @Transform(trim) @IsString() @MaxLength(64) serial?: string;
  @ApiPropertyOptional({ enum: RUN_VERDICTS }) @Optional() @IsIn(RUN_VERDICTS) verdict?: (typeof RUN_VERDICTS)[number];
  @ApiPropertyOptional({ description: 'runs started at or after (ISO 8601)' }) @Optional() @IsISO8601() from?: string;
  @ApiPropertyOptional({ description: 'runs started before (ISO 8601)' }) @Optional() @IsISO8601() to?: string;
  @ApiPropertyOptional({ enum: RUN_SORT_KEYS, default: 'startedAt', description: 'the column to sort by' })
  @Optional() @IsIn(RUN_SORT_KEYS, { message: `sort must be one of ${RUN_SORT_KEYS.join(', ')}` }) sort?: RunSort;
  @ApiPropertyOptional({ enum: ['asc', 'desc'], description: 'default: desc for startedAt (newest first), asc for every other column' })
  @Optional() @IsIn(['asc', 'desc'], { message: 'dir must be asc or desc' }) dir?: 'asc' | 'desc';
  @ApiPropertyOptional({ default: 50, maximum: 500 }) @Optional() @Type(() => Number) @IsInt() @Min(1) @Max(500) limit?: number;
  @ApiPropertyOptional({ default: 0 }) @Optional() @Type(() => Number) @IsInt() @Min(0) offset?: number;
}

export class LimitDto implements LimitView {
  @ApiProperty() key!: string;
  @ApiProperty() name!: string;
  @ApiProperty() unit!: string;
  @ApiPropertyOptional() low?: number;
  @ApiPropertyOptional() high?: number;
  @ApiPropertyOptional() uncertainty?: number;
  @ApiProperty({ enum: ['simple', 'guarded'] }) rule!: 'simple' | 'guarded';
}

export class StepOutlineDto implements StepOutline {
  @ApiProperty() key!: string;
  @ApiProperty() name!: string;
  @ApiProperty() kind!: string;
  @ApiProperty({ type: [LimitDto] }) limits!: LimitDto[];
}

export class RunDto implements RunView {
  @ApiProperty() id!: number;
  @ApiProperty() stationId!: number;
  @ApiProperty() stationCode!: string;
  @ApiProperty() unitId!: number;
  @ApiProperty() serial!: string;
  @ApiProperty() lotId!: number;
  @ApiProperty() lotCode!: string;
  @ApiProperty() productId!: number;
  @ApiProperty() partNumber!: string;
  @ApiProperty() planVersionId!: number;
  @ApiProperty() planCode!: string;
  @ApiProperty() planVersion!: number;
  @ApiPropertyOptional({ description: 'SHA-256 of the steps of the plan version the run used' }) planChecksum?: string;
  @ApiProperty() operatorId!: number;
  @ApiProperty() operatorName!: string;
  @ApiProperty() fixtureId!: number;
  @ApiProperty() fixtureCode!: string;
  @ApiProperty() attempt!: number;
  @ApiProperty({ enum: RUN_VERDICTS }) verdict!: RunView['verdict'];
  @ApiProperty() startedAt!: string;
  @ApiProperty({ type: String, nullable: true }) finishedAt!: string | null;
  @ApiProperty({ type: Number, nullable: true }) durationMs!: number | null;
  @ApiProperty({ type: String, nullable: true }) failedStepKey!: string | null;
  @ApiProperty({ type: String, nullable: true }) errorMessage!: string | null;
  @ApiProperty({ enum: RUN_END_REASONS, nullable: true, description: 'why the run ended without a judged verdict; null for pass, fail and running' })
  endReason!: RunView['endReason'];
  @ApiProperty({ type: String, nullable: true }) fixtureIdentity!: string | null;
  @ApiProperty({ type: String, nullable: true }) fixtureCalibrationDueAt!: string | null;
  @ApiProperty({ type: Number, nullable: true }) fixtureContactCycles!: number | null;
  @ApiProperty({ type: String, nullable: true }) overrideReason!: string | null;
  @ApiProperty({ type: String, nullable: true }) overrideByName!: string | null;
}

export class MeasurementDto implements MeasurementView {
  @ApiProperty() id!: number;
  @ApiProperty() runId!: number;
  @ApiProperty() stepIndex!: number;
  @ApiProperty() stepKey!: string;
  @ApiProperty() stepName!: string;
  @ApiProperty() quantity!: string;
  @ApiProperty() name!: string;
  @ApiProperty({ type: Number, nullable: true }) value!: number | null;
  @ApiProperty() unit!: string;
  @ApiProperty({ type: Number, nullable: true }) lowLimit!: number | null;
  @ApiProperty({ type: Number, nullable: true }) highLimit!: number | null;
  @ApiProperty({ type: Number, nullable: true }) guardedLow!: number | null;
  @ApiProperty({ type: Number, nullable: true }) guardedHigh!: number | null;
  @ApiProperty() uncertainty!: number;
  @ApiProperty() rule!: string;
  @ApiProperty({ enum: ['pass', 'fail', 'guard_fail'] }) verdict!: MeasurementView['verdict'];
  @ApiProperty({ enum: DECISION_STATEMENTS, nullable: true, description: 'ILAC-G8:09/2019 §4.2.3 decision statement; null without a plausible value' })
  decision!: MeasurementView['decision'];
  @ApiProperty({ type: Object, nullable: true }) raw!: Record<string, unknown> | null;
  @ApiProperty() startedAt!: string;
  @ApiProperty() measuredAt!: string;
}

export class UnitViewDto implements UnitView {
  @ApiProperty() id!: number;
  @ApiProperty() serial!: string;
  @ApiProperty({ enum: ['untested', 'passed', 'failed', 'in_repair', 'scrapped'] }) state!: UnitView['state'];
  @ApiProperty() testCount!: number;
  @ApiProperty() lotCode!: string;
  @ApiProperty() partNumber!: string;
  @ApiProperty({ type: String, nullable: true }) lastTestedAt!: string | null;
}

export class RunDetailDto extends RunDto {
  @ApiProperty({ type: [MeasurementDto] }) measurements!: MeasurementDto[];
  @ApiProperty({ type: [StepOutlineDto], description: 'the plan steps as they were run' }) steps!: StepOutlineDto[];
  @ApiProperty({
    type: CalibrationRecordDto,
    nullable: true,
    description:
      "the fixture's calibration record the run was judged with (its per-quantity uncertainties set the guard bands; `current` says whether it is still in force); null for runs from before calibration records were kept",
  })
  calibration!: CalibrationRecordDto | null;
}

export class RunListItemDto extends RunDto {
  @ApiProperty({ type: String, nullable: true, description: 'the failed step as its plan version names it (null: none failed, or a key the plan does not know)' })
  failedStepName!: string | null;
}

export class RunListDto {
  @ApiProperty({ type: [RunListItemDto] }) items!: RunListItemDto[];
  @ApiProperty() total!: number;
}

export class StartedRunDto {
  @ApiProperty({ type: RunDto }) run!: RunDto;
}

export class AbortResultDto {
  @ApiProperty() runId!: number;
  @ApiProperty({ enum: ['pass', 'fail', 'error', 'aborted'] }) verdict!: string;
  @ApiPropertyOptional() errorMessage?: string;
  @ApiPropertyOptional({ enum: RUN_END_REASONS }) endReason?: string;
}

class ScanLotDto {
  @ApiProperty() id!: number;
  @ApiProperty() code!: string;
  @ApiProperty() state!: string;
}

class ScanProductDto {
  @ApiProperty() id!: number;
  @ApiProperty() partNumber!: string;
  @ApiProperty() name!: string;
  @ApiProperty() vinNomV!: number;
  @ApiProperty() voutNomV!: number;
  @ApiProperty() ioutRatedA!: number;
}

class ScanPlanDto {
  @ApiProperty() versionId!: number;
  @ApiProperty() code!: string;
  @ApiProperty() name!: string;
  @ApiProperty() version!: number;
  @ApiProperty() stopAtFirstFailure!: boolean;
  @ApiProperty() maxAttempts!: number;
  @ApiProperty({ type: [StepOutlineDto] }) steps!: StepOutlineDto[];
}

export class ScanResultDto {
  @ApiProperty({ type: UnitViewDto }) unit!: UnitViewDto;
  @ApiProperty({ type: ScanLotDto }) lot!: ScanLotDto;
  @ApiProperty({ type: ScanProductDto }) product!: ScanProductDto;
  @ApiProperty({ description: 'the attempt this run would be (1 = first test)' }) attempt!: number;
  @ApiProperty({ type: ScanPlanDto }) plan!: ScanPlanDto;
}

class StatusFixtureDto {
  @ApiProperty() id!: number;
  @ApiProperty() code!: string;
  @ApiProperty() calibrationDueAt!: string;
  @ApiProperty() contactCyclesUsed!: number;
  @ApiProperty() contactCyclesAllowed!: number;
}

class StatusLotDto {
  @ApiProperty() id!: number;
  @ApiProperty() code!: string;
  @ApiProperty() partNumber!: string;
  @ApiProperty() state!: string;
}

export class StationStatusDto {
  @ApiProperty() stationId!: number;
  @ApiProperty() stationCode!: string;
  @ApiProperty() stationName!: string;
  @ApiProperty({ enum: ['idle', 'ready', 'testing', 'fault', 'blocked'] }) state!: 'idle' | 'ready' | 'testing' | 'fault' | 'blocked';
  @ApiProperty({ type: [String], description: 'why the station is not ready, in plain words' }) reasons!: string[];
  @ApiPropertyOptional() currentRunId?: number;
  @ApiPropertyOptional() currentSerial?: string;
  @ApiProperty({ type: StatusFixtureDto, nullable: true }) fixture!: StatusFixtureDto | null;
  @ApiProperty({ type: StatusLotDto, nullable: true }) activeLot!: StatusLotDto | null;
}
