import { Body, Controller, Get, Header, HttpCode, Param, ParseIntPipe, Post, Query, Res, StreamableFile, UploadedFile, UseFilters, UseInterceptors } from '@nestjs/common';
import { FileInterceptor } from '@nestjs/platform-express';
import type { Response } from 'express';
import { ApiBearerAuth, ApiBody, ApiConflictResponse, ApiConsumes, ApiCreatedResponse, ApiOkResponse, ApiOperation, ApiProduces, ApiTags } from '@nestjs/swagger';
import { AuthUser, CurrentUser } from '../common/decorators/current-user.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { ROLES } from '../users/user.entity';
import { CloseLotDto, CreateLotDto, LotDetailDto, LotDto, LotImportResultDto, LotQueryDto, LotUnitDto, ReleaseCheckDto, ReleaseLotDto } from './dto/lot.dto';
import { MAX_LOT_FILE_BYTES } from './lot-csv';
import { LotFileTooLargeFilter } from './lot-file-too-large.filter';
import { LotImportService, type UploadedLotFile } from './lot-import.service';
import { LotReleaseService } from './lot-release.service';
import { LotsService } from './lots.service';

@ApiTags('lots')
@ApiBearerAuth()
@Controller('lots')
export class LotsController {
  constructor(
    private readonly lots: LotsService,
    private readonly files: LotImportService,
    private readonly releases: LotReleaseService,
  ) {}

  @Get()
  @Roles(...ROLES)
  @ApiOperation({ summary: 'Lots, newest first, with unit counts by state' })
  @ApiOkResponse({ type: [LotDto] })
  list(@Query() query: LotQueryDto): Promise<LotDto[]> {
    return this.lots.list(query);
  }

  // before ':id', which would otherwise take "export.csv" for an id
  @Get('export.csv')
  @Roles('engineer', 'quality', 'admin')
  @Header('Content-Type', 'text/csv; charset=utf-8')
  @Header('Content-Disposition', 'attachment; filename="railwright-lots.csv"')
  @ApiProduces('text/csv')
  @ApiOperation({ summary: 'The lots list (same filters) as a lot file that the import reads back (docs/lots-and-release.md)' })
  exportFile(@Query() query: LotQueryDto): Promise<string> {
    return this.files.exportFile(query);
  }

  @Post('import')
  @HttpCode(201)
  @Roles('engineer', 'quality', 'admin')
  @UseInterceptors(FileInterceptor('file', { limits: { fileSize: MAX_LOT_FILE_BYTES, files: 1 } }))
  @UseFilters(LotFileTooLargeFilter)
  @ApiConsumes('multipart/form-data')
  @ApiBody({ schema: { type: 'object', properties: { file: { type: 'string', format: 'binary' } } } })
  @ApiOperation({ summary: 'Open lots from a CSV lot file (multipart field "file"); a file with any bad row imports nothing and lists every problem' })
  @ApiCreatedResponse({ type: LotImportResultDto })
  importFile(@UploadedFile() file: UploadedLotFile | undefined, @CurrentUser() actor: AuthUser): Promise<LotImportResultDto> {
    return this.files.importFile(file, actor);
  }

  @Get(':id')
  @Roles(...ROLES)
  @ApiOperation({ summary: 'One lot with unit counts by state and its serial range' })
  @ApiOkResponse({ type: LotDetailDto })
  get(@Param('id', ParseIntPipe) id: number): Promise<LotDetailDto> {
    return this.lots.get(id);
  }

  @Get(':id/units')
  @Roles('engineer', 'quality', 'admin')
  @ApiOperation({ summary: 'Every unit of the lot with its state, by serial' })
  @ApiOkResponse({ type: [LotUnitDto] })
  units(@Param('id', ParseIntPipe) id: number): Promise<LotUnitDto[]> {
    return this.lots.units(id);
  }

  @Post()
  @Roles('engineer', 'quality', 'admin')
  @ApiOperation({ summary: "Open a lot and register its units: a serial range (firstSerial, lastSerial), a list (serials), or this week's next free serials" })
  @ApiCreatedResponse({ type: LotDetailDto })
  create(@Body() dto: CreateLotDto, @CurrentUser() actor: AuthUser): Promise<LotDetailDto> {
    return this.lots.create(dto, actor);
  }

  @Get(':id/release-check')
  @Roles('engineer', 'quality', 'admin')
  @ApiOperation({ summary: 'Whether the lot may be released, and what stops it, in plain words' })
  @ApiOkResponse({ type: ReleaseCheckDto })
  releaseCheck(@Param('id', ParseIntPipe) id: number): Promise<ReleaseCheckDto> {
    return this.releases.check(id);
  }

  @Post(':id/release')
  @HttpCode(200)
  @Roles('quality', 'admin')
  @ApiOperation({ summary: 'Release the lot and issue its certificate of conformance' })
  @ApiOkResponse({ type: LotDetailDto })
  @ApiConflictResponse({ description: 'details.code = lot_not_releasable, details.blockers = what stops it' })
  release(@Param('id', ParseIntPipe) id: number, @Body() dto: ReleaseLotDto, @CurrentUser() actor: AuthUser): Promise<LotDetailDto> {
    return this.releases.release(id, dto, actor);
  }

  @Post(':id/close')
  @HttpCode(200)
  @Roles('quality', 'admin')
  @ApiOperation({ summary: 'Close a released lot, with a reason' })
  @ApiOkResponse({ type: LotDetailDto })
  close(@Param('id', ParseIntPipe) id: number, @Body() dto: CloseLotDto, @CurrentUser() actor: AuthUser): Promise<LotDetailDto> {
    return this.releases.close(id, dto, actor);
  }

  @Get(':id/certificate.pdf')
  @Roles('engineer', 'quality', 'admin')
  @ApiProduces('application/pdf')
  @ApiOperation({ summary: 'The certificate of conformance issued by the release (the same bytes every time)' })
  async certificate(@Param('id', ParseIntPipe) id: number, @Res({ passthrough: true }) res: Response): Promise<StreamableFile> {
    const cert = await this.releases.certificate(id);
    // the SHA-256 stored at release lets a reader check a copy against the issued document
    res.setHeader('X-Content-SHA256', cert.sha256);
    return new StreamableFile(cert.pdf, { type: 'application/pdf', disposition: `attachment; filename="${cert.fileName}"`, length: cert.pdf.length });
  }
}
