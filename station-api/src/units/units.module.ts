import { Module } from '@nestjs/common';
import { UnitsController } from './units.controller';
import { UnitHistoryService } from './unit-history.service';
import { UnitsService } from './units.service';

@Module({
  controllers: [UnitsController],
  providers: [UnitsService, UnitHistoryService],
  exports: [UnitsService],
})
export class UnitsModule {}
