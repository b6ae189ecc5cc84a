import { Module } from '@nestjs/common';
import { AuthModule } from '../auth/auth.module';
import { UsersModule } from '../users/users.module';
import { StationEventsGateway } from './station-events.gateway';
import { StationEventsPublisher } from './station-events.publisher';

/** socket.io gateway and the publisher every live event goes through. */
@Module({
  imports: [AuthModule, UsersModule],
  providers: [StationEventsGateway, StationEventsPublisher],
  exports: [StationEventsPublisher],
})
export class RealtimeModule {}
