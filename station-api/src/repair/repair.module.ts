import { Module } from '@nestjs/common';
import { RunsModule } from '../runs/runs.module';
import { RepairController } from './repair.controller';
import { RepairService } from './repair.service';

/** The repair loop: receive, return for retest, scrap (AuditService comes from the global AuditModule). */
@Module({
  imports: [RunsModule],
  controllers: [RepairController],
  providers: [RepairService],
})
export class RepairModule {}
