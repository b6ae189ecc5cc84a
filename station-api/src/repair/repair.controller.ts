import { Body, Controller, HttpCode, Param, Post } from '@nestjs/common';
import { ApiBadRequestResponse, ApiBearerAuth, ApiConflictResponse, ApiNotFoundResponse, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { AuthUser, CurrentUser } from '../common/decorators/current-user.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { UnitDto } from '../units/dto/unit.dto';
import { RepairActionDto, RepairResultDto, SendToRepairDto } from './dto/repair.dto';
import { RepairService } from './repair.service';

@ApiTags('repair')
@ApiBearerAuth()
@Controller('units')
export class RepairController {
  constructor(private readonly repair: RepairService) {}

  @Post(':serial/repair')
  @HttpCode(200)
  // repair technicians hold the engineer role in this plant
  @Roles('engineer', 'quality', 'admin')
  @ApiOperation({
    summary: 'Move a unit through repair: receive (failed → in_repair), return for retest (in_repair → untested, fresh attempts), scrap (failed or in_repair → scrapped). Audited with the note.',
  })
  @ApiOkResponse({ type: RepairResultDto })
  @ApiBadRequestResponse({ description: 'validation: details lists the fields (action, note)' })
  @ApiNotFoundResponse({ description: 'details.code unknown_serial' })
  @ApiConflictResponse({ description: 'details.code bad_repair_transition (with state and allowed actions) or unit_under_test' })
  act(@Param('serial') serial: string, @Body() dto: RepairActionDto, @CurrentUser() user: AuthUser): Promise<RepairResultDto> {
    return this.repair.act(serial, dto, user.id);
  }

  @Post(':serial/send-to-repair')
  @HttpCode(200)
  @Roles('operator', 'engineer', 'admin')
  @ApiOperation({
    summary:
      'Send a failed unit to repair although it has attempts left (the retest policy keeps it off the repair queue otherwise). Audited with the note; sending it again changes nothing.',
  })
  @ApiOkResponse({ type: UnitDto })
  @ApiBadRequestResponse({ description: 'validation: details lists the fields (note)' })
  @ApiNotFoundResponse({ description: 'details.code unknown_serial' })
  @ApiConflictResponse({ description: 'details.code not_failed (with state) or unit_under_test' })
  sendToRepair(@Param('serial') serial: string, @Body() dto: SendToRepairDto, @CurrentUser() user: AuthUser): Promise<UnitDto> {
    return this.repair.sendToRepair(serial, dto, user.id);
  }
}
