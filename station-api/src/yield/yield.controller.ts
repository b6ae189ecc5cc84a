import { Controller, Get, Query, Res } from '@nestjs/common';
import { ApiBearerAuth, ApiOkResponse, ApiOperation, ApiProduces, ApiTags } from '@nestjs/swagger';
import type { Response } from 'express';
import { Roles } from '../common/decorators/roles.decorator';
import { ControlChartQueryDto, ExportQueryDto, ParetoQueryDto, ParetoUnitsQueryDto, QuantityQueryDto, YieldFilterDto, YieldFiguresQueryDto } from './dto/yield-query.dto';
import { FailureParetoService } from './failure-pareto.service';
import { MeasurementExportService } from './measurement-export.service';
import { QuantityStatsService } from './quantity-stats.service';
import { YieldFiguresService } from './yield-figures.service';
import type { CapabilityView, ControlChartView, ParetoUnitsView, ParetoView, QuantityChoice, YieldFiguresView } from '../contract/yield-views';

/** Read-only quality views: yield, failure Pareto, capability, control charts and the measurements export. */
@ApiTags('yield')
@ApiBearerAuth()
@Controller('yield')
@Roles('engineer', 'quality', 'admin')
export class YieldController {
  constructor(
    private readonly figuresService: YieldFiguresService,
    private readonly paretoService: FailureParetoService,
    private readonly quantityService: QuantityStatsService,
    private readonly exportService: MeasurementExportService,
  ) {}

  @Get('figures')
  @ApiOperation({ summary: 'First-pass, final and rolled throughput yield with 95 % Wilson score intervals, a breakdown and a daily trend' })
  @ApiOkResponse({ description: 'YieldFiguresView' })
  figures(@Query() q: YieldFiguresQueryDto): Promise<YieldFiguresView> {
    return this.figuresService.figures(q);
  }

  @Get('pareto')
  @ApiOperation({ summary: 'Failure Pareto of failing runs by step or by failing quantity, with the cumulative percentage' })
  pareto(@Query() q: ParetoQueryDto): Promise<ParetoView> {
    return this.paretoService.pareto(q);
  }

  @Get('pareto/units')
  @ApiOperation({ summary: 'The failing measurements (serial, run, value, limits) behind one Pareto bar' })
  paretoUnits(@Query() q: ParetoUnitsQueryDto): Promise<ParetoUnitsView> {
    return this.paretoService.units(q);
  }

  @Get('quantities')
  @ApiOperation({ summary: 'The measured quantities of a product (or lot), in plan order' })
  quantities(@Query() q: YieldFilterDto): Promise<QuantityChoice[]> {
    return this.quantityService.quantities(q);
  }

  @Get('capability')
  @ApiOperation({ summary: 'Histogram with limits, mean, σ, Cp/Cpk/Pp/Ppk with intervals and expected ppm of one quantity' })
  capability(@Query() q: QuantityQueryDto): Promise<CapabilityView> {
    return this.quantityService.capability(q);
  }

  @Get('control-chart')
  @ApiOperation({ summary: 'Individuals/moving-range or X̄–R chart of one quantity with Western Electric or Nelson rules' })
  controlChart(@Query() q: ControlChartQueryDto): Promise<ControlChartView> {
    return this.quantityService.controlChart(q);
  }

  @Get('measurements.csv')
  @ApiProduces('text/csv')
  @ApiOperation({ summary: 'The measurements behind the views as CSV (RFC 4180), with the same filters' })
  async exportCsv(@Query() q: ExportQueryDto, @Res() res: Response): Promise<void> {
    const chunks = this.exportService.csv(q);
    // the first chunk (the header) is read before anything is sent, so a refused filter still answers 400 as JSON
    const first = await chunks.next();
    const stamp = new Date().toISOString().slice(0, 10);
    res.status(200);
    res.setHeader('Content-Type', 'text/csv; charset=utf-8; header=present');
    res.setHeader('Content-Disposition', `attachment; filename="railwright-measurements-${stamp}.csv"`);
    if (!first.done) res.write(first.value);
    for await (const chunk of chunks) res.write(chunk);
    res.end();
  }
}
