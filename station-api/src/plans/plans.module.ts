import { Module } from '@nestjs/common';
import { PlanFilesService } from './plan-files.service';
import { PlanVersionsService } from './plan-versions.service';
import { PlansController } from './plans.controller';
import { PlansService } from './plans.service';

/** Test plans and their versions. Exports PlansService (the run engine asks it for a product's released version) and PlanVersionsService (limits from characterization data edit a draft through it). */
@Module({
  controllers: [PlansController],
  providers: [PlansService, PlanVersionsService, PlanFilesService],
  exports: [PlansService, PlanVersionsService],
})
export class PlansModule {}
