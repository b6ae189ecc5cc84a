import { BadRequestException, Body, Controller, Delete, Get, HttpCode, Param, ParseIntPipe, Patch, Post, Query } from '@nestjs/common';
import { ApiBadRequestResponse, ApiBearerAuth, ApiConflictResponse, ApiNoContentResponse, ApiNotFoundResponse, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { AuthUser, CurrentUser } from '../common/decorators/current-user.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { CreateRepairCauseDto, RepairCauseDto, RepairCauseQueryDto, UpdateRepairCauseDto } from './dto/repair-cause.dto';
import { RepairParetoDto, RepairParetoQueryDto, RepairRecordDto, RepairRecordListDto, RepairRecordQueryDto } from './dto/repair-record.dto';
import { CorrectRepairRecordDto } from './dto/repair.dto';
import { RepairCausesService } from './repair-causes.service';
import { RepairRecordsService } from './repair-records.service';

const idParam = (what: string) =>
  new ParseIntPipe({
    exceptionFactory: () => new BadRequestException({ message: `The ${what} id in the address must be a whole number, e.g. 1.`, details: { code: 'bad_id' } }),
  });

/** The list of repair causes (engineers maintain it), repair records, their corrections and the Pareto by cause. */
@ApiBearerAuth()
@ApiTags('repair')
@Controller()
export class RepairRecordsController {
  constructor(
    private readonly causes: RepairCausesService,
    private readonly records: RepairRecordsService,
  ) {}

  @Get('repair-causes')
  @Roles('operator', 'engineer', 'quality', 'admin')
  @ApiOperation({ summary: 'Repair causes, alphabetical: the active ones, or all with ?all=true (with how many records name each)' })
  @ApiOkResponse({ type: [RepairCauseDto] })
  listCauses(@Query() q: RepairCauseQueryDto): Promise<RepairCauseDto[]> {
    return this.causes.list(q.all === 'true');
  }

  @Post('repair-causes')
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Add a repair cause (audited)' })
  @ApiOkResponse({ type: RepairCauseDto })
  @ApiConflictResponse({ description: 'details.code duplicate_cause (names compare without case)' })
  createCause(@Body() dto: CreateRepairCauseDto, @CurrentUser() user: AuthUser): Promise<RepairCauseDto> {
    return this.causes.create(dto, user.id);
  }

  @Patch('repair-causes/:id')
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Rename a repair cause or switch it off / on (audited); records keep pointing at it' })
  @ApiOkResponse({ type: RepairCauseDto })
  @ApiNotFoundResponse({ description: 'details.code unknown_cause' })
  @ApiConflictResponse({ description: 'details.code duplicate_cause' })
  updateCause(@Param('id', idParam('cause')) id: number, @Body() dto: UpdateRepairCauseDto, @CurrentUser() user: AuthUser): Promise<RepairCauseDto> {
    return this.causes.update(id, dto, user.id);
  }

  @Delete('repair-causes/:id')
  @HttpCode(204)
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Delete a repair cause no record names (audited); one in use is refused: switch it off instead' })
  @ApiNoContentResponse()
  @ApiNotFoundResponse({ description: 'details.code unknown_cause' })
  @ApiConflictResponse({ description: 'details.code cause_in_use' })
  async deleteCause(@Param('id', idParam('cause')) id: number, @CurrentUser() user: AuthUser): Promise<void> {
    await this.causes.remove(id, user.id);
  }

  @Get('repair-records/pareto')
  @Roles('operator', 'engineer', 'quality', 'admin')
  @ApiOperation({ summary: 'Pareto by repair cause (counts and cumulative percentage), filtered by lot, product and the day the record was written' })
  @ApiOkResponse({ type: RepairParetoDto })
  pareto(@Query() q: RepairParetoQueryDto): Promise<RepairParetoDto> {
    return this.records.pareto(q);
  }

  @Get('repair-records')
  @Roles('operator', 'engineer', 'quality', 'admin')
  @ApiOperation({ summary: 'Repair records, newest first: of one serial (?serial=) or all' })
  @ApiOkResponse({ type: RepairRecordListDto })
  list(@Query() q: RepairRecordQueryDto): Promise<RepairRecordListDto> {
    return this.records.list(q);
  }

  @Post('repair-records/:id/corrections')
  @Roles('engineer', 'quality', 'admin')
  @ApiOperation({ summary: 'Correct a repair record: a new record that points at it (records are never edited); audited with the reason' })
  @ApiOkResponse({ type: RepairRecordDto })
  @ApiBadRequestResponse({ description: 'validation: details lists the fields (symptom, causeId, actionTaken, reason)' })
  @ApiNotFoundResponse({ description: 'details.code unknown_record' })
  @ApiConflictResponse({ description: 'details.code record_already_corrected' })
  correct(@Param('id', idParam('record')) id: number, @Body() dto: CorrectRepairRecordDto, @CurrentUser() user: AuthUser): Promise<RepairRecordDto> {
    return this.records.correct(id, dto, user.id);
  }
}
