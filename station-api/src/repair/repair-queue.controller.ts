import { BadRequestException, Controller, Get, Param, ParseIntPipe, Query, StreamableFile } from '@nestjs/common';
import {
  ApiBadRequestResponse,
  ApiBearerAuth,
  ApiConflictResponse,
  ApiNotFoundResponse,
  ApiOkResponse,
  ApiOperation,
  ApiProduces,
  ApiTags,
  ApiUnprocessableEntityResponse,
} from '@nestjs/swagger';
import { Roles } from '../common/decorators/roles.decorator';
import { RepairQueueDto, RepairQueueQueryDto } from './dto/repair-queue.dto';
import { RepairTagQueryDto } from './dto/repair-tag.dto';
import { RepairQueueService } from './repair-queue.service';
import { RepairTagService } from './repair-tag.service';

/** A path id that must be a positive whole number, refused with a sentence naming it. */
const runIdParam = new ParseIntPipe({
  exceptionFactory: () => new BadRequestException({ message: 'The run id in the address must be a whole number, e.g. 1.', details: { code: 'bad_id' } }),
});

/** What the repair bench reads: the repair queue and the printable repair tag of a failed run. */
@ApiBearerAuth()
@ApiTags('repair')
@Controller()
export class RepairQueueController {
  constructor(
    private readonly repairTags: RepairTagService,
    private readonly repairQueue: RepairQueueService,
  ) {}

  @Get('runs/:id/repair-tag.pdf')
  @Roles('operator', 'engineer', 'quality', 'admin')
  @ApiOperation({ summary: 'Printable repair tag (PDF, 100 mm × 70 mm) of a failed run: serial as Code 128, where it was tested, what failed' })
  @ApiProduces('application/pdf')
  @ApiOkResponse({ description: 'the PDF', schema: { type: 'string', format: 'binary' } })
  @ApiNotFoundResponse({ description: 'details.code run_not_found' })
  @ApiConflictResponse({ description: 'details.code run_passed, run_in_progress or run_not_judged' })
  @ApiUnprocessableEntityResponse({ description: 'details.code serial_not_printable' })
  @ApiBadRequestResponse({ description: 'details.code bad_id, or validation (dpi)' })
  async repairTag(@Param('id', runIdParam) id: number, @Query() query: RepairTagQueryDto): Promise<StreamableFile> {
    const tag = await this.repairTags.forRun(id, query.dpi ?? 203);
    return new StreamableFile(tag.pdf, {
      type: 'application/pdf',
      disposition: `inline; filename="${tag.fileName}"`,
      length: tag.pdf.length,
    });
  }

  @Get('repair-queue')
  @Roles('operator', 'engineer', 'quality', 'admin')
  @ApiOperation({
    summary: 'Units waiting for repair with their last failing run, oldest failure first: units with no attempts left, units sent to repair by the operator, and units in repair',
  })
  @ApiOkResponse({ type: RepairQueueDto })
  @ApiNotFoundResponse({ description: 'details.code unknown_lot or unknown_station' })
  repairQueueList(@Query() query: RepairQueueQueryDto): Promise<RepairQueueDto> {
    return this.repairQueue.list(query);
  }
}
