import { ApiProperty, ApiPropertyOptional, OmitType } from '@nestjs/swagger';
import { Transform, Type } from 'class-transformer';
import { IsInt, IsString, Max, MaxLength, Min, MinLength } from 'class-validator';
import { Optional } from '../../common/validation/presence';
import { YieldFilterDto } from '../../yield/dto/yield-query.dto';

export class RepairRecordCauseDto {
  @ApiProperty() id!: number;
  @ApiProperty() name!: string;
}

export class RepairRecordPersonDto {
  @ApiProperty() id!: number;
  @ApiProperty() displayName!: string;
}

export class RepairRecordDto {
  @ApiProperty() id!: number;
  @ApiProperty() unitId!: number;
  @ApiProperty() serial!: string;
  @ApiProperty() symptom!: string;
  @ApiProperty({ type: RepairRecordCauseDto }) cause!: RepairRecordCauseDto;
  @ApiProperty() actionTaken!: string;
  @ApiProperty({ enum: ['retest', 'scrapped'], description: 'retest: eligible for retest; scrapped' }) disposition!: 'retest' | 'scrapped';
  @ApiProperty({ type: RepairRecordPersonDto }) technician!: RepairRecordPersonDto;
  @ApiProperty({ description: 'ISO 8601' }) recordedAt!: string;
  @ApiProperty({ type: Number, nullable: true, description: 'the unit’s last failing run when the record was written' }) failedRunId!: number | null;
  @ApiProperty({ type: Number, nullable: true, description: 'the record this one corrects' }) correctsId!: number | null;
  @ApiProperty({ type: String, nullable: true }) correctionReason!: string | null;
  @ApiProperty({ type: Number, nullable: true, description: 'the newer record that corrects this one (null: current)' }) correctedById!: number | null;
}

export class RepairRecordListDto {
  @ApiProperty({ type: [RepairRecordDto], description: 'newest first' }) items!: RepairRecordDto[];
  @ApiProperty() total!: number;
}

export class RepairRecordQueryDto {
  @ApiPropertyOptional({ description: 'the whole serial (any case)' })
  @Optional()
  @Transform(({ value }) => (typeof value === 'string' ? value.trim() : value))
  @IsString()
  @MinLength(1, { message: 'serial is empty' })
  @MaxLength(64, { message: 'serial must be at most 64 characters' })
  serial?: string;

  @ApiPropertyOptional({ default: 50, maximum: 500 })
  @Optional() @Type(() => Number) @IsInt({ message: 'limit must be a whole number' }) @Min(1, { message: 'limit must be 1 or more' }) @Max(500, { message: 'limit must be at most 500' })
  limit?: number;

  @ApiPropertyOptional({ default: 0 })
  @Optional() @Type(() => Number) @IsInt({ message: 'offset must be a whole number' }) @Min(0, { message: 'offset must be 0 or more' })
  offset?: number;
}

/** The yield Pareto's filters (lot, product, date range); a repair has no station of its own. */
export class RepairParetoQueryDto extends OmitType(YieldFilterDto, ['stationId'] as const) {}

export class RepairParetoBarDto {
  @ApiProperty({ description: 'the cause name (as it is called today)' }) key!: string;
  @ApiProperty() label!: string;
  @ApiProperty() causeId!: number;
  @ApiProperty() count!: number;
  @ApiProperty({ description: 'share of all records, percent' }) percent!: number;
  @ApiProperty() cumulativeCount!: number;
  @ApiProperty({ description: 'running total, percent; the last bar is 100' }) cumulativePercent!: number;
}

export class RepairParetoDto {
  @ApiProperty({ description: 'current repair records in the filter (a corrected record counts through its correction only)' }) records!: number;
  @ApiProperty({ type: [RepairParetoBarDto], description: 'largest first' }) bars!: RepairParetoBarDto[];
}
