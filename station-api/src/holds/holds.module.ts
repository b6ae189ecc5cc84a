import { Module } from '@nestjs/common';
import { MailModule } from '../mail/mail.module';
import { PlansModule } from '../plans/plans.module';
import { RealtimeModule } from '../realtime/realtime.module';
import { HoldEvaluatorService } from './hold-evaluator.service';
import { HoldRulesService } from './hold-rules.service';
import { HoldsController } from './holds.controller';
import { HoldsService } from './holds.service';

/** Hold rules per product, their evaluation after every finished test, holds and their lifting, alerts. */
@Module({
  imports: [RealtimeModule, MailModule, PlansModule],
  controllers: [HoldsController],
  providers: [HoldRulesService, HoldsService, HoldEvaluatorService],
  exports: [HoldEvaluatorService],
})
export class HoldsModule {}
