import { Module, OnModuleInit } from '@nestjs/common';
import { FixtureLinkModule } from '../fixtures/transport/fixture-link.module';
import { PlansModule } from '../plans/plans.module';
import { RealtimeModule } from '../realtime/realtime.module';
import { StationsModule } from '../stations/stations.module';
import { StationsService } from '../stations/stations.service';
import { RunEngineService } from './run-engine.service';
import { RunsController } from './runs.controller';
import { RunsService } from './runs.service';
import { StationRunsController } from './station-runs.controller';
import { StationStateNotifier } from './station-state.notifier';

/** The run engine, the runs REST routes and the station routes an operator uses (status, scan, start). */
@Module({
  imports: [FixtureLinkModule, RealtimeModule, StationsModule, PlansModule],
  controllers: [RunsController, StationRunsController],
  // StationStateNotifier announces station states when master data is written (it watches the ORM's flushes)
  providers: [RunEngineService, RunsService, StationStateNotifier],
  exports: [RunEngineService],
})
export class RunsModule implements OnModuleInit {
  constructor(
    private readonly engine: RunEngineService,
    private readonly stations: StationsService,
  ) {}

  onModuleInit(): void {
    // GET /api/stations shows the same live state and reasons as GET /api/stations/:id/status
    this.stations.useStatusSource(async (station) => {
      const s = await this.engine.statusOfLoaded(station);
      return { state: s.state, reasons: s.reasons };
    });
  }
}
