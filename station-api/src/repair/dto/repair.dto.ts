import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform, Type } from 'class-transformer';
import { IsIn, IsInt, IsString, Length, Min, ValidateIf } from 'class-validator';
import { Optional } from '../../common/validation/presence';
import { UnitDto } from '../../units/dto/unit.dto';
import { REPAIR_ACTIONS, type RepairAction } from '../repair-transitions';
import { RepairRecordDto } from './repair-record.dto';

export const REPAIR_NOTE_MIN = 3;
export const REPAIR_NOTE_MAX = 500;
export const RECORD_TEXT_MIN = 3;
export const RECORD_TEXT_MAX = 500;

const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

/** Return for retest and scrap close a repair: they need a repair record. */
export const ACTIONS_WITH_RECORD: readonly RepairAction[] = ['return', 'scrap'];
const needsRecord = (o: { action?: unknown }) => ACTIONS_WITH_RECORD.includes(o.action as RepairAction);

/** The fields of a repair record as a technician writes them (also a correction's content). */
export class RepairRecordFieldsDto {
  @ApiProperty({ example: 'Output 5.6 V at full load, ripple high', minLength: RECORD_TEXT_MIN, maxLength: RECORD_TEXT_MAX, description: 'what was wrong with the unit' })
  @Transform(trim)
  @IsString({ message: 'symptom must be text: say what was wrong with the unit' })
  @Length(RECORD_TEXT_MIN, RECORD_TEXT_MAX, { message: `symptom must be ${RECORD_TEXT_MIN} to ${RECORD_TEXT_MAX} characters: say what was wrong with the unit` })
  symptom!: string;

  @ApiProperty({ example: 3, description: 'id of an active repair cause (GET /api/repair-causes)' })
  @Type(() => Number)
  @IsInt({ message: 'causeId must be the id of a repair cause (choose one from the list)' })
  @Min(1, { message: 'causeId must be the id of a repair cause (choose one from the list)' })
  causeId!: number;

  @ApiProperty({ example: 'Reflowed U1 pins 3-4, cleaned flux', minLength: RECORD_TEXT_MIN, maxLength: RECORD_TEXT_MAX, description: 'what was done to the unit' })
  @Transform(trim)
  @IsString({ message: 'actionTaken must be text: say what was done to the unit' })
  @Length(RECORD_TEXT_MIN, RECORD_TEXT_MAX, { message: `actionTaken must be ${RECORD_TEXT_MIN} to ${RECORD_TEXT_MAX} characters: say what was done to the unit` })
  actionTaken!: string;
}

export class RepairActionDto {
  @ApiProperty({
    enum: REPAIR_ACTIONS,
    description:
      'receive: failed → in_repair; return: in_repair → untested (eligible for retest, fresh attempts); scrap: failed or in_repair → scrapped. ' +
      'return and scrap write a repair record and need symptom, causeId and actionTaken.',
  })
  @IsIn(REPAIR_ACTIONS, { message: `action must be one of ${REPAIR_ACTIONS.join(', ')}` })
  action!: RepairAction;

  @ApiPropertyOptional({
    minLength: REPAIR_NOTE_MIN,
    maxLength: REPAIR_NOTE_MAX,
    example: 'On bench 2',
    description: 'required to receive a unit; an optional remark for return and scrap. Kept as the reason in the audit trail',
  })
  @ValidateIf((o: RepairActionDto) => !needsRecord(o) || o.note !== undefined)
  @Transform(trim)
  @IsString({ message: 'note must be text' })
  @Length(REPAIR_NOTE_MIN, REPAIR_NOTE_MAX, { message: `note must be ${REPAIR_NOTE_MIN} to ${REPAIR_NOTE_MAX} characters` })
  note?: string;

  @ApiPropertyOptional({ description: 'return and scrap: what was wrong with the unit', minLength: RECORD_TEXT_MIN, maxLength: RECORD_TEXT_MAX })
  @ValidateIf((o: RepairActionDto) => needsRecord(o) || o.symptom !== undefined)
  @Transform(trim)
  @IsString({ message: 'symptom must be text: say what was wrong with the unit' })
  @Length(RECORD_TEXT_MIN, RECORD_TEXT_MAX, { message: `symptom must be ${RECORD_TEXT_MIN} to ${RECORD_TEXT_MAX} characters: say what was wrong with the unit` })
  symptom?: string;

  @ApiPropertyOptional({ description: 'return and scrap: id of an active repair cause' })
  @ValidateIf((o: RepairActionDto) => needsRecord(o) || o.causeId !== undefined)
  @Type(() => Number)
  @IsInt({ message: 'causeId must be the id of a repair cause (choose one from the list)' })
  @Min(1, { message: 'causeId must be the id of a repair cause (choose one from the list)' })
  causeId?: number;

  @ApiPropertyOptional({ description: 'return and scrap: what was done to the unit', minLength: RECORD_TEXT_MIN, maxLength: RECORD_TEXT_MAX })
  @ValidateIf((o: RepairActionDto) => needsRecord(o) || o.actionTaken !== undefined)
  @Transform(trim)
  @IsString({ message: 'actionTaken must be text: say what was done to the unit' })
  @Length(RECORD_TEXT_MIN, RECORD_TEXT_MAX, { message: `actionTaken must be ${RECORD_TEXT_MIN} to ${RECORD_TEXT_MAX} characters: say what was done to the unit` })
  actionTaken?: string;
}

export class CorrectRepairRecordDto extends RepairRecordFieldsDto {
  @ApiProperty({ example: 'Cause was the inductor, not the solder joint', minLength: 5, maxLength: REPAIR_NOTE_MAX, description: 'why the record is corrected' })
  @Transform(trim)
  @IsString({ message: 'reason must be text: say why the record is corrected' })
  @Length(5, REPAIR_NOTE_MAX, { message: `reason must be 5 to ${REPAIR_NOTE_MAX} characters: say why the record is corrected` })
  reason!: string;
}

export class RepairResultDto {
  @ApiProperty({ enum: REPAIR_ACTIONS }) action!: RepairAction;
  @ApiProperty({ description: 'state before the action' }) fromState!: string;
  @ApiProperty({ description: 'state after the action' }) toState!: string;
  @ApiProperty({ description: 'id of the audit event that records this repair step' }) auditEventId!: number;
  @ApiProperty({ type: UnitDto }) unit!: UnitDto;
  @ApiProperty({ type: RepairRecordDto, nullable: true, description: 'the repair record written (return and scrap); null for receive' })
  record!: RepairRecordDto | null;
}

export class SendToRepairDto {
  @ApiProperty({
    required: false,
    maxLength: REPAIR_NOTE_MAX,
    example: 'Output low again after re-seating',
    description: 'why the unit goes to repair with attempts left; kept as the reason in the audit trail',
  })
  @Optional()
  @Transform(trim)
  @IsString({ message: 'note must be text' })
  @Length(0, REPAIR_NOTE_MAX, { message: `note must be at most ${REPAIR_NOTE_MAX} characters` })
  note?: string;
}
