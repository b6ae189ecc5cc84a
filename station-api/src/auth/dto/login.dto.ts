import { ApiProperty } from '@nestjs/swagger';
import { IsNotEmpty, IsString, MaxLength } from 'class-validator';
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
