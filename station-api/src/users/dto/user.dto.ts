import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { ArrayMaxSize, ArrayMinSize, ArrayUnique, IsArray, IsBoolean, IsIn, IsString, Matches, MaxLength, MinLength } from 'class-validator';
import { Role, ROLES } from '../user.entity';
import { Optional } from '../../common/validation/presence';

/** What the API says about a user. Never the password hash. */
export class UserDto {
  @ApiProperty() id!: number;
  @ApiProperty({ example: 'operator' }) username!: string;
  @ApiProperty({ example: 'Line B operator' }) displayName!: string;
  @ApiProperty({ enum: ROLES, isArray: true }) roles!: Role[];
  @ApiProperty() active!: boolean;
}

const USERNAME = /^[a-z0-9][a-z0-9._-]{2,31}$/;
const USERNAME_MESSAGE = 'username must be 3 to 32 characters: lowercase letters, digits, ".", "_" or "-", starting with a letter or digit';

// 8 characters minimum: the floor NIST SP 800-63B (5.1.1.2) sets for user-chosen passwords; 72 is
// where bcrypt stops reading (its input is truncated at 72 bytes), so longer would be silently cut.
const PASSWORD_MIN = 8;
const PASSWORD_MAX = 72;

export class CreateUserDto {
  @ApiProperty({ example: 'j.okafor' })
  @IsString() @Matches(USERNAME, { message: USERNAME_MESSAGE })
  username!: string;

  @ApiProperty({ example: 'J. Okafor' })
  @IsString() @MinLength(1) @MaxLength(80)
  displayName!: string;

  @ApiProperty({ minLength: PASSWORD_MIN, maxLength: PASSWORD_MAX })
  @IsString()
  @MinLength(PASSWORD_MIN, { message: `password must be at least ${PASSWORD_MIN} characters` })
  @MaxLength(PASSWORD_MAX, { message: `password must be at most ${PASSWORD_MAX} characters` })
  password!: string;

  @ApiProperty({ enum: ROLES, isArray: true, example: ['operator'] })
  @IsArray() @ArrayMinSize(1, { message: 'roles must name at least one role' }) @ArrayMaxSize(ROLES.length) @ArrayUnique()
  @IsIn(ROLES, { each: true, message: `each role must be one of ${ROLES.join(', ')}` })
  roles!: Role[];
}

export class UpdateUserDto {
  @ApiPropertyOptional()
  @Optional() @IsString() @MinLength(1) @MaxLength(80)
  displayName?: string;

  @ApiPropertyOptional({ enum: ROLES, isArray: true })
  @Optional() @IsArray() @ArrayMinSize(1, { message: 'roles must name at least one role' }) @ArrayMaxSize(ROLES.length) @ArrayUnique()
  @IsIn(ROLES, { each: true, message: `each role must be one of ${ROLES.join(', ')}` })
  roles?: Role[];

  @ApiPropertyOptional({ description: 'false deactivates (sign-in refused, tokens stop working); true reactivates' })
  @Optional() @IsBoolean()
  active?: boolean;
}

export class ResetPasswordDto {
  @ApiProperty({ minLength: PASSWORD_MIN, maxLength: PASSWORD_MAX })
  @IsString()
  @MinLength(PASSWORD_MIN, { message: `password must be at least ${PASSWORD_MIN} characters` })
  @MaxLength(PASSWORD_MAX, { message: `password must be at most ${PASSWORD_MAX} characters` })
  password!: string;
}
