import { ApiProperty, ApiPropertyOptional, PickType } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsIn, IsInt, IsString, Max, MaxLength, Min, MinLength } from 'class-validator';
import { Transform } from 'class-transformer';
import { Optional } from '../../common/validation/presence';
import { BoardLotDto, BoardStationRefDto } from '../../board/dto/board.dto';
import { MeasurementDto } from '../../runs/dto/runs.dto';
import { QUEUE_SORTS, type QueueSort } from '../repair-queue-sql';

const SORT_KEYS = Object.keys(QUEUE_SORTS) as QueueSort[];
const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class RepairQueueQueryDto {
  @ApiPropertyOptional({ description: 'only units of this lot' })
  @Optional() @Type(() => Number) @IsInt({ message: 'lotId must be a whole number' }) @Min(1, { message: 'lotId must be 1 or more' })
  lotId?: number;

  @ApiPropertyOptional({ description: 'only units whose last failing run was on this station' })
  @Optional() @Type(() => Number) @IsInt({ message: 'stationId must be a whole number' }) @Min(1, { message: 'stationId must be 1 or more' })
  stationId?: number;

  @ApiPropertyOptional({ enum: ['failed', 'in_repair'], description: 'only units in this state' })
  @Optional() @IsIn(['failed', 'in_repair'], { message: 'state must be failed or in_repair' })
  state?: 'failed' | 'in_repair';

  @ApiPropertyOptional({ example: 'vout_nom', description: 'only units whose last failing run failed this step (step key)' })
  @Optional() @Transform(trim) @IsString({ message: 'step must be the key of a plan step' }) @MinLength(1, { message: 'step is empty' }) @MaxLength(100, { message: 'step must be at most 100 characters' })
  step?: string;

  @ApiPropertyOptional({ example: '00017', description: 'any part of the serial, any case (a scanned repair tag gives the whole serial)' })
  @Optional() @Transform(trim) @IsString({ message: 'search must be text' }) @MaxLength(64, { message: 'search must be at most 64 characters (a serial)' })
  search?: string;

  @ApiPropertyOptional({ enum: SORT_KEYS, default: 'failedAt' })
  @Optional() @IsIn(SORT_KEYS, { message: `sort must be one of ${SORT_KEYS.join(', ')}` })
  sort?: QueueSort;

  @ApiPropertyOptional({ enum: ['asc', 'desc'], default: 'asc' })
  @Optional() @IsIn(['asc', 'desc'], { message: 'dir must be asc or desc' })
  dir?: 'asc' | 'desc';

  @ApiPropertyOptional({ default: 25, maximum: 1000 })
  @Optional() @Type(() => Number) @IsInt({ message: 'limit must be a whole number' }) @Min(1, { message: 'limit must be 1 or more' }) @Max(1000, { message: 'limit must be at most 1000' })
  limit?: number;

  @ApiPropertyOptional({ default: 0 })
  @Optional() @Type(() => Number) @IsInt({ message: 'offset must be a whole number' }) @Min(0, { message: 'offset must be 0 or more' })
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
  @ApiProperty({
    enum: ['no_attempts_left', 'sent_by_operator', 'in_repair'],
    description: 'why the unit is on the queue: a failed unit with attempts left is not (it may be re-seated and tested again)',
  })
  reason!: 'no_attempts_left' | 'sent_by_operator' | 'in_repair';
  @ApiProperty({ type: String, nullable: true, description: 'when the operator sent it to repair (ISO 8601); null: not sent' })
  sentToRepairAt!: string | null;
  @ApiProperty() testCount!: number;
  @ApiProperty({ type: BoardLotDto }) lot!: BoardLotDto;
  @ApiProperty({ type: RepairRunDto, nullable: true, description: 'null only if no failing run is stored for the unit' })
  lastFailingRun!: RepairRunDto | null;
}

export class RepairQueueStepDto {
  @ApiProperty() key!: string;
  @ApiProperty() name!: string;
}

export class RepairQueueDto {
  @ApiProperty({ type: [RepairQueueItemDto], description: 'one page; oldest failure first unless sorted otherwise' }) items!: RepairQueueItemDto[];
  @ApiProperty({ description: 'units matching the filters (all pages)' }) total!: number;
  @ApiProperty({ type: [RepairQueueStepDto], description: 'the failed steps in the queue as filtered (except by step), to filter by' }) steps!: RepairQueueStepDto[];
}
