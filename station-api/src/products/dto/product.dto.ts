import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { IsBoolean, IsNumber, IsPositive, IsString, Matches, Max, MaxLength, MinLength, registerDecorator, ValidationArguments } from 'class-validator';
import { serialPatternProblem } from '../../units/serial-numbers';
import { Optional } from '../../common/validation/presence';

/** Checks that a string is a serial pattern the lot registration can fill in. */
function IsSerialPattern(): PropertyDecorator {
  return (target: object, propertyName: string | symbol) =>
    registerDecorator({
      name: 'isSerialPattern',
      target: target.constructor,
      propertyName: propertyName as string,
      validator: {
        validate: (value: unknown) => typeof value === 'string' && serialPatternProblem(value) === null,
        defaultMessage: (args?: ValidationArguments) =>
          typeof args?.value === 'string' ? (serialPatternProblem(args.value) ?? '') : 'serialPattern must be a string',
      },
    });
}

const PART_NUMBER = /^[A-Z0-9][A-Z0-9._-]{2,31}$/;
// generous bounds that still catch a unit slip (mV typed as V, mA as A) on a board-mounted module
const MAX_V = 1000;
const MAX_A = 500;

export class ProductDto {
  @ApiProperty() id!: number;
  @ApiProperty({ example: 'OB-BK0503' }) partNumber!: string;
  @ApiProperty() name!: string;
  @ApiProperty() family!: string;
  @ApiProperty({ description: 'volts' }) vinMinV!: number;
  @ApiProperty({ description: 'volts' }) vinNomV!: number;
  @ApiProperty({ description: 'volts' }) vinMaxV!: number;
  @ApiProperty({ description: 'volts' }) voutNomV!: number;
  @ApiProperty({ description: 'amperes' }) ioutRatedA!: number;
  @ApiProperty({ example: String.raw`^K5A-\d{4}-\d{5}$` }) serialPattern!: string;
  @ApiProperty() active!: boolean;
}

export class CreateProductDto {
  @ApiProperty({ example: 'OB-BK0503' })
  @IsString() @Matches(PART_NUMBER, { message: 'partNumber must be 3 to 32 characters: capital letters, digits, ".", "_" or "-"' })
  partNumber!: string;

  @ApiProperty() @IsString() @MinLength(1) @MaxLength(120) name!: string;
  @ApiProperty() @IsString() @MinLength(1) @MaxLength(60) family!: string;

  @ApiProperty({ description: 'volts' }) @IsNumber({ allowNaN: false, allowInfinity: false }) @IsPositive() @Max(MAX_V) vinMinV!: number;
  @ApiProperty({ description: 'volts' }) @IsNumber({ allowNaN: false, allowInfinity: false }) @IsPositive() @Max(MAX_V) vinNomV!: number;
  @ApiProperty({ description: 'volts' }) @IsNumber({ allowNaN: false, allowInfinity: false }) @IsPositive() @Max(MAX_V) vinMaxV!: number;
  @ApiProperty({ description: 'volts' }) @IsNumber({ allowNaN: false, allowInfinity: false }) @IsPositive() @Max(MAX_V) voutNomV!: number;
  @ApiProperty({ description: 'amperes' }) @IsNumber({ allowNaN: false, allowInfinity: false }) @IsPositive() @Max(MAX_A) ioutRatedA!: number;

  @ApiProperty({ example: String.raw`^K5A-\d{4}-\d{5}$`, description: String.raw`anchored: ^PREFIX\d{4}SEP\d{5}$` })
  @IsSerialPattern()
  serialPattern!: string;
}

export class UpdateProductDto {
  @ApiPropertyOptional() @Optional() @IsString() @MinLength(1) @MaxLength(120) name?: string;
  @ApiPropertyOptional() @Optional() @IsString() @MinLength(1) @MaxLength(60) family?: string;
  @ApiPropertyOptional() @Optional() @IsNumber({ allowNaN: false, allowInfinity: false }) @IsPositive() @Max(MAX_V) vinMinV?: number;
  @ApiPropertyOptional() @Optional() @IsNumber({ allowNaN: false, allowInfinity: false }) @IsPositive() @Max(MAX_V) vinNomV?: number;
  @ApiPropertyOptional() @Optional() @IsNumber({ allowNaN: false, allowInfinity: false }) @IsPositive() @Max(MAX_V) vinMaxV?: number;
  @ApiPropertyOptional() @Optional() @IsNumber({ allowNaN: false, allowInfinity: false }) @IsPositive() @Max(MAX_V) voutNomV?: number;
  @ApiPropertyOptional() @Optional() @IsNumber({ allowNaN: false, allowInfinity: false }) @IsPositive() @Max(MAX_A) ioutRatedA?: number;

  @ApiPropertyOptional({ description: 'only while no unit of the product is registered' })
  @Optional() @IsSerialPattern()
  serialPattern?: string;

  @ApiPropertyOptional({ description: 'false hides the product from new lots' })
  @Optional() @IsBoolean()
  active?: boolean;
}
