import { Body, Controller, Get, HttpCode, Param, ParseIntPipe, Post } from '@nestjs/common';
import {
  ApiBearerAuth,
  ApiConflictResponse,
  ApiCreatedResponse,
  ApiNotFoundResponse,
  ApiOkResponse,
  ApiOperation,
  ApiTags,
  ApiUnprocessableEntityResponse,
} from '@nestjs/swagger';
import { AuthUser, CurrentUser } from '../common/decorators/current-user.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { ROLES } from '../users/user.entity';
import { ScanDto, ScanResultDto, StartedRunDto, StartRunDto, StationStatusDto } from './dto/runs.dto';
import { RunEngineService } from './run-engine.service';
import { REFUSAL_CODES } from './run-refusal';

const REFUSALS = `details.code one of ${REFUSAL_CODES.join(', ')} (see runs/run-refusal.ts for the HTTP status of each)`;

/** The operator's routes on a station: status, scan, start. (Station master data lives in the stations feature.) */
@ApiTags('runs')
@ApiBearerAuth()
@Controller('stations')
export class StationRunsController {
  constructor(private readonly engine: RunEngineService) {}

  @Get(':id/status')
  @Roles(...ROLES)
  @ApiOperation({ summary: 'The station state (idle, ready, testing, fault, blocked) and the reasons in plain words' })
  @ApiOkResponse({ type: StationStatusDto })
  @ApiNotFoundResponse({ description: 'details.code station_not_found' })
  status(@Param('id', ParseIntPipe) id: number): Promise<StationStatusDto> {
    return this.engine.status(id);
  }

  @Post(':id/scan')
  @HttpCode(200)
  @Roles('operator', 'engineer', 'admin')
  @ApiOperation({ summary: 'Check a scanned serial against the station, its lot and plan; nothing is powered' })
  @ApiOkResponse({ type: ScanResultDto })
  @ApiConflictResponse({ description: REFUSALS })
  @ApiUnprocessableEntityResponse({ description: 'details.code pattern_mismatch or not_a_serial' })
  scan(@Param('id', ParseIntPipe) id: number, @Body() dto: ScanDto, @CurrentUser() user: AuthUser): Promise<ScanResultDto> {
    return this.engine.scan(id, dto.serial, { id: user.id, roles: user.roles });
  }

  @Post(':id/runs')
  @Roles('operator', 'engineer', 'admin')
  @ApiOperation({ summary: 'Start a run; it continues in the background and reports through live events' })
  @ApiCreatedResponse({ type: StartedRunDto })
  @ApiConflictResponse({ description: REFUSALS })
  async start(@Param('id', ParseIntPipe) id: number, @Body() dto: StartRunDto, @CurrentUser() user: AuthUser): Promise<StartedRunDto> {
    const started = await this.engine.start({
        stationId: id,
        serial: dto.serial,
        requester: { id: user.id, roles: user.roles, displayName: user.displayName },
        safetyConfirmed: dto.safetyConfirmed,
        overrideReason: dto.overrideReason,
      });
    // the run goes on; a failure there is reported as its verdict, never as an unhandled rejection
    started.done.catch(() => undefined);
    return { run: started.run };
  }
}
