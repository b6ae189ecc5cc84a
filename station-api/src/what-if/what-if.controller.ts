import { Body, Controller, HttpCode, Param, ParseIntPipe, Post } from '@nestjs/common';
import { ApiBearerAuth, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { Roles } from '../common/decorators/roles.decorator';
import { WhatIfRequestDto, WhatIfResultDto } from './dto/what-if.dto';
import { WhatIfService } from './what-if.service';

@ApiTags('plans')
@ApiBearerAuth()
@Controller()
export class WhatIfController {
  constructor(private readonly whatIf: WhatIfService) {}

  @Post('plan-versions/:id/what-if')
  @HttpCode(200)
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: "Re-judge stored measurements against a draft's limits; writes nothing" })
  @ApiOkResponse({ type: WhatIfResultDto })
  run(@Param('id', ParseIntPipe) id: number, @Body() dto: WhatIfRequestDto): Promise<WhatIfResultDto> {
    return this.whatIf.forVersion(id, dto);
  }
}
