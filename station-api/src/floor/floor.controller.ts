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
import { ROLES } from '../users/user.entity';
import { BoardService } from './board.service';
import { BoardEntryDto, RepairQueueDto, RepairQueueQueryDto, ShiftSummaryDto } from './dto/floor.dto';
import { RepairQueueService } from './repair-queue.service';
import { RepairTagService } from './repair-tag.service';
import { ShiftSummaryService } from './shift-summary.service';

/** A path id that must be a positive whole number, refused with a sentence naming it. */
const idParam = (what: string) =>
  new ParseIntPipe({
    exceptionFactory: () => new BadRequestException({ message: `The ${what} id in the address must be a whole number, e.g. 1.`, details: { code: 'bad_id' } }),
  });

/** What the shop floor looks at: shift counters, the line board, repair tags and the repair queue. */
@ApiBearerAuth()
@Controller()
export class FloorController {
  constructor(
    private readonly shifts: ShiftSummaryService,
    private readonly board: BoardService,
    private readonly repairTags: RepairTagService,
    private readonly repairQueue: RepairQueueService,
  ) {}

  @Get('stations/:id/shift-summary')
  @Roles(...ROLES)
  @ApiTags('floor')
  @ApiOperation({ summary: "The station's counters for the shift running now (shift starts from SHIFT_STARTS, server local time)" })
  @ApiOkResponse({ type: ShiftSummaryDto })
  @ApiNotFoundResponse({ description: 'details.code unknown_station' })
  @ApiBadRequestResponse({ description: 'details.code bad_id' })
  shiftSummary(@Param('id', idParam('station')) id: number): Promise<ShiftSummaryDto> {
    return this.shifts.forStation(id);
  }

  @Get('board')
  @Roles(...ROLES)
  @ApiTags('floor')
  @ApiOperation({ summary: 'Every active station with its state, current run, last 8 runs and shift counters; join the socket room "board" for updates' })
  @ApiOkResponse({ type: [BoardEntryDto] })
  snapshot(): Promise<BoardEntryDto[]> {
    return this.board.snapshot();
  }

  @Get('runs/:id/repair-tag.pdf')
  @Roles('operator', 'engineer', 'quality', 'admin')
  @ApiTags('repair')
  @ApiOperation({ summary: 'Printable repair tag (PDF, 100 mm × 70 mm) of a failed run: serial as Code 128, where it was tested, what failed' })
  @ApiProduces('application/pdf')
  @ApiOkResponse({ description: 'the PDF', schema: { type: 'string', format: 'binary' } })
  @ApiNotFoundResponse({ description: 'details.code run_not_found' })
  @ApiConflictResponse({ description: 'details.code run_passed, run_in_progress or run_not_judged' })
  @ApiUnprocessableEntityResponse({ description: 'details.code serial_not_printable' })
  async repairTag(@Param('id', idParam('run')) id: number): Promise<StreamableFile> {
    const tag = await this.repairTags.forRun(id);
    return new StreamableFile(tag.pdf, {
      type: 'application/pdf',
      disposition: `inline; filename="${tag.fileName}"`,
      length: tag.pdf.length,
    });
  }

  @Get('repair-queue')
  @Roles('operator', 'engineer', 'quality', 'admin')
  @ApiTags('repair')
  @ApiOperation({ summary: 'Units waiting for repair (failed or in repair) with their last failing run; oldest failure first' })
  @ApiOkResponse({ type: RepairQueueDto })
  @ApiNotFoundResponse({ description: 'details.code unknown_lot or unknown_station' })
  repairQueueList(@Query() query: RepairQueueQueryDto): Promise<RepairQueueDto> {
    return this.repairQueue.list(query);
  }
}
