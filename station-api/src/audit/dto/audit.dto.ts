import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsInt, IsString, Max, MaxLength, Min } from 'class-validator';
import { Optional } from '../../common/validation/presence';

export class AuditQueryDto {
  @ApiPropertyOptional({ example: 'user' })
  @Optional() @IsString() @MaxLength(64)
  entityType?: string;

  @ApiPropertyOptional({ example: '3' })
  @Optional() @IsString() @MaxLength(64)
  entityId?: string;

  @ApiPropertyOptional({ example: 'auth.login_failed' })
  @Optional() @IsString() @MaxLength(64)
  action?: string;

  @ApiPropertyOptional({ default: 100, minimum: 1, maximum: 500 })
  @Optional() @Type(() => Number) @IsInt() @Min(1) @Max(500)
  limit?: number;

  @ApiPropertyOptional({ default: 0, minimum: 0 })
  @Optional() @Type(() => Number) @IsInt() @Min(0)
  offset?: number;
}

export class AuditEventDto {
  @ApiProperty() id!: number;
  @ApiProperty({ description: 'ISO 8601, UTC' }) at!: string;
  @ApiProperty({ type: Number, nullable: true }) actorId!: number | null;
  @ApiProperty({ type: String, nullable: true }) actorName!: string | null;
  @ApiProperty() action!: string;
  @ApiProperty() entityType!: string;
  @ApiProperty({ type: String, nullable: true }) entityId!: string | null;
  @ApiProperty({ type: String, nullable: true }) reason!: string | null;
  @ApiProperty({ type: Object, nullable: true }) before!: Record<string, unknown> | null;
  @ApiProperty({ type: Object, nullable: true }) after!: Record<string, unknown> | null;
}

export class AuditPageDto {
  @ApiProperty({ type: [AuditEventDto] }) items!: AuditEventDto[];
  @ApiProperty() total!: number;
}
