import { Body, Controller, Get, Param, ParseIntPipe, Post, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiCreatedResponse, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { AuthUser, CurrentUser } from '../common/decorators/current-user.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { ROLES } from '../users/user.entity';
import { CreateLotDto, LotDetailDto, LotDto, LotQueryDto } from './dto/lot.dto';
import { LotsService } from './lots.service';

@ApiTags('lots')
@ApiBearerAuth()
@Controller('lots')
export class LotsController {
  constructor(private readonly lots: LotsService) {}

  @Get()
  @Roles(...ROLES)
  @ApiOperation({ summary: 'Lots, newest first, with unit counts by state' })
  @ApiOkResponse({ type: [LotDto] })
  list(@Query() query: LotQueryDto): Promise<LotDto[]> {
    return this.lots.list(query);
  }

  @Get(':id')
  @Roles(...ROLES)
  @ApiOperation({ summary: 'One lot with unit counts by state and its serial range' })
  @ApiOkResponse({ type: LotDetailDto })
  get(@Param('id', ParseIntPipe) id: number): Promise<LotDetailDto> {
    return this.lots.get(id);
  }

  @Post()
  @Roles('engineer', 'quality', 'admin')
  @ApiOperation({ summary: "Open a lot and register its units (serials: product prefix, this week's YYWW, 5-digit sequence)" })
  @ApiCreatedResponse({ type: LotDetailDto })
  create(@Body() dto: CreateLotDto, @CurrentUser() actor: AuthUser): Promise<LotDetailDto> {
    return this.lots.create(dto, actor);
  }
}
