import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { IsInt, IsString, Matches, MaxLength, Min, MinLength } from 'class-validator';
import { FixtureDto } from '../../fixtures/dto/fixture.dto';
import { LotState } from '../../lots/lot.entity';
import { Nullable, Optional } from '../../common/validation/presence';

export const STATION_STATES = ['idle', 'ready', 'testing', 'fault', 'blocked'] as const;
export type StationState = (typeof STATION_STATES)[number];

export class StationLotDto {
  @ApiProperty() id!: number;
  @ApiProperty() code!: string;
  @ApiProperty({ enum: LotState }) state!: LotState;
  @ApiProperty() plannedQuantity!: number;
  @ApiProperty() productId!: number;
  @ApiProperty() partNumber!: string;
}

export class StationDto {
  @ApiProperty() id!: number;
  @ApiProperty({ example: 'EOL-1' }) code!: string;
  @ApiProperty() name!: string;
  @ApiProperty({ type: String, nullable: true }) location!: string | null;
  @ApiProperty() active!: boolean;
  @ApiProperty({ type: FixtureDto, nullable: true }) fixture!: FixtureDto | null;
  @ApiProperty({ type: StationLotDto, nullable: true }) activeLot!: StationLotDto | null;
  @ApiProperty({ enum: STATION_STATES }) state!: StationState;
  @ApiProperty({ type: [String], description: 'why the station cannot test (empty when it can)' }) reasons!: string[];
}

export class CreateStationDto {
  @ApiProperty({ example: 'EOL-4' })
  @IsString() @Matches(/^[A-Z0-9][A-Z0-9._-]{1,31}$/, { message: 'code must be 2 to 32 characters: capital letters, digits, ".", "_" or "-"' })
  code!: string;

  @ApiProperty() @IsString() @MinLength(1) @MaxLength(120) name!: string;
  @ApiPropertyOptional() @Optional() @IsString() @MaxLength(120) location?: string;
  @ApiPropertyOptional() @Optional() @IsInt() @Min(1) fixtureId?: number;
}

export class UpdateStationDto {
  @ApiPropertyOptional({ type: Number, nullable: true, description: 'an open lot; null clears' })
  @Nullable() @IsInt() @Min(1)
  activeLotId?: number | null;

  @ApiPropertyOptional({ type: Number, nullable: true, description: 'an active fixture not held by another station; null clears' })
  @Nullable() @IsInt() @Min(1)
  fixtureId?: number | null;
}
