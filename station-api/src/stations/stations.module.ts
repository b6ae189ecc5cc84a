import { Module } from '@nestjs/common';
import { FixturesModule } from '../fixtures/fixtures.module';
import { LotsModule } from '../lots/lots.module';
import { StationsController } from './stations.controller';
import { StationsService } from './stations.service';

@Module({
  imports: [FixturesModule, LotsModule],
  controllers: [StationsController],
  providers: [StationsService],
  exports: [StationsService],
})
export class StationsModule {}
