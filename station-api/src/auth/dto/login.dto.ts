import { ApiProperty } from '@nestjs/swagger';
import { IsNotEmpty, IsString, MaxLength, MinLength } from 'class-validator';
import { UserDto } from '../../users/dto/user.dto';

export class LoginDto {
  @ApiProperty({ example: 'operator' })
  @IsString() @IsNotEmpty({ message: 'username is required' }) @MaxLength(64)
  username!: string;

  // no minimum here: a short wrong password is just a wrong password, refused with 401 like any other
  @ApiProperty({ example: 'operator-demo' })
  @IsString() @IsNotEmpty({ message: 'password is required' }) @MaxLength(200)
  password!: string;
}

export class LoginResponseDto {
  @ApiProperty({ description: 'JWT to send as "Authorization: Bearer <token>" and as the socket.io auth token' })
  accessToken!: string;

  @ApiProperty({ description: 'Seconds until the token expires', example: 43200 })
  expiresIn!: number;

  @ApiProperty({ type: UserDto })
  user!: UserDto;
}

export class BoardTokenRequestDto {
  @ApiProperty({ example: 'Hall 2 wall screen', description: 'where the board is shown; kept in the audit trail' })
  @IsString() @MinLength(3, { message: 'label must say where the board is shown (at least 3 characters)' }) @MaxLength(80)
  label!: string;
}

export class BoardTokenDto {
  @ApiProperty({ description: 'JWT with scope "board": opens GET /api/board and the board room of the socket only' })
  token!: string;

  @ApiProperty({ description: 'ISO 8601, UTC; 30 days after issue' })
  expiresAt!: string;
}
