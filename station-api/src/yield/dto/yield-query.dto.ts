import { ApiPropertyOptional, ApiProperty } from '@nestjs/swagger';
import { Transform, Type } from 'class-transformer';
import { BREAKDOWN_DIMENSIONS, PARETO_DIMENSIONS, type BreakdownDimension, type ParetoDimension } from '../../contract/yield-views';
import { IsIn, IsInt, IsOptional, IsString, Matches, Max, MaxLength, Min, MinLength } from 'class-validator';

const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

/** Calendar day YYYY-MM-DD (plant local time), as a date input sends it; a full ISO time is accepted too. */
const DAY_OR_TIME = /^\d{4}-\d{2}-\d{2}([T ]\d{2}:\d{2}(:\d{2}(\.\d{1,3})?)?(Z|[+-]\d{2}:?\d{2})?)?$/;

/** The filters every yield view shares. Dates are calendar days in plant time; `to` includes its whole day. */
export class YieldFilterDto {
  @ApiPropertyOptional({ example: '2026-11-01', description: 'first day included (YYYY-MM-DD, plant local time)' })
  @IsOptional()
  @Transform(trim)
  @Matches(DAY_OR_TIME, { message: 'from must be a date written YYYY-MM-DD, e.g. 2026-11-01' })
  from?: string;

  @ApiPropertyOptional({ example: '2026-11-30', description: 'last day included (YYYY-MM-DD, plant local time)' })
  @IsOptional()
  @Transform(trim)
  @Matches(DAY_OR_TIME, { message: 'to must be a date written YYYY-MM-DD, e.g. 2026-11-30' })
  to?: string;

  @ApiPropertyOptional() @IsOptional() @Type(() => Number) @IsInt({ message: 'lotId must be a whole number (the id of a lot)' }) @Min(1, { message: 'lotId must be 1 or more' }) lotId?: number;
  @ApiPropertyOptional() @IsOptional() @Type(() => Number) @IsInt({ message: 'productId must be a whole number (the id of a product)' }) @Min(1, { message: 'productId must be 1 or more' }) productId?: number;
  @ApiPropertyOptional() @IsOptional() @Type(() => Number) @IsInt({ message: 'stationId must be a whole number (the id of a station)' }) @Min(1, { message: 'stationId must be 1 or more' }) stationId?: number;
}


export class YieldFiguresQueryDto extends YieldFilterDto {
  @ApiPropertyOptional({ enum: BREAKDOWN_DIMENSIONS, default: 'lot' })
  @IsOptional()
  @IsIn(BREAKDOWN_DIMENSIONS, { message: `by must be one of ${BREAKDOWN_DIMENSIONS.join(', ')}` })
  by?: BreakdownDimension;
}


export class ParetoQueryDto extends YieldFilterDto {
  @ApiPropertyOptional({ enum: PARETO_DIMENSIONS, default: 'step' })
  @IsOptional()
  @IsIn(PARETO_DIMENSIONS, { message: `by must be one of ${PARETO_DIMENSIONS.join(', ')}` })
  by?: ParetoDimension;
}

export class ParetoUnitsQueryDto extends ParetoQueryDto {
  @ApiProperty({ example: 'vout_nom', description: 'the bar: a step key (by=step) or "stepKey/quantity" (by=quantity)' })
  @Transform(trim)
  @IsString({ message: 'key must be the key of a Pareto bar' })
  @MinLength(1, { message: 'key is empty: give the key of a Pareto bar' })
  @MaxLength(200)
  key!: string;
}

/** Identifies one measured quantity: the step it belongs to and its key within the step. */
export class QuantityQueryDto extends YieldFilterDto {
  @ApiProperty({ example: 'vout_nom', description: 'step key' })
  @Transform(trim)
  @IsString({ message: 'step must be the key of a plan step' })
  @MinLength(1, { message: 'step is empty: give the key of a plan step' })
  @MaxLength(100)
  step!: string;

  @ApiProperty({ example: 'vout', description: 'quantity key within the step' })
  @Transform(trim)
  @IsString({ message: 'quantity must be the key of a measured quantity' })
  @MinLength(1, { message: 'quantity is empty: give the key of a measured quantity' })
  @MaxLength(100)
  quantity!: string;

  @ApiPropertyOptional({ default: 1, minimum: 1, maximum: 10, description: '1 = individuals; 2..10 consecutive units per subgroup' })
  @IsOptional()
  @Type(() => Number)
  @IsInt({ message: 'subgroupSize must be a whole number from 1 to 10' })
  @Min(1, { message: 'subgroupSize must be from 1 (individuals) to 10' })
  @Max(10, { message: 'subgroupSize must be from 1 (individuals) to 10' })
  subgroupSize?: number;
}

export const RULE_SETS = ['western-electric', 'nelson'] as const;

export class ControlChartQueryDto extends QuantityQueryDto {
  @ApiPropertyOptional({ enum: RULE_SETS, default: 'western-electric' })
  @IsOptional()
  @IsIn(RULE_SETS, { message: `rules must be one of ${RULE_SETS.join(', ')}` })
  rules?: (typeof RULE_SETS)[number];

  @ApiPropertyOptional({ default: 200, minimum: 2, maximum: 5000, description: 'the latest this many values (units) are charted' })
  @IsOptional()
  @Type(() => Number)
  @IsInt({ message: 'points must be a whole number from 2 to 5000' })
  @Min(2, { message: 'points must be from 2 to 5000' })
  @Max(5000, { message: 'points must be from 2 to 5000' })
  points?: number;
}

export class ExportQueryDto extends YieldFilterDto {
  @ApiPropertyOptional({ description: 'only this step (key)' }) @IsOptional() @Transform(trim) @IsString() @MinLength(1, { message: 'step is empty' }) @MaxLength(100) step?: string;
  @ApiPropertyOptional({ description: 'only this quantity (key within the step)' }) @IsOptional() @Transform(trim) @IsString() @MinLength(1, { message: 'quantity is empty' }) @MaxLength(100) quantity?: string;
  @ApiPropertyOptional({ enum: ['all', 'failing'], default: 'all', description: 'failing: only measurements judged fail or guard_fail' })
  @IsOptional()
  @IsIn(['all', 'failing'], { message: 'only must be all or failing' })
  only?: 'all' | 'failing';
}
