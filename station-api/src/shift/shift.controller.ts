import { BadRequestException, Controller, Get, Param, ParseIntPipe } from '@nestjs/common';
import { ApiBadRequestResponse, ApiBearerAuth, ApiNotFoundResponse, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Roles } from '../common/decorators/roles.decorator';
import { ROLES } from '../users/user.entity';
import { ShiftSummaryDto } from './dto/shift.dto';
import { ShiftSummaryService } from './shift-summary.service';

/** A path id that must be a positive whole number, refused with a sentence naming it. */
// eslint-disable-next-line no-useless-assignment -- read in the @Param decorator below, which the rule does not see
const stationIdParam = new ParseIntPipe({
  exceptionFactory: () => new BadRequestException({ message: 'The station id in the address must be a whole number, e.g. 1.', details: { code: 'bad_id' } }),
});

/** The station's counters for the shift running now. */
@ApiBearerAuth()
@Controller()
export class ShiftController {
  constructor(private readonly shifts: ShiftSummaryService) {}

  @Get('stations/:id/shift-summary')
  @Roles(...ROLES)
  @ApiTags('floor')
  @ApiOperation({ summary: "The station's counters for the shift running now (shift starts from SHIFT_STARTS, server local time)" })
  @ApiOkResponse({ type: ShiftSummaryDto })
  @ApiNotFoundResponse({ description: 'details.code unknown_station' })
  @ApiBadRequestResponse({ description: 'details.code bad_id' })
  shiftSummary(@Param('id', stationIdParam) id: number): Promise<ShiftSummaryDto> {
    return this.shifts.forStation(id);
  }
}
