import { Body, Controller, Get, HttpCode, Param, ParseIntPipe, Patch, Post, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiCreatedResponse, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { AuthUser, CurrentUser } from '../common/decorators/current-user.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { HoldAlertDto, HoldDto, HoldQueryDto, LiftHoldDto, OutboxMessageDto } from './dto/hold.dto';
import { CreateHoldRuleDto, HoldRuleDto, HoldRuleQueryDto, QuantityChoiceDto, QuantityChoicesQueryDto, UpdateHoldRuleDto } from './dto/hold-rule.dto';
import { HoldRulesService } from './hold-rules.service';
import { HoldsService } from './holds.service';

/** Who sets hold rules and reads holds, alerts and the outbox; lifting a hold is for quality (and admin) only. */
const WATCHERS = ['engineer', 'quality', 'admin'] as const;

@ApiTags('holds')
@ApiBearerAuth()
@Controller()
export class HoldsController {
  constructor(
    private readonly rules: HoldRulesService,
    private readonly holds: HoldsService,
  ) {}

  @Get('hold-rules')
  @Roles(...WATCHERS)
  @ApiOperation({ summary: 'Hold rules, optionally of one product; active ones first' })
  @ApiOkResponse({ type: [HoldRuleDto] })
  listRules(@Query() q: HoldRuleQueryDto): Promise<HoldRuleDto[]> {
    return this.rules.list(q);
  }

  @Get('hold-rules/quantities')
  @Roles(...WATCHERS)
  @ApiOperation({ summary: "Quantities of the product's released plan that a Cpk or control-chart rule can watch" })
  @ApiOkResponse({ type: [QuantityChoiceDto] })
  quantities(@Query() q: QuantityChoicesQueryDto): Promise<QuantityChoiceDto[]> {
    return this.rules.quantities(q.productId);
  }

  @Post('hold-rules')
  @Roles(...WATCHERS)
  @ApiOperation({ summary: 'Add a hold rule to a product (audited)' })
  @ApiCreatedResponse({ type: HoldRuleDto })
  createRule(@Body() dto: CreateHoldRuleDto, @CurrentUser() actor: AuthUser): Promise<HoldRuleDto> {
    return this.rules.create(dto, actor);
  }

  @Patch('hold-rules/:id')
  @Roles(...WATCHERS)
  @ApiOperation({ summary: 'Switch a hold rule off or on again (audited)' })
  @ApiOkResponse({ type: HoldRuleDto })
  updateRule(@Param('id', ParseIntPipe) id: number, @Body() dto: UpdateHoldRuleDto, @CurrentUser() actor: AuthUser): Promise<HoldRuleDto> {
    return this.rules.update(id, dto, actor);
  }

  @Get('holds')
  @Roles(...WATCHERS)
  @ApiOperation({ summary: 'Holds, newest first: the lot, the rule, the figures and the run that tripped it' })
  @ApiOkResponse({ type: [HoldDto] })
  listHolds(@Query() q: HoldQueryDto): Promise<HoldDto[]> {
    return this.holds.list(q);
  }

  @Post('holds/:id/lift')
  @HttpCode(200)
  @Roles('quality', 'admin')
  @ApiOperation({ summary: 'Lift a hold with a reason: the lot is open for testing again (audited)' })
  @ApiOkResponse({ type: HoldDto })
  lift(@Param('id', ParseIntPipe) id: number, @Body() dto: LiftHoldDto, @CurrentUser() actor: AuthUser): Promise<HoldDto> {
    return this.holds.lift(id, dto, actor);
  }

  @Get('hold-alerts')
  @Roles(...WATCHERS)
  @ApiOperation({ summary: 'Alerts, newest first: rules that tripped and evaluations that failed' })
  @ApiOkResponse({ type: [HoldAlertDto] })
  alerts(): Promise<HoldAlertDto[]> {
    return this.holds.alerts();
  }

  @Get('outbox')
  @Roles(...WATCHERS)
  @ApiOperation({ summary: 'E-mails sent or being sent, newest first, with their delivery status' })
  @ApiOkResponse({ type: [OutboxMessageDto] })
  outbox(): Promise<OutboxMessageDto[]> {
    return this.holds.outbox();
  }
}
