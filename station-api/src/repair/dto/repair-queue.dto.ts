import { ApiProperty, ApiPropertyOptional, PickType } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsInt, Max, Min } from 'class-validator';
import { Optional } from '../../common/validation/presence';
import { BoardLotDto, BoardStationRefDto } from '../../board/dto/board.dto';
import { MeasurementDto } from '../../runs/dto/runs.dto';

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

export class RepairQueueDto {
  @ApiProperty({ type: [RepairQueueItemDto], description: 'oldest failure first' }) items!: RepairQueueItemDto[];
  @ApiProperty() total!: number;
}
