import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { IsDateString, IsIn, IsInt, IsOptional, Max, Min } from 'class-validator';

export class WhatIfRequestDto {
  @ApiProperty({ enum: ['last_units', 'lot', 'dates'], description: 'which stored units to re-judge' })
  @IsIn(['last_units', 'lot', 'dates'], { message: 'scope must be last_units, lot or dates' })
  scope!: 'last_units' | 'lot' | 'dates';

  @ApiPropertyOptional({ description: 'scope last_units: how many of the most recently tested units', minimum: 1, maximum: 100000 })
  @IsOptional() @IsInt() @Min(1) @Max(100_000)
  units?: number;

  @ApiPropertyOptional({ description: 'scope lot: the lot id' })
  @IsOptional() @IsInt() @Min(1)
  lotId?: number;

  @ApiPropertyOptional({ description: 'scope dates: first test on or after (ISO 8601)' })
  @IsOptional() @IsDateString({}, { message: 'from must be a date like 2026-11-30 or 2026-11-30T08:00:00Z' })
  from?: string;

  @ApiPropertyOptional({ description: 'scope dates: first test on or before (ISO 8601)' })
  @IsOptional() @IsDateString({}, { message: 'to must be a date like 2026-12-01 or 2026-12-01T18:00:00Z' })
  to?: string;
}

export class IntervalDto {
  @ApiProperty() x!: number;
  @ApiProperty() n!: number;
  @ApiProperty({ nullable: true, type: Number }) estimate!: number | null;
  @ApiProperty() lower!: number;
  @ApiProperty() upper!: number;
  @ApiProperty() confidence!: number;
  @ApiProperty() method!: string;
}

export class WhatIfResultDto {
  @ApiProperty() planVersionId!: number;
  @ApiProperty({ description: 'the scope in words' }) scopeText!: string;
  @ApiProperty() unitsInScope!: number;
  @ApiProperty() measurementsJudged!: number;
  @ApiProperty() passToFail!: number;
  @ApiProperty() failToPass!: number;
  @ApiProperty({ description: 'units whose stored run stopped before limits others were measured on' }) unknown!: number;
  @ApiProperty({ type: 'array', items: { type: 'object' } }) perStep!: { stepKey: string; stepName: string; passToFail: number; failToPass: number }[];
  @ApiProperty({ type: 'array', items: { type: 'object' } }) perLimit!: unknown[];
  @ApiProperty({ type: 'array', items: { type: 'object' } }) unmeasuredLimits!: { stepKey: string; limitKey: string }[];
  @ApiProperty({ type: IntervalDto }) currentFpy!: IntervalDto;
  @ApiProperty({ type: IntervalDto }) predictedFpy!: IntervalDto;
  @ApiProperty({ type: 'array', items: { type: 'object' }, description: 'units changing verdict, each with its run' }) affected!: unknown[];
  @ApiProperty() elapsedMs!: number;
}
