import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { ArrayMaxSize, ArrayMinSize, IsArray, IsBoolean, IsInt, IsString, Max, MaxLength, Min, MinLength } from 'class-validator';
import type { PlanStep } from '../plan-definition';
import { PlanVersionState } from '../plan-version.entity';

export class PlanProductRefDto {
  @ApiProperty() id!: number;
  @ApiProperty({ example: 'OB-BK0503' }) partNumber!: string;
  @ApiProperty() name!: string;
}

export class UserRefDto {
  @ApiProperty() id!: number;
  @ApiProperty() username!: string;
  @ApiProperty() displayName!: string;
}

export class PlanVersionSummaryDto {
  @ApiProperty() id!: number;
  @ApiProperty() planId!: number;
  @ApiProperty({ description: 'numbered from 1 within the plan' }) version!: number;
  @ApiProperty({ enum: PlanVersionState }) state!: PlanVersionState;
  @ApiProperty({ description: 'why this version exists' }) reason!: string;
  @ApiProperty() stopAtFirstFailure!: boolean;
  @ApiProperty() maxAttempts!: number;
  @ApiProperty({ description: 'SHA-256 (hex) of the canonical JSON of the steps' }) checksum!: string;
  @ApiProperty({ nullable: true, type: String, description: 'plan file it was seeded from' }) sourceFile!: string | null;
  @ApiProperty() stepCount!: number;
  @ApiProperty() createdAt!: string;
  @ApiProperty({ nullable: true, type: UserRefDto }) createdBy!: UserRefDto | null;
  @ApiProperty({ nullable: true, type: String }) releasedAt!: string | null;
  @ApiProperty({ nullable: true, type: UserRefDto }) releasedBy!: UserRefDto | null;
  @ApiProperty({ nullable: true, type: String, description: 'when the draft was put forward for release' }) submittedAt!: string | null;
  @ApiProperty({ nullable: true, type: UserRefDto }) submittedBy!: UserRefDto | null;
  @ApiProperty({ nullable: true, type: String, description: 'what changed and why, given on submission' }) changeReason!: string | null;
  @ApiProperty({ nullable: true, type: String, description: 'set when the version was retired (kept with its history)' }) retiredAt!: string | null;
  @ApiProperty({ nullable: true, type: UserRefDto }) retiredBy!: UserRefDto | null;
  @ApiProperty({ nullable: true, type: String }) retireReason!: string | null;
  @ApiProperty({ description: 'draft, submitted (a draft awaiting a second engineer), released, superseded or retired' })
  stage!: 'draft' | 'submitted' | 'released' | 'superseded' | 'retired';
}

export class PlanVersionDto extends PlanVersionSummaryDto {
  @ApiProperty({ description: 'plan the version belongs to' })
  plan!: { id: number; code: string; name: string; product: PlanProductRefDto };

  @ApiProperty({ description: 'steps as in src/plans/plan-definition.ts (limits normalised to low/high)', type: 'array', items: { type: 'object' } })
  steps!: PlanStep[];
}

export class PlanSummaryDto {
  @ApiProperty() id!: number;
  @ApiProperty({ example: 'EOL-BK0503' }) code!: string;
  @ApiProperty() name!: string;
  @ApiProperty({ type: PlanProductRefDto }) product!: PlanProductRefDto;
  @ApiProperty({ nullable: true, type: PlanVersionSummaryDto, description: 'the version the stations run' })
  releasedVersion!: PlanVersionSummaryDto | null;
  @ApiProperty() versionCount!: number;
}

export class PlanDetailDto extends PlanSummaryDto {
  @ApiProperty({ type: [PlanVersionSummaryDto], description: 'newest first' }) versions!: PlanVersionSummaryDto[];
}

export class CreatePlanVersionDto {
  @ApiProperty({
    description: 'steps in the plan-definition shape; limits may also be written as nominal with tolerance or tolerancePct',
    type: 'array',
    items: { type: 'object' },
  })
  @IsArray() @ArrayMinSize(1) @ArrayMaxSize(100)
  steps!: unknown[];

  @ApiProperty() @IsBoolean() stopAtFirstFailure!: boolean;

  @ApiProperty({ minimum: 1, maximum: 10 }) @IsInt() @Min(1) @Max(10) maxAttempts!: number;

  @ApiProperty({ description: 'why this version is needed' })
  @IsString() @MinLength(3, { message: 'reason must say why the new version is needed (at least 3 characters)' }) @MaxLength(500)
  reason!: string;
}

export class ReleasePlanVersionDto {
  @ApiProperty({ description: 'why this version is released now' })
  @IsString() @MinLength(3, { message: 'reason must say why the version is released (at least 3 characters)' }) @MaxLength(500)
  reason!: string;
}

export class ValidatePlanTextDto {
  @ApiProperty({ description: 'the YAML text of a plan file' })
  @IsString() @MaxLength(1_000_000, { message: 'text is longer than 1 MB; a plan file is a few kB' })
  text!: string;
}

export class PlanTextIssueDto {
  @ApiProperty({ example: 'steps[3].limits[0].high' }) path!: string;
  @ApiProperty({ description: '1-based; 0 when the problem has no single place' }) line!: number;
  @ApiProperty() column!: number;
  @ApiProperty() message!: string;
}

export class PlanTextValidationDto {
  @ApiProperty() valid!: boolean;
  @ApiProperty({ type: [PlanTextIssueDto] }) errors!: PlanTextIssueDto[];
  @ApiPropertyOptional({ description: 'summary of the plan when valid' })
  plan?: { planCode: string; partNumber: string; revision: number; stepCount: number; checksum: string };
}
