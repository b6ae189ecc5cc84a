import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform, Type } from 'class-transformer';
import { IsIn, IsInt, IsNumber, IsOptional, IsString, Max, MaxLength, Min, MinLength } from 'class-validator';
import { DEFAULT_SUGGESTION_K, SUGGESTION_K_MAX, SUGGESTION_K_MIN } from '../../contract/limit-suggestion';

const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);
const finite = (field: string) => ({ message: `${field} must be a number, written with a point (e.g. 5.012)` });

/** The text fields sent beside the file (multipart/form-data). */
export class UploadDataSetDto {
  @ApiProperty({ example: 'OB-BK0503 pilot build P2', description: 'a name that tells the data set apart; unique' })
  @Transform(trim)
  @IsString({ message: 'name must be text: the name of the data set' })
  @MinLength(3, { message: 'name must have at least 3 characters, e.g. "OB-BK0503 pilot build P2"' })
  @MaxLength(120, { message: 'name must have at most 120 characters' })
  name!: string;

  @ApiPropertyOptional({ example: 'OB-BK0503', description: 'part number of the product the pilot units are' })
  @IsOptional()
  @Transform(trim)
  @IsString({ message: 'product must be a part number, e.g. OB-BK0503' })
  @MaxLength(60)
  product?: string;
}

/** A quantity of a data set and, optionally, proposed limits (one-sided allowed) and the suggestion's settings. */
export class AnalysisQueryDto {
  @ApiProperty({ example: 'vout_1.5A_V', description: 'column key as written in the file header' })
  @IsString({ message: 'column must name a quantity column of the data set, e.g. vout_V' })
  @MinLength(1, { message: 'column is empty: name a quantity column of the data set' })
  @MaxLength(120)
  column!: string;

  @ApiPropertyOptional({ description: 'proposed low limit, unit of the column' })
  @IsOptional() @Type(() => Number) @IsNumber({ allowNaN: false, allowInfinity: false }, finite('low'))
  low?: number;

  @ApiPropertyOptional({ description: 'proposed high limit, unit of the column' })
  @IsOptional() @Type(() => Number) @IsNumber({ allowNaN: false, allowInfinity: false }, finite('high'))
  high?: number;

  @ApiPropertyOptional({ description: `suggested limits at mean ± k·s; default ${DEFAULT_SUGGESTION_K}`, minimum: SUGGESTION_K_MIN, maximum: SUGGESTION_K_MAX })
  @IsOptional() @Type(() => Number) @IsNumber({ allowNaN: false, allowInfinity: false }, finite('k'))
  @Min(SUGGESTION_K_MIN, { message: `k must be at least ${SUGGESTION_K_MIN}` }) @Max(SUGGESTION_K_MAX, { message: `k must be at most ${SUGGESTION_K_MAX}` })
  k?: number;

  @ApiPropertyOptional({ description: 'expanded uncertainty U (k = 2) the suggested limits are guarded by; default 0' })
  @IsOptional() @Type(() => Number) @IsNumber({ allowNaN: false, allowInfinity: false }, finite('uncertainty'))
  @Min(0, { message: 'uncertainty must be 0 or more' })
  uncertainty?: number;
}

/** Proposed limits put into one limit of a draft plan version. */
export class AcceptLimitsDto {
  @ApiProperty({ example: 'vout_1.5A_V' })
  @IsString({ message: 'column must name a quantity column of the data set' }) @MinLength(1) @MaxLength(120)
  column!: string;

  @ApiProperty({ description: 'id of a draft plan version' })
  @Type(() => Number) @IsInt({ message: 'planVersionId must be the id of a draft plan version' }) @Min(1)
  planVersionId!: number;

  @ApiProperty({ example: 'vout-load' })
  @IsString({ message: 'stepKey must be the key of a step of the version' }) @MinLength(1) @MaxLength(100)
  stepKey!: string;

  @ApiProperty({ example: 'voutV@1.5' })
  @IsString({ message: 'limitKey must be the key of a limit of the step' }) @MinLength(1) @MaxLength(100)
  limitKey!: string;

  @ApiPropertyOptional({ description: 'new low limit; leave out for an upper limit only' })
  @IsOptional() @IsNumber({ allowNaN: false, allowInfinity: false }, finite('low'))
  low?: number;

  @ApiPropertyOptional({ description: 'new high limit; leave out for a lower limit only' })
  @IsOptional() @IsNumber({ allowNaN: false, allowInfinity: false }, finite('high'))
  high?: number;

  @ApiPropertyOptional({
    description: `k of the suggestion the engineer chose (limits at mean ± k·s), recorded in the audit trail with the suggested and guarded limits; default ${DEFAULT_SUGGESTION_K}`,
    minimum: SUGGESTION_K_MIN,
    maximum: SUGGESTION_K_MAX,
  })
  @IsOptional() @IsNumber({ allowNaN: false, allowInfinity: false }, finite('k'))
  @Min(SUGGESTION_K_MIN, { message: `k must be at least ${SUGGESTION_K_MIN}` }) @Max(SUGGESTION_K_MAX, { message: `k must be at most ${SUGGESTION_K_MAX}` })
  k?: number;

  @ApiPropertyOptional({ description: 'expanded uncertainty U (k = 2); the limit keeps its own when left out. Also the U the recorded suggestion is guarded by (0 when left out)' })
  @IsOptional() @IsNumber({ allowNaN: false, allowInfinity: false }, finite('uncertainty')) @Min(0, { message: 'uncertainty must be 0 or more' })
  uncertainty?: number;

  @ApiPropertyOptional({ enum: ['simple', 'guarded'], description: 'decision rule; the limit keeps its own when left out' })
  @IsOptional() @IsIn(['simple', 'guarded'], { message: 'rule must be "simple" or "guarded"' })
  rule?: 'simple' | 'guarded';

  @ApiProperty({ description: 'why these limits, in plain words' })
  @IsString({ message: 'reason must say why these limits' })
  @MinLength(3, { message: 'reason must say why these limits (at least 3 characters)' })
  @MaxLength(500)
  reason!: string;
}
