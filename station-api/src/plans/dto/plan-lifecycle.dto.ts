import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { ArrayMaxSize, ArrayMinSize, IsArray, IsBoolean, IsInt, IsOptional, IsString, Max, MaxLength, Min, MinLength } from 'class-validator';

export class UpdateDraftDto {
  @ApiPropertyOptional({ description: 'steps in the plan-definition shape (replaces all steps)', type: 'array', items: { type: 'object' } })
  @IsOptional() @IsArray() @ArrayMinSize(1) @ArrayMaxSize(100)
  steps?: unknown[];

  @ApiPropertyOptional() @IsOptional() @IsBoolean() stopAtFirstFailure?: boolean;

  @ApiPropertyOptional({ minimum: 1, maximum: 10 }) @IsOptional() @IsInt() @Min(1) @Max(10) maxAttempts?: number;

  @ApiPropertyOptional({ description: 'why the draft exists (kept as the version reason)' })
  @IsOptional() @IsString() @MinLength(3, { message: 'reason must say why the version is needed (at least 3 characters)' }) @MaxLength(500)
  reason?: string;
}

export class ChangeReasonDto {
  @ApiProperty({ description: 'what changed and why, in plain words' })
  @IsString() @MinLength(3, { message: 'reason must say what changed and why (at least 3 characters)' }) @MaxLength(500)
  reason!: string;
}

export class PreviewStepsDto {
  @ApiProperty({ description: 'draft steps as the editor holds them', type: 'array', items: { type: 'object' } })
  @IsArray() @ArrayMaxSize(100)
  steps!: unknown[];
}

export class ImportIssueDto {
  @ApiProperty({ example: 'steps[3].limits[0].high' }) field!: string;
  @ApiProperty({ description: '1-based line in the file; 0 when the problem has no single place' }) line!: number;
  @ApiProperty() column!: number;
  @ApiProperty() message!: string;
}

export class ValueChangeDto {
  @ApiProperty({ example: 'limits[voutV@1.5].high' }) field!: string;
  @ApiProperty({ nullable: true }) before!: unknown;
  @ApiProperty({ nullable: true }) after!: unknown;
}

export class StepRefDto {
  @ApiProperty() key!: string;
  @ApiProperty() name!: string;
  @ApiProperty() kind!: string;
  @ApiProperty({ description: '1-based position in its version' }) position!: number;
}

export class StepChangeDto {
  @ApiProperty() key!: string;
  @ApiProperty() name!: string;
  @ApiProperty() kind!: string;
  @ApiProperty({ type: [ValueChangeDto] }) changes!: ValueChangeDto[];
}

export class ReorderDto {
  @ApiProperty() key!: string;
  @ApiProperty() name!: string;
  @ApiProperty() from!: number;
  @ApiProperty() to!: number;
}

export class PlanComparisonDto {
  @ApiProperty() fromVersionId!: number;
  @ApiProperty() toVersionId!: number;
  @ApiProperty() fromVersion!: number;
  @ApiProperty() toVersion!: number;
  @ApiProperty({ type: [StepRefDto] }) added!: StepRefDto[];
  @ApiProperty({ type: [StepRefDto] }) removed!: StepRefDto[];
  @ApiProperty({ type: [ReorderDto] }) reordered!: ReorderDto[];
  @ApiProperty({ type: [StepChangeDto] }) changed!: StepChangeDto[];
  @ApiProperty({ type: [ValueChangeDto] }) settings!: ValueChangeDto[];
  @ApiProperty() identical!: boolean;
}
