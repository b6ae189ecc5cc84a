import { Module } from '@nestjs/common';
import { UsersController } from './users.controller';
import { UserAccessEvents } from './user-access.events';
import { UsersService } from './users.service';

@Module({
  controllers: [UsersController],
  providers: [UsersService, UserAccessEvents],
  exports: [UsersService, UserAccessEvents],
})
export class UsersModule {}
