import { Module } from '@nestjs/common';
import { ShiftController } from './shift.controller';
import { SHIFT_CLOCK, ShiftClock, ShiftSummaryService } from './shift-summary.service';

/** Shift windows (SHIFT_STARTS) and each station's counters for the shift running now. Read-only. */
@Module({
  controllers: [ShiftController],
  providers: [{ provide: SHIFT_CLOCK, useValue: (() => new Date()) satisfies ShiftClock }, ShiftSummaryService],
  exports: [ShiftSummaryService],
})
export class ShiftModule {}
