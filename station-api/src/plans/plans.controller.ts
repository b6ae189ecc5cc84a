import { Body, Controller, Get, HttpCode, Param, ParseIntPipe, Post } from '@nestjs/common';
import { ApiBearerAuth, ApiCreatedResponse, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { AuthUser, CurrentUser } from '../common/decorators/current-user.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { ROLES } from '../users/user.entity';
import {
  CreatePlanVersionDto,
  PlanDetailDto,
  PlanSummaryDto,
  PlanTextValidationDto,
  PlanVersionDto,
  ReleasePlanVersionDto,
  ValidatePlanTextDto,
} from './dto/plan.dto';
import { PlansService } from './plans.service';

@ApiTags('plans')
@ApiBearerAuth()
@Controller()
export class PlansController {
  constructor(private readonly plans: PlansService) {}

  @Get('plans')
  @Roles(...ROLES)
  @ApiOperation({ summary: 'All test plans with their released version' })
  @ApiOkResponse({ type: [PlanSummaryDto] })
  list(): Promise<PlanSummaryDto[]> {
    return this.plans.list();
  }

  @Post('plans/validate')
  @HttpCode(200)
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Check the YAML text of a plan file; lists every problem with its line' })
  @ApiOkResponse({ type: PlanTextValidationDto })
  validate(@Body() dto: ValidatePlanTextDto): Promise<PlanTextValidationDto> {
    return this.plans.validateText(dto.text);
  }

  @Get('plans/:id')
  @Roles(...ROLES)
  @ApiOperation({ summary: 'One test plan with all its versions' })
  @ApiOkResponse({ type: PlanDetailDto })
  get(@Param('id', ParseIntPipe) id: number): Promise<PlanDetailDto> {
    return this.plans.get(id);
  }

  @Post('plans/:id/versions')
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Create a draft version (checked like a plan file)' })
  @ApiCreatedResponse({ type: PlanVersionDto })
  createDraft(@Param('id', ParseIntPipe) id: number, @Body() dto: CreatePlanVersionDto, @CurrentUser() actor: AuthUser): Promise<PlanVersionDto> {
    return this.plans.createDraft(id, dto, actor);
  }

  @Get('plan-versions/:id')
  @Roles(...ROLES)
  @ApiOperation({ summary: 'One plan version with its steps' })
  @ApiOkResponse({ type: PlanVersionDto })
  getVersion(@Param('id', ParseIntPipe) id: number): Promise<PlanVersionDto> {
    return this.plans.getVersion(id);
  }

  @Post('plan-versions/:id/release')
  @HttpCode(200)
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Release a draft; the previously released version becomes superseded' })
  @ApiOkResponse({ type: PlanVersionDto })
  release(@Param('id', ParseIntPipe) id: number, @Body() dto: ReleasePlanVersionDto, @CurrentUser() actor: AuthUser): Promise<PlanVersionDto> {
    return this.plans.release(id, dto, actor);
  }
}
