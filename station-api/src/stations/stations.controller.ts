import { Body, Controller, Get, Param, ParseIntPipe, Patch, Post } from '@nestjs/common';
import { ApiBearerAuth, ApiCreatedResponse, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { AuthUser, CurrentUser } from '../common/decorators/current-user.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { ROLES } from '../users/user.entity';
import { CreateStationDto, StationDto, UpdateStationDto } from './dto/station.dto';
import { StationsService } from './stations.service';

@ApiTags('stations')
@ApiBearerAuth()
@Controller('stations')
export class StationsController {
  constructor(private readonly stations: StationsService) {}

  @Get()
  @Roles(...ROLES)
  @ApiOperation({ summary: 'All stations with fixture, active lot, state and reasons' })
  @ApiOkResponse({ type: [StationDto] })
  list(): Promise<StationDto[]> {
    return this.stations.list();
  }

  @Get(':id')
  @Roles(...ROLES)
  @ApiOkResponse({ type: StationDto })
  get(@Param('id', ParseIntPipe) id: number): Promise<StationDto> {
    return this.stations.get(id);
  }

  @Post()
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Add a station' })
  @ApiCreatedResponse({ type: StationDto })
  create(@Body() dto: CreateStationDto, @CurrentUser() actor: AuthUser): Promise<StationDto> {
    return this.stations.create(dto, actor);
  }

  @Patch(':id')
  @Roles('engineer', 'quality', 'admin')
  @ApiOperation({ summary: 'Set or clear the active lot (must be open) and the fixture' })
  @ApiOkResponse({ type: StationDto })
  update(@Param('id', ParseIntPipe) id: number, @Body() dto: UpdateStationDto, @CurrentUser() actor: AuthUser): Promise<StationDto> {
    return this.stations.update(id, dto, actor);
  }
}
