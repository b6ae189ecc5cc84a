import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsIn, IsString, MaxLength, MinLength } from 'class-validator';
import { Optional } from '../../common/validation/presence';

export class HoldQueryDto {
  @ApiPropertyOptional({ enum: ['active', 'lifted', 'all'], default: 'all' })
  @Optional() @IsIn(['active', 'lifted', 'all'], { message: 'state must be active, lifted or all' })
  state?: 'active' | 'lifted' | 'all';
}

export class LiftHoldDto {
  @ApiProperty({ description: 'why testing may go on (kept in the audit trail)', minLength: 5, maxLength: 500 })
  @Transform(({ value }) => (typeof value === 'string' ? value.trim() : value))
  @IsString({ message: 'reason is required: say why testing may go on' })
  @MinLength(5, { message: 'reason is required: say in a few words why testing may go on (at least 5 characters)' })
  @MaxLength(500, { message: 'reason must be at most 500 characters' })
  reason!: string;
}

export class HoldDto {
  @ApiProperty() id!: number;
  @ApiProperty() lotId!: number;
  @ApiProperty() lotCode!: string;
  @ApiProperty({ description: 'the lot state now' }) lotState!: string;
  @ApiProperty() partNumber!: string;
  @ApiProperty() ruleId!: number;
  @ApiProperty() ruleDescription!: string;
  @ApiProperty() reason!: string;
  @ApiProperty({ type: Object }) figures!: Record<string, unknown>;
  @ApiProperty({ type: Number, nullable: true }) runId!: number | null;
  @ApiProperty({ type: String, nullable: true }) serial!: string | null;
  @ApiProperty({ type: String, nullable: true }) stationCode!: string | null;
  @ApiProperty() heldAt!: string;
  @ApiProperty({ type: String, nullable: true }) liftedAt!: string | null;
  @ApiProperty({ type: String, nullable: true }) liftedByName!: string | null;
  @ApiProperty({ type: String, nullable: true }) liftReason!: string | null;
}

export class HoldAlertDto {
  @ApiProperty() id!: number;
  @ApiProperty({ enum: ['hold', 'evaluation_failed'] }) kind!: string;
  @ApiProperty() at!: string;
  @ApiProperty() message!: string;
  @ApiProperty({ type: Number, nullable: true }) ruleId!: number | null;
  @ApiProperty({ type: String, nullable: true }) ruleDescription!: string | null;
  @ApiProperty({ type: String, nullable: true }) lotCode!: string | null;
  @ApiProperty({ type: Number, nullable: true }) runId!: number | null;
  @ApiProperty({ type: Number, nullable: true }) holdId!: number | null;
  @ApiProperty({ type: Object, nullable: true }) figures!: Record<string, unknown> | null;
}

export class OutboxMessageDto {
  @ApiProperty() id!: number;
  @ApiProperty() to!: string;
  @ApiProperty() subject!: string;
  @ApiProperty() body!: string;
  @ApiProperty({ enum: ['queued', 'sent', 'failed'] }) status!: string;
  @ApiProperty() attempts!: number;
  @ApiProperty({ type: String, nullable: true }) lastError!: string | null;
  @ApiProperty() createdAt!: string;
  @ApiProperty({ type: String, nullable: true }) lastAttemptAt!: string | null;
  @ApiProperty({ type: String, nullable: true }) sentAt!: string | null;
  @ApiProperty({ type: Number, nullable: true }) alertId!: number | null;
}
