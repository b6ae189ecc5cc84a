import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsBoolean, IsEnum, IsIn, IsInt, IsNumber, IsString, Matches, MaxLength, Min } from 'class-validator';
import { Optional } from '../../common/validation/presence';
import { HoldRuleKind } from '../hold-rule.entity';

export class HoldRuleQueryDto {
  @ApiPropertyOptional() @Optional() @Type(() => Number) @IsInt() @Min(1) productId?: number;
}

export class QuantityChoicesQueryDto {
  @ApiProperty() @Type(() => Number) @IsInt({ message: 'productId must be a product id (a whole number)' }) @Min(1) productId!: number;
}

/**
 * A new hold rule. Type checks here; the bounds that depend on the kind, and whether the quantity is in the
 * product's released plan, are checked by the service (hold-rule-checks.ts) with one message per field.
 */
export class CreateHoldRuleDto {
  @ApiProperty() @IsInt({ message: 'productId must be a product id (a whole number)' }) @Min(1) productId!: number;

  @ApiProperty({ enum: HoldRuleKind })
  @IsEnum(HoldRuleKind, { message: `kind must be one of ${Object.values(HoldRuleKind).join(', ')}` })
  kind!: HoldRuleKind;

  @ApiPropertyOptional({ description: 'N: units (FPY) or tests (Cpk, run rule) looked at' })
  @Optional() @IsInt({ message: 'windowUnits must be a whole number of units' })
  windowUnits?: number;

  @ApiPropertyOptional({ description: 'X: hold when FPY is below this, percent (0 < X ≤ 100)' })
  @Optional() @IsNumber({ allowNaN: false, allowInfinity: false }, { message: 'minFpyPct must be a number of percent, e.g. 92' })
  minFpyPct?: number;

  @ApiPropertyOptional({ description: 'Y: hold when Cpk is below this' })
  @Optional() @IsNumber({ allowNaN: false, allowInfinity: false }, { message: 'minCpk must be a number, e.g. 1.33' })
  minCpk?: number;

  @ApiPropertyOptional({ example: 'vout-no-load' })
  @Optional() @IsString() @MaxLength(64) @Matches(/^\S+$/, { message: 'stepKey must be a step key from the plan, e.g. vout-no-load' })
  stepKey?: string;

  @ApiPropertyOptional({ example: 'voutV' })
  @Optional() @IsString() @MaxLength(64) @Matches(/^\S+$/, { message: 'quantity must be a limit key of the step, e.g. voutV' })
  quantity?: string;

  @ApiPropertyOptional({ enum: ['western-electric', 'nelson'] })
  @Optional() @IsIn(['western-electric', 'nelson'], { message: 'ruleSet must be western-electric or nelson' })
  ruleSet?: 'western-electric' | 'nelson';

  @ApiPropertyOptional({ description: 'K: failed tests in a row at one station' })
  @Optional() @IsInt({ message: 'failuresInRow must be a whole number' })
  failuresInRow?: number;
}

export class UpdateHoldRuleDto {
  @ApiProperty({ description: 'false switches the rule off (it stays listed with the holds it caused)' })
  @IsBoolean({ message: 'active must be true or false' })
  active!: boolean;
}

export class HoldRuleDto {
  @ApiProperty() id!: number;
  @ApiProperty() productId!: number;
  @ApiProperty() partNumber!: string;
  @ApiProperty({ enum: HoldRuleKind }) kind!: HoldRuleKind;
  @ApiProperty({ description: 'the rule in plain words' }) description!: string;
  @ApiProperty({ type: Number, nullable: true }) windowUnits!: number | null;
  @ApiProperty({ type: Number, nullable: true }) minFpyPct!: number | null;
  @ApiProperty({ type: Number, nullable: true }) minCpk!: number | null;
  @ApiProperty({ type: String, nullable: true }) stepKey!: string | null;
  @ApiProperty({ type: String, nullable: true }) quantity!: string | null;
  @ApiProperty({ type: String, nullable: true }) ruleSet!: string | null;
  @ApiProperty({ type: Number, nullable: true }) failuresInRow!: number | null;
  @ApiProperty() active!: boolean;
  @ApiProperty({ type: String, nullable: true }) createdByName!: string | null;
  @ApiProperty() createdAt!: string;
  @ApiProperty({ type: String, nullable: true }) switchedOffAt!: string | null;
}

export class QuantityChoiceDto {
  @ApiProperty() stepKey!: string;
  @ApiProperty() stepName!: string;
  @ApiProperty() quantity!: string;
  @ApiProperty() name!: string;
  @ApiProperty() unit!: string;
  @ApiProperty({ description: 'the limit has a low or high bound (needed for Cpk)' }) hasLimits!: boolean;
}
