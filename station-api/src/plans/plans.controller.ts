import { Body, Controller, Delete, Get, HttpCode, Param, ParseIntPipe, Patch, Post, Put, Res, UploadedFile, UseInterceptors } from '@nestjs/common';
import { FileInterceptor } from '@nestjs/platform-express';
import type { Response } from 'express';
import { ApiBearerAuth, ApiBody, ApiConsumes, ApiCreatedResponse, ApiOkResponse, ApiOperation, ApiTags } from '@nestjs/swagger';
import { AuthUser, CurrentUser } from '../common/decorators/current-user.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { ROLES } from '../users/user.entity';
import {
  CreatePlanVersionDto,
  PlanDetailDto,
  PlanSummaryDto,
  PlanTextValidationDto,
  PlanVersionDto,
  ValidatePlanTextDto,
} from './dto/plan.dto';
import { ChangeReasonDto, PlanComparisonDto, PreviewStepsDto, UpdateDraftDto } from './dto/plan-lifecycle.dto';
import { MAX_PLAN_FILE_BYTES, PlanFilesService } from './plan-files.service';
import { previewSteps, type StepsPreview } from './plan-preview';
import { PlanVersionsService } from './plan-versions.service';
import { PlansService, planProduct } from './plans.service';
import { describeStepKinds, type StepKindDescription } from './step-kinds/describe';

@ApiTags('plans')
@ApiBearerAuth()
@Controller()
export class PlansController {
  constructor(
    private readonly plans: PlansService,
    private readonly versions: PlanVersionsService,
    private readonly files: PlanFilesService,
  ) {}

  @Get('plan-step-kinds')
  @Roles(...ROLES)
  @ApiOperation({ summary: 'The step-kind registry: parameters with units and bounds, quantities with units and physical ranges' })
  stepKinds(): StepKindDescription[] {
    return describeStepKinds();
  }

  @Post('plans/import')
  @HttpCode(201)
  @Roles('engineer', 'admin')
  @UseInterceptors(FileInterceptor('file', { limits: { fileSize: MAX_PLAN_FILE_BYTES, files: 1 } }))
  @ApiConsumes('multipart/form-data')
  @ApiBody({ schema: { type: 'object', properties: { file: { type: 'string', format: 'binary' } } } })
  @ApiOperation({ summary: 'Import a plan file (multipart field "file") as a new draft; a file with any problem changes nothing' })
  @ApiCreatedResponse({ type: PlanVersionDto })
  importFile(@UploadedFile() file: { originalname: string; buffer: Buffer; size: number } | undefined, @CurrentUser() actor: AuthUser): Promise<PlanVersionDto> {
    return this.files.importFile(file, actor);
  }

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

  @Post('plans/:id/preview')
  @HttpCode(200)
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Check draft steps for the plan\'s product: every problem on its field, and the guarded limits each stated uncertainty gives' })
  async preview(@Param('id', ParseIntPipe) id: number, @Body() dto: PreviewStepsDto): Promise<StepsPreview> {
    const plan = await this.plans.planEntity(id);
    return previewSteps(dto.steps, planProduct(plan.product));
  }

  @Patch('plan-versions/:id')
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Edit a draft (409 for any other version); an edit withdraws a submission' })
  @ApiOkResponse({ type: PlanVersionDto })
  update(@Param('id', ParseIntPipe) id: number, @Body() dto: UpdateDraftDto, @CurrentUser() actor: AuthUser): Promise<PlanVersionDto> {
    return this.versions.update(id, dto, actor);
  }

  @Put('plan-versions/:id')
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Same as PATCH: edit a draft (409 for any other version)' })
  @ApiOkResponse({ type: PlanVersionDto })
  replace(@Param('id', ParseIntPipe) id: number, @Body() dto: UpdateDraftDto, @CurrentUser() actor: AuthUser): Promise<PlanVersionDto> {
    return this.versions.update(id, dto, actor);
  }

  @Delete('plan-versions/:id')
  @HttpCode(204)
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Discard a draft (409 for any other version); body { reason }' })
  async discard(@Param('id', ParseIntPipe) id: number, @Body() dto: ChangeReasonDto, @CurrentUser() actor: AuthUser): Promise<void> {
    await this.versions.discard(id, dto, actor);
  }

  @Post('plan-versions/:id/submit')
  @HttpCode(200)
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Submit a draft for release with a change reason' })
  @ApiOkResponse({ type: PlanVersionDto })
  submit(@Param('id', ParseIntPipe) id: number, @Body() dto: ChangeReasonDto, @CurrentUser() actor: AuthUser): Promise<PlanVersionDto> {
    return this.versions.submit(id, dto, actor);
  }

  @Post('plan-versions/:id/release')
  @HttpCode(200)
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Release a submitted draft (a second engineer; 403 for the author); the released version becomes superseded' })
  @ApiOkResponse({ type: PlanVersionDto })
  release(@Param('id', ParseIntPipe) id: number, @Body() dto: ChangeReasonDto, @CurrentUser() actor: AuthUser): Promise<PlanVersionDto> {
    return this.versions.release(id, dto, actor);
  }

  @Post('plan-versions/:id/retire')
  @HttpCode(200)
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Retire a released or superseded version; it is kept with its history' })
  @ApiOkResponse({ type: PlanVersionDto })
  retire(@Param('id', ParseIntPipe) id: number, @Body() dto: ChangeReasonDto, @CurrentUser() actor: AuthUser): Promise<PlanVersionDto> {
    return this.versions.retire(id, dto, actor);
  }

  @Post('plan-versions/:id/drafts')
  @Roles('engineer', 'admin')
  @ApiOperation({ summary: 'Start a new draft from this version' })
  @ApiCreatedResponse({ type: PlanVersionDto })
  draftFrom(@Param('id', ParseIntPipe) id: number, @Body() dto: ChangeReasonDto, @CurrentUser() actor: AuthUser): Promise<PlanVersionDto> {
    return this.versions.draftFrom(id, dto, actor);
  }

  @Get('plan-versions/:from/compare/:to')
  @Roles(...ROLES)
  @ApiOperation({ summary: 'Steps added, removed, reordered and each changed parameter or limit, from one version to another' })
  @ApiOkResponse({ type: PlanComparisonDto })
  compare(@Param('from', ParseIntPipe) from: number, @Param('to', ParseIntPipe) to: number): Promise<PlanComparisonDto> {
    return this.versions.compare(from, to);
  }

  @Get('plan-versions/:id/export')
  @Roles(...ROLES)
  @ApiOperation({ summary: 'The version as a plan file (YAML, docs/test-plan-format.md)' })
  async exportFile(@Param('id', ParseIntPipe) id: number, @Res() res: Response): Promise<void> {
    const { fileName, text } = await this.files.exportFile(id);
    res.setHeader('Content-Type', 'application/yaml; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="${fileName}"`);
    res.send(text);
  }
}
