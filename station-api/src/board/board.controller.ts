import { Controller, Get } from '@nestjs/common';
import { ApiBearerAuth, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Roles } from '../common/decorators/roles.decorator';
import { ROLES } from '../users/user.entity';
import { BoardService } from './board.service';
import { BoardEntryDto } from './dto/board.dto';

/** The line board: every active station at a glance (live updates come over the socket room "board"). */
@ApiBearerAuth()
@Controller()
export class BoardController {
  constructor(private readonly board: BoardService) {}

  @Get('board')
  @Roles(...ROLES)
  @ApiTags('floor')
  @ApiOperation({
    summary: "Every active station with its state, current run, this shift's last 8 finished runs (with finish times) and shift counters; join the socket room \"board\" for updates",
  })
  @ApiOkResponse({ type: [BoardEntryDto] })
  snapshot(): Promise<BoardEntryDto[]> {
    return this.board.snapshot();
  }
}
