import { Module } from '@nestjs/common';
import { RealtimeModule } from '../realtime/realtime.module';
import { RunsModule } from '../runs/runs.module';
import { ShiftModule } from '../shift/shift.module';
import { BoardController } from './board.controller';
import { BoardService } from './board.service';
import { RunProgressTracker } from './run-progress.tracker';

/** The line board snapshot (state, current run and step, this shift's runs and counters per station). */
@Module({
  imports: [RunsModule, RealtimeModule, ShiftModule],
  controllers: [BoardController],
  providers: [RunProgressTracker, BoardService],
})
export class BoardModule {}
