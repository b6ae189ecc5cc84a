import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { ArrayMaxSize, ArrayMinSize, IsArray, IsEnum, IsInt, IsString, Matches, Max, MaxLength, Min, MinLength } from 'class-validator';
import { UnitState } from '../../units/unit.entity';
import { LotState } from '../lot.entity';
import { Optional } from '../../common/validation/presence';
import { LOT_CODE_PATTERN, LOT_CODE_RULE } from '../lot-csv';
import { MAX_LOT_QUANTITY } from '../serial-input';

export { MAX_LOT_QUANTITY };

/** Longest serial accepted in a request (as units.service.ts bounds a scanned serial). */
const MAX_SERIAL_LENGTH = 64;

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
  @ApiProperty({ type: String, nullable: true, description: 'ISO 8601' }) releasedAt!: string | null;
  @ApiProperty({ type: String, nullable: true, description: 'display name of the person who released the lot' }) releasedBy!: string | null;
  @ApiProperty({ type: String, nullable: true, description: 'ISO 8601' }) closedAt!: string | null;
  @ApiProperty({ type: String, nullable: true }) closedBy!: string | null;
  @ApiProperty({ type: String, nullable: true }) closeReason!: string | null;
  @ApiProperty({ description: 'a certificate of conformance was issued (GET /lots/:id/certificate.pdf)' }) hasCertificate!: boolean;
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
  @IsString() @Matches(LOT_CODE_PATTERN, { message: `code must be ${LOT_CODE_RULE}` })
  code!: string;

  @ApiProperty() @IsInt() @Min(1) productId!: number;

  @ApiProperty({ minimum: 1, maximum: MAX_LOT_QUANTITY })
  @IsInt() @Min(1) @Max(MAX_LOT_QUANTITY, { message: `plannedQuantity must be at most ${MAX_LOT_QUANTITY}` })
  plannedQuantity!: number;

  @ApiPropertyOptional({ description: "without serials: first 5-digit sequence of this week's serials; default: next free one", minimum: 1, maximum: 99_999 })
  @Optional() @IsInt() @Min(1) @Max(99_999)
  firstSequence?: number;

  @ApiPropertyOptional({ description: 'a range: the first serial (with lastSerial)', example: 'K5A-2649-00001' })
  @Optional() @IsString() @MinLength(1) @MaxLength(MAX_SERIAL_LENGTH)
  firstSerial?: string;

  @ApiPropertyOptional({ description: 'a range: the last serial (with firstSerial)', example: 'K5A-2649-00120' })
  @Optional() @IsString() @MinLength(1) @MaxLength(MAX_SERIAL_LENGTH)
  lastSerial?: string;

  @ApiPropertyOptional({ description: 'an explicit list of serials (instead of a range)', type: [String] })
  @Optional() @IsArray() @ArrayMinSize(1) @ArrayMaxSize(MAX_LOT_QUANTITY)
  @IsString({ each: true }) @MaxLength(MAX_SERIAL_LENGTH, { each: true })
  serials?: string[];
}

export class LotUnitDto {
  @ApiProperty() serial!: string;
  @ApiProperty({ enum: UnitState }) state!: UnitState;
  @ApiProperty({ description: 'completed runs (pass or fail)' }) testCount!: number;
  @ApiProperty({ type: String, nullable: true, description: 'ISO 8601' }) lastTestedAt!: string | null;
}

export class ReleaseBlockerDto {
  @ApiProperty({ example: 'units_untested' }) code!: string;
  @ApiProperty({ example: '12 units not yet tested' }) message!: string;
  @ApiPropertyOptional({ type: [String], description: 'some of the serials concerned (at most 20)' }) serials?: string[];
}

export class ReleaseCheckDto {
  @ApiProperty() releasable!: boolean;
  @ApiProperty({ type: [ReleaseBlockerDto] }) blockers!: ReleaseBlockerDto[];
}

export class ReleaseLotDto {
  @ApiPropertyOptional({ description: 'a comment printed on the certificate and kept in the audit trail' })
  @Optional() @IsString() @MaxLength(500)
  comment?: string;
}

export class CloseLotDto {
  @ApiProperty({ description: 'why the lot is closed, in plain words' })
  @IsString() @MinLength(3, { message: 'reason must say why the lot is closed (at least 3 characters)' }) @MaxLength(500)
  reason!: string;
}

export class LotFileProblemDto {
  @ApiProperty({ description: 'spreadsheet row: the header is row 1' }) row!: number;
  @ApiProperty() column!: string;
  @ApiProperty() message!: string;
}

export class LotImportResultDto {
  @ApiProperty() imported!: number;
  @ApiProperty({ type: [LotDto] }) lots!: LotDto[];
}
