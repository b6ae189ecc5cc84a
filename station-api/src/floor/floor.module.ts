import { Module } from '@nestjs/common';
import { RealtimeModule } from '../realtime/realtime.module';
import { RunsModule } from '../runs/runs.module';
import { BoardService } from './board.service';
import { FloorController } from './floor.controller';
import { RepairQueueService } from './repair-queue.service';
import { RepairTagService } from './repair-tag.service';
import { RunProgressTracker } from './run-progress.tracker';
import { FLOOR_CLOCK, FloorClock, ShiftSummaryService } from './shift-summary.service';

/** Shop-floor views: shift counters, the line board snapshot, repair tags and the repair queue. Read-only. */
@Module({
  imports: [RunsModule, RealtimeModule],
  controllers: [FloorController],
  providers: [
    { provide: FLOOR_CLOCK, useValue: (() => new Date()) satisfies FloorClock },
    ShiftSummaryService,
    RunProgressTracker,
    BoardService,
    RepairTagService,
    RepairQueueService,
  ],
  exports: [ShiftSummaryService],
})
export class FloorModule {}
