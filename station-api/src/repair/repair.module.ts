import { Module } from '@nestjs/common';
import { RunsModule } from '../runs/runs.module';
import { RepairQueueController } from './repair-queue.controller';
import { RepairQueueService } from './repair-queue.service';
import { RepairTagService } from './repair-tag.service';
import { RepairController } from './repair.controller';
import { RepairService } from './repair.service';
import { RepairCausesService } from './repair-causes.service';
import { RepairRecordsController } from './repair-records.controller';
import { RepairRecordsService } from './repair-records.service';

/**
 * Everything about repair: the queue, the repair tag (PDF with Code 128), sending a unit to repair and the
 * repair loop (receive, return for retest, scrap) with repair records, the cause list and the Pareto by cause. AuditService comes from the global AuditModule.
 */
@Module({
  imports: [RunsModule],
  controllers: [RepairController, RepairQueueController, RepairRecordsController],
  providers: [RepairService, RepairQueueService, RepairTagService, RepairCausesService, RepairRecordsService],
})
export class RepairModule {}
