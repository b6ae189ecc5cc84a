import { Body, Controller, Get, HttpCode, Param, ParseIntPipe, Post, Query, UploadedFile, UseFilters, UseInterceptors } from '@nestjs/common';
import { FileInterceptor } from '@nestjs/platform-express';
import { ApiBearerAuth, ApiBody, ApiConsumes, ApiOperation, ApiTags } from '@nestjs/swagger';
import { AuthUser, CurrentUser } from '../common/decorators/current-user.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { MAX_CHARACTERIZATION_FILE_BYTES } from './characterization-csv';
import { CharacterizationService, type AcceptResult, type AnalysisView, type DataSetDetail, type DataSetSummary, type UploadedFile as CsvFile } from './characterization.service';
import { AcceptLimitsDto, AnalysisQueryDto, UploadDataSetDto } from './dto/characterization.dto';
import { UploadRefusalFilter } from './upload-refusal.filter';

@ApiTags('characterization')
@ApiBearerAuth()
@Controller('characterization/data-sets')
export class CharacterizationController {
  constructor(private readonly service: CharacterizationService) {}

  @Post()
  @Roles('engineer', 'admin')
  @UseFilters(UploadRefusalFilter)
  // one byte over the limit reaches multer's refusal, answered with the limit by UploadRefusalFilter
  @UseInterceptors(FileInterceptor('file', { limits: { fileSize: MAX_CHARACTERIZATION_FILE_BYTES, files: 1, fields: 10 } }))
  @ApiConsumes('multipart/form-data')
  @ApiBody({ schema: { type: 'object', required: ['file', 'name'], properties: { file: { type: 'string', format: 'binary' }, name: { type: 'string' }, product: { type: 'string' } } } })
  @ApiOperation({ summary: 'Upload pilot-build measurements as CSV (docs/characterization-data.md); a file with any problem stores nothing' })
  upload(@UploadedFile() file: CsvFile | undefined, @Body() dto: UploadDataSetDto, @CurrentUser() actor: AuthUser): Promise<DataSetSummary> {
    return this.service.upload(file, dto, actor);
  }

  @Get()
  @Roles('engineer', 'quality', 'admin')
  @ApiOperation({ summary: 'All characterization data sets, newest first (without their values)' })
  list(): Promise<DataSetSummary[]> {
    return this.service.list();
  }

  @Get(':id')
  @Roles('engineer', 'quality', 'admin')
  @ApiOperation({ summary: 'One data set with its serials and values' })
  get(@Param('id', ParseIntPipe) id: number): Promise<DataSetDetail> {
    return this.service.get(id);
  }

  @Get(':id/analysis')
  @Roles('engineer', 'quality', 'admin')
  @ApiOperation({ summary: 'Histogram, mean, σ, normality test, Cp/Cpk/Pp/Ppk with 95 % intervals and ppm outside proposed limits, and suggested limits' })
  analyse(@Param('id', ParseIntPipe) id: number, @Query() q: AnalysisQueryDto): Promise<AnalysisView> {
    return this.service.analyse(id, q);
  }

  @Post(':id/accept')
  @HttpCode(200)
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Put proposed limits into one limit of a draft plan version (409 for a released version); audited with the statistics' })
  accept(@Param('id', ParseIntPipe) id: number, @Body() dto: AcceptLimitsDto, @CurrentUser() actor: AuthUser): Promise<AcceptResult> {
    return this.service.accept(id, dto, actor);
  }
}
