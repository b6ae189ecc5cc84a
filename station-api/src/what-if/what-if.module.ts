import { Module } from '@nestjs/common';
import { PlansModule } from '../plans/plans.module';
import { WhatIfController } from './what-if.controller';
import { WhatIfService } from './what-if.service';

/** What-if before release: re-judging stored measurements against a draft, read-only. */
@Module({
  imports: [PlansModule],
  controllers: [WhatIfController],
  providers: [WhatIfService],
  exports: [WhatIfService],
})
export class WhatIfModule {}
