import { Module } from '@nestjs/common';
import { FailureParetoService } from './failure-pareto.service';
import { MeasurementExportService } from './measurement-export.service';
import { QuantityStatsService } from './quantity-stats.service';
import { YieldController } from './yield.controller';
import { YieldFiguresService } from './yield-figures.service';

/** The quality views: read-only aggregate queries over test_runs and measurements; statistics from ../stats. */
@Module({
  controllers: [YieldController],
  providers: [YieldFiguresService, FailureParetoService, QuantityStatsService, MeasurementExportService],
})
export class YieldModule {}
