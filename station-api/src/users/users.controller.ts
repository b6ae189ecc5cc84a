import { Body, Controller, Get, HttpCode, Param, ParseIntPipe, Patch, Post } from '@nestjs/common';
import { ApiBearerAuth, ApiConflictResponse, ApiCreatedResponse, ApiNoContentResponse, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { AuthUser, CurrentUser } from '../common/decorators/current-user.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { CreateUserDto, ResetPasswordDto, UpdateUserDto, UserDto } from './dto/user.dto';
import { UsersService } from './users.service';

@ApiTags('users')
@ApiBearerAuth()
@Roles('admin')
@Controller('users')
export class UsersController {
  constructor(private readonly users: UsersService) {}

  @Get()
  @ApiOperation({ summary: 'All user accounts, active or not' })
  @ApiOkResponse({ type: [UserDto] })
  list(): Promise<UserDto[]> {
    return this.users.list();
  }

  @Post()
  @ApiOperation({ summary: 'Create a user account' })
  @ApiCreatedResponse({ type: UserDto })
  @ApiConflictResponse({ description: 'username taken (details.code = username_taken)' })
  create(@Body() dto: CreateUserDto, @CurrentUser() actor: AuthUser): Promise<UserDto> {
    return this.users.create(dto, actor);
  }

  @Patch(':id')
  @ApiOperation({ summary: 'Change display name or roles; deactivate or reactivate' })
  @ApiOkResponse({ type: UserDto })
  @ApiConflictResponse({ description: 'would leave no active admin (details.code = last_admin)' })
  update(@Param('id', ParseIntPipe) id: number, @Body() dto: UpdateUserDto, @CurrentUser() actor: AuthUser): Promise<UserDto> {
    return this.users.update(id, dto, actor);
  }

  @Post(':id/password')
  @HttpCode(204)
  @ApiOperation({ summary: 'Set a new password for the user' })
  @ApiNoContentResponse()
  resetPassword(@Param('id', ParseIntPipe) id: number, @Body() dto: ResetPasswordDto, @CurrentUser() actor: AuthUser): Promise<void> {
    return this.users.resetPassword(id, dto, actor);
  }
}
