import { Module } from '@nestjs/common';
import { PlansModule } from '../plans/plans.module';
import { CharacterizationController } from './characterization.controller';
import { CharacterizationService } from './characterization.service';

/** Limits from characterization data (issue 10): upload, figures per quantity, accepting limits into a draft. */
@Module({
  imports: [PlansModule],
  controllers: [CharacterizationController],
  providers: [CharacterizationService],
})
export class CharacterizationModule {}
