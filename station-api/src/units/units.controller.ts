import { Controller, Get, Param } from '@nestjs/common';
import { ApiBearerAuth, ApiNotFoundResponse, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Roles } from '../common/decorators/roles.decorator';
import { ROLES } from '../users/user.entity';
import { UnitDto } from './dto/unit.dto';
import { UnitHistoryDto } from './dto/unit-history.dto';
import { UnitHistoryService } from './unit-history.service';
import { UnitsService } from './units.service';

@ApiTags('units')
@ApiBearerAuth()
@Controller('units')
export class UnitsController {
  constructor(
    private readonly units: UnitsService,
    private readonly unitHistory: UnitHistoryService,
  ) {}

  @Get(':serial/history')
  @Roles(...ROLES)
  @ApiOperation({ summary: 'Everything that happened to one unit: runs with measurements, repairs and dispositions (serial: any case, spaces trimmed)' })
  @ApiOkResponse({ type: UnitHistoryDto })
  @ApiNotFoundResponse({ description: 'details.code = unknown_serial' })
  history(@Param('serial') serial: string): Promise<UnitHistoryDto> {
    return this.unitHistory.history(serial);
  }

  @Get(':serial')
  @Roles(...ROLES)
  @ApiOperation({ summary: 'A unit by serial, with its lot and product' })
  @ApiOkResponse({ type: UnitDto })
  @ApiNotFoundResponse({ description: 'details.code = unknown_serial' })
  get(@Param('serial') serial: string): Promise<UnitDto> {
    return this.units.getBySerial(serial);
  }
}
