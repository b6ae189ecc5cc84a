import { Module } from '@nestjs/common';
import { RunsModule } from '../runs/runs.module';
import { RepairQueueController } from './repair-queue.controller';
import { RepairQueueService } from './repair-queue.service';
import { RepairTagService } from './repair-tag.service';
import { RepairController } from './repair.controller';
import { RepairService } from './repair.service';

/**
 * Everything about repair: the queue, the repair tag (PDF with Code 128), sending a unit to repair and the
 * repair loop (receive, return for retest, scrap). AuditService comes from the global AuditModule.
 */
@Module({
  imports: [RunsModule],
  controllers: [RepairController, RepairQueueController],
  providers: [RepairService, RepairQueueService, RepairTagService],
})
export class RepairModule {}
