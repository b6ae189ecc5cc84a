import { Body, Controller, Get, HttpCode, Inject, Post, UseGuards } from '@nestjs/common';
import { ApiBearerAuth, ApiCreatedResponse, ApiOkResponse, ApiOperation, ApiTags, ApiTooManyRequestsResponse, ApiUnauthorizedResponse } from '@nestjs/swagger';
import { AuthUser, CurrentUser } from '../common/decorators/current-user.decorator';
import { Public } from '../common/decorators/public.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { UserDto } from '../users/dto/user.dto';
import { ROLES } from '../users/user.entity';
import { AuthService, TOKEN_LIFETIME_S } from './auth.service';
import { BoardTokenDto, BoardTokenRequestDto, LoginDto, LoginResponseDto } from './dto/login.dto';
import { LoginThrottlerGuard } from './login-throttler.guard';

@ApiTags('auth')
@Controller('auth')
export class AuthController {
  constructor(
    private readonly auth: AuthService,
    @Inject(TOKEN_LIFETIME_S) private readonly lifetimeS: number,
  ) {}

  @Post('login')
  @Public()
  @UseGuards(LoginThrottlerGuard)
  @HttpCode(200)
  @ApiOperation({ summary: 'Sign in with username and password; returns a bearer token' })
  @ApiOkResponse({ type: LoginResponseDto })
  @ApiUnauthorizedResponse({ description: 'wrong username or password, or account deactivated' })
  @ApiTooManyRequestsResponse({ description: 'too many attempts from this client; details.retryAfterS says when to retry' })
  login(@Body() dto: LoginDto): Promise<LoginResponseDto> {
    return this.auth.login(dto, this.lifetimeS);
  }

  @Get('me')
  @Roles(...ROLES)
  @ApiBearerAuth()
  @ApiOperation({ summary: 'The signed-in user' })
  @ApiOkResponse({ type: UserDto })
  me(@CurrentUser() user: AuthUser): Promise<UserDto> {
    return this.auth.me(user.id);
  }

  @Post('board-token')
  @Roles('admin')
  @HttpCode(201)
  @ApiBearerAuth()
  @ApiOperation({ summary: 'Issue a board display token (30 days) for a wall screen; it opens the board only' })
  @ApiCreatedResponse({ type: BoardTokenDto })
  boardToken(@Body() dto: BoardTokenRequestDto, @CurrentUser() actor: AuthUser): Promise<BoardTokenDto> {
    return this.auth.issueBoardToken(dto.label.trim(), actor);
  }
}
