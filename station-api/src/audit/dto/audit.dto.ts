import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsInt, IsISO8601, IsString, Matches, Max, MaxLength, Min } from 'class-validator';
import { Optional } from '../../common/validation/presence';

/** The filters of the audit list and its CSV export (the export ignores limit and offset). */
export class AuditFilterDto {
  @ApiPropertyOptional({ example: 'plan_version', description: 'Object type (plan_version, fixture, user, lot, unit, test_run, ...)' })
  @Optional() @IsString() @Matches(/^[a-z][a-z_]{0,39}$/, { message: 'entityType is a lower-case object type such as plan_version, fixture, user, lot or unit' })
  entityType?: string;

  @ApiPropertyOptional({ example: '3', description: 'Object id (a unit filter also accepts its serial)' })
  @Optional() @IsString() @MaxLength(64)
  entityId?: string;

  @ApiPropertyOptional({ example: 'e.moreau', description: 'Sign-in name of the person who acted' })
  @Optional() @IsString() @MaxLength(64)
  user?: string;

  @ApiPropertyOptional({ example: 'plan_version.released' })
  @Optional() @IsString() @Matches(/^[a-z][a-z0-9_.]{0,63}$/, { message: 'action is an action code such as plan_version.released' })
  action?: string;

  @ApiPropertyOptional({ description: 'Part of the reason, the person, the object id or the before/after text (case-insensitive)' })
  @Optional() @IsString() @MaxLength(100)
  q?: string;

  @ApiPropertyOptional({ example: '2026-12-01T00:00:00Z', description: 'From this instant (inclusive), ISO 8601' })
  @Optional() @IsISO8601({ strict: true }, { message: 'from must be a date and time in ISO 8601, e.g. 2026-12-01T00:00:00Z' })
  from?: string;

  @ApiPropertyOptional({ example: '2026-12-02T00:00:00Z', description: 'Up to this instant (exclusive), ISO 8601' })
  @Optional() @IsISO8601({ strict: true }, { message: 'to must be a date and time in ISO 8601, e.g. 2026-12-02T00:00:00Z' })
  to?: string;
}

export class AuditQueryDto extends AuditFilterDto {
  @ApiPropertyOptional({ default: 50, minimum: 1, maximum: 500 })
  @Optional() @Type(() => Number) @IsInt() @Min(1) @Max(500)
  limit?: number;

  @ApiPropertyOptional({ default: 0, minimum: 0 })
  @Optional() @Type(() => Number) @IsInt() @Min(0)
  offset?: number;
}

export class AuditChangeDto {
  @ApiProperty({ example: 'High limit of Output voltage at 1.5 A' }) field!: string;
  @ApiProperty({ type: String, nullable: true, example: '3.35 V' }) before!: string | null;
  @ApiProperty({ type: String, nullable: true, example: '3.36 V' }) after!: string | null;
}

/** Where a record's object can be opened; the UI turns it into an address. */
export class AuditLinkDto {
  @ApiProperty({ example: 'plan_version', description: 'plan_version, fixture, user, lot, unit, run, station, product, hold, ...' }) kind!: string;
  @ApiProperty({ example: '12' }) id!: string;
  @ApiProperty({ example: 'OB-BK0503-EOL version 4' }) label!: string;
  @ApiPropertyOptional({ description: 'unit: its serial (the unit history is reached by serial)' }) serial?: string;
  @ApiPropertyOptional({ description: 'plan_version: the plan it belongs to' }) planId?: number;
}

export class AuditEventDto {
  @ApiProperty() id!: number;
  @ApiProperty({ description: 'ISO 8601, UTC' }) at!: string;
  @ApiProperty({ type: Number, nullable: true }) actorId!: number | null;
  @ApiProperty({ type: String, nullable: true, description: 'sign-in name' }) actorName!: string | null;
  @ApiProperty({ type: String, nullable: true, description: 'the person\'s display name when the user exists' }) actorDisplayName!: string | null;
  @ApiProperty({ description: 'internal action code (kept for filtering)' }) action!: string;
  @ApiProperty({ description: 'what happened, in plain words' }) what!: string;
  @ApiProperty() entityType!: string;
  @ApiProperty({ type: String, nullable: true }) entityId!: string | null;
  @ApiProperty({ type: String, nullable: true }) reason!: string | null;
  @ApiProperty({ type: Object, nullable: true }) before!: Record<string, unknown> | null;
  @ApiProperty({ type: Object, nullable: true }) after!: Record<string, unknown> | null;
  @ApiProperty({ type: [AuditChangeDto], description: 'before → after in words' }) changes!: AuditChangeDto[];
  @ApiProperty({ type: AuditLinkDto, nullable: true }) link!: AuditLinkDto | null;
}

export class AuditPageDto {
  @ApiProperty({ type: [AuditEventDto] }) items!: AuditEventDto[];
  @ApiProperty() total!: number;
}

export class AuditTypeChoiceDto {
  @ApiProperty({ example: 'plan_version' }) type!: string;
  @ApiProperty({ example: 'plan version' }) words!: string;
}

export class AuditUserChoiceDto {
  @ApiProperty() username!: string;
  @ApiProperty() displayName!: string;
}

/** What the filters can choose from: object types and people that appear in the trail. */
export class AuditChoicesDto {
  @ApiProperty({ type: [AuditTypeChoiceDto] }) entityTypes!: AuditTypeChoiceDto[];
  @ApiProperty({ type: [AuditUserChoiceDto] }) users!: AuditUserChoiceDto[];
}
