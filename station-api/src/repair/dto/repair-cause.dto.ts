import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsBoolean, IsIn, IsString, Length } from 'class-validator';
import { Optional } from '../../common/validation/presence';

export const CAUSE_NAME_MIN = 3;
export const CAUSE_NAME_MAX = 80;

// spaces inside a name collapse to one, so "cold  joint" and "cold joint" are the same cause
const tidy = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim().replace(/\s+/g, ' ') : value);

export class CreateRepairCauseDto {
  @ApiProperty({ example: 'Solder bridge', minLength: CAUSE_NAME_MIN, maxLength: CAUSE_NAME_MAX })
  @Transform(tidy)
  @IsString({ message: 'name must be text' })
  @Length(CAUSE_NAME_MIN, CAUSE_NAME_MAX, { message: `name must be ${CAUSE_NAME_MIN} to ${CAUSE_NAME_MAX} characters` })
  name!: string;
}

export class UpdateRepairCauseDto {
  @ApiPropertyOptional({ description: 'a new name (rename); records keep pointing at the cause' })
  @Optional()
  @Transform(tidy)
  @IsString({ message: 'name must be text' })
  @Length(CAUSE_NAME_MIN, CAUSE_NAME_MAX, { message: `name must be ${CAUSE_NAME_MIN} to ${CAUSE_NAME_MAX} characters` })
  name?: string;

  @ApiPropertyOptional({ description: 'false switches the cause off (no longer offered); true switches it on again' })
  @Optional()
  @IsBoolean({ message: 'active must be true or false' })
  active?: boolean;
}

export class RepairCauseQueryDto {
  @ApiPropertyOptional({ enum: ['true', 'false'], default: 'false', description: 'true: also the causes switched off' })
  @Optional()
  @IsIn(['true', 'false'], { message: 'all must be true or false' })
  all?: 'true' | 'false';
}

export class RepairCauseDto {
  @ApiProperty() id!: number;
  @ApiProperty() name!: string;
  @ApiProperty({ description: 'false: switched off, not offered for new records' }) active!: boolean;
  @ApiProperty({ description: 'repair records that name this cause (a cause in use cannot be deleted)' }) recordCount!: number;
}
