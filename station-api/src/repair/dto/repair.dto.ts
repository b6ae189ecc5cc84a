import { ApiProperty } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsIn, IsString, Length } from 'class-validator';
import { Optional } from '../../common/validation/presence';
import { UnitDto } from '../../units/dto/unit.dto';
import { REPAIR_ACTIONS, type RepairAction } from '../repair-transitions';

export const REPAIR_NOTE_MIN = 3;
export const REPAIR_NOTE_MAX = 500;

export class RepairActionDto {
  @ApiProperty({
    enum: REPAIR_ACTIONS,
    description: 'receive: failed → in_repair; return: in_repair → untested (may be tested again, fresh attempts); scrap: failed or in_repair → scrapped',
  })
  @IsIn(REPAIR_ACTIONS, { message: `action must be one of ${REPAIR_ACTIONS.join(', ')}` })
  action!: RepairAction;

  @ApiProperty({ minLength: REPAIR_NOTE_MIN, maxLength: REPAIR_NOTE_MAX, example: 'Replaced R12 (feedback divider), resoldered L1', description: 'what was found or done; kept as the reason in the audit trail' })
  @Transform(({ value }) => (typeof value === 'string' ? value.trim() : value))
  @IsString({ message: 'note must be text' })
  @Length(REPAIR_NOTE_MIN, REPAIR_NOTE_MAX, { message: `note must be ${REPAIR_NOTE_MIN} to ${REPAIR_NOTE_MAX} characters` })
  note!: string;
}

export class RepairResultDto {
  @ApiProperty({ enum: REPAIR_ACTIONS }) action!: RepairAction;
  @ApiProperty({ description: 'state before the action' }) fromState!: string;
  @ApiProperty({ description: 'state after the action' }) toState!: string;
  @ApiProperty({ description: 'id of the audit event that records this repair step' }) auditEventId!: number;
  @ApiProperty({ type: UnitDto }) unit!: UnitDto;
}

export class SendToRepairDto {
  @ApiProperty({
    required: false,
    maxLength: REPAIR_NOTE_MAX,
    example: 'Output low again after re-seating',
    description: 'why the unit goes to repair with attempts left; kept as the reason in the audit trail',
  })
  @Optional()
  @Transform(({ value }) => (typeof value === 'string' ? value.trim() : value))
  @IsString({ message: 'note must be text' })
  @Length(0, REPAIR_NOTE_MAX, { message: `note must be at most ${REPAIR_NOTE_MAX} characters` })
  note?: string;
}
