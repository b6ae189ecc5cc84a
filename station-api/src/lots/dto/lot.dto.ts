import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsEnum, IsInt, IsString, Matches, Max, Min } from 'class-validator';
import { UnitState } from '../../units/unit.entity';
import { LotState } from '../lot.entity';
import { Optional } from '../../common/validation/presence';

/** Most units one lot may register in one request; a sanity bound on input, not a process limit. */
export const MAX_LOT_QUANTITY = 10_000;

export class ProductRefDto {
  @ApiProperty() id!: number;
  @ApiProperty({ example: 'OB-BK0503' }) partNumber!: string;
  @ApiProperty() name!: string;
}

export class UnitCountsDto {
  @ApiProperty() untested!: number;
  @ApiProperty() passed!: number;
  @ApiProperty() failed!: number;
  @ApiProperty({ description: `units in state ${UnitState.InRepair}` }) in_repair!: number;
  @ApiProperty() scrapped!: number;
  @ApiProperty({ description: 'registered units' }) total!: number;
}

export class LotDto {
  @ApiProperty() id!: number;
  @ApiProperty({ example: 'LB-2649-01' }) code!: string;
  @ApiProperty({ enum: LotState }) state!: LotState;
  @ApiProperty({ type: String, nullable: true }) holdReason!: string | null;
  @ApiProperty() plannedQuantity!: number;
  @ApiProperty({ type: ProductRefDto }) product!: ProductRefDto;
  @ApiProperty({ description: 'ISO 8601' }) createdAt!: string;
  @ApiProperty({ type: UnitCountsDto }) unitCounts!: UnitCountsDto;
}

export class LotDetailDto extends LotDto {
  @ApiProperty({ type: String, nullable: true, description: 'lowest registered serial' }) firstSerial!: string | null;
  @ApiProperty({ type: String, nullable: true, description: 'highest registered serial' }) lastSerial!: string | null;
}

export class LotQueryDto {
  @ApiPropertyOptional() @Optional() @Type(() => Number) @IsInt() @Min(1) productId?: number;

  @ApiPropertyOptional({ enum: LotState })
  @Optional() @IsEnum(LotState, { message: `state must be one of ${Object.values(LotState).join(', ')}` })
  state?: LotState;
}

export class CreateLotDto {
  @ApiProperty({ example: 'LB-2649-04' })
  @IsString() @Matches(/^[A-Z0-9][A-Z0-9-]{2,31}$/, { message: 'code must be 3 to 32 characters: capital letters, digits and "-", e.g. LB-2649-04' })
  code!: string;

  @ApiProperty() @IsInt() @Min(1) productId!: number;

  @ApiProperty({ minimum: 1, maximum: MAX_LOT_QUANTITY })
  @IsInt() @Min(1) @Max(MAX_LOT_QUANTITY, { message: `plannedQuantity must be at most ${MAX_LOT_QUANTITY}` })
  plannedQuantity!: number;

  @ApiPropertyOptional({ description: "first 5-digit sequence of this week's serials; default: next free one", minimum: 1, maximum: 99_999 })
  @Optional() @IsInt() @Min(1) @Max(99_999)
  firstSequence?: number;
}
