import { Controller, Get, HttpCode, Param, ParseIntPipe, Post, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiConflictResponse, ApiNotFoundResponse, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Roles } from '../common/decorators/roles.decorator';
import { ROLES } from '../users/user.entity';
import { AbortResultDto, RunDetailDto, RunListDto, RunsQueryDto } from './dto/runs.dto';
import { RunEngineService } from './run-engine.service';
import { RunsService } from './runs.service';

@ApiTags('runs')
@ApiBearerAuth()
@Controller('runs')
export class RunsController {
  constructor(
    private readonly runs: RunsService,
    private readonly engine: RunEngineService,
  ) {}

  @Get()
  @Roles(...ROLES)
  @ApiOperation({ summary: 'Runs, newest first, filtered by station, lot, serial, verdict and start time' })
  @ApiOkResponse({ type: RunListDto })
  list(@Query() query: RunsQueryDto): Promise<RunListDto> {
    return this.runs.list(query);
  }

  @Get(':id')
  @Roles(...ROLES)
  @ApiOperation({ summary: 'One run with every measurement and the plan steps it ran' })
  @ApiOkResponse({ type: RunDetailDto })
  @ApiNotFoundResponse({ description: 'details.code run_not_found' })
  get(@Param('id', ParseIntPipe) id: number): Promise<RunDetailDto> {
    return this.runs.get(id);
  }

  @Post(':id/abort')
  @HttpCode(200)
  @Roles('operator', 'engineer', 'admin')
  @ApiOperation({ summary: 'Stop a running test; answers once the fixture is safe and the run is stored as aborted' })
  @ApiOkResponse({ type: AbortResultDto })
  @ApiConflictResponse({ description: 'details.code run_finished' })
  async abort(@Param('id', ParseIntPipe) id: number): Promise<AbortResultDto> {
    const outcome = await this.engine.abort(id);
    return {
      runId: outcome.runId,
      verdict: outcome.verdict,
      ...(outcome.errorMessage ? { errorMessage: outcome.errorMessage } : {}),
      ...(outcome.endReason ? { endReason: outcome.endReason } : {}),
    };
  }
}
