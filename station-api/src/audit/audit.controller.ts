import { Controller, Get, Header, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiOkResponse, ApiOperation, ApiProduces, ApiTags } from '@nestjs/swagger';
import { CurrentUser, type AuthUser } from '../common/decorators/current-user.decorator';
import { Roles } from '../common/decorators/roles.decorator';
import { AuditService } from './audit.service';
import { AuditChoicesDto, AuditFilterDto, AuditPageDto, AuditQueryDto } from './dto/audit.dto';

/**
 * The audit trail, read-only: there is no route that writes, edits or deletes a record (the table itself refuses
 * UPDATE and DELETE, see Migration20261202156000). Sign-ins and board links are shown to administrators only.
 */
@ApiTags('audit')
@ApiBearerAuth()
@Controller('audit')
export class AuditController {
  constructor(private readonly audit: AuditService) {}

  @Get()
  @Roles('engineer', 'quality', 'admin')
  @ApiOperation({ summary: 'Audit trail, newest first: filtered by object, person, action, date range and text; each record in words with its link' })
  @ApiOkResponse({ type: AuditPageDto })
  list(@Query() query: AuditQueryDto, @CurrentUser() user: AuthUser): Promise<AuditPageDto> {
    return this.audit.list(query, user);
  }

  @Get('export')
  @Roles('engineer', 'quality', 'admin')
  @Header('Content-Type', 'text/csv; charset=utf-8')
  @Header('Content-Disposition', 'attachment; filename="audit-trail.csv"')
  @ApiProduces('text/csv')
  @ApiOperation({ summary: 'The same filtered records as a CSV file (RFC 4180; cells that look like formulas are quoted)' })
  exportCsv(@Query() query: AuditFilterDto, @CurrentUser() user: AuthUser): Promise<string> {
    return this.audit.exportCsv(query, user);
  }

  @Get('choices')
  @Roles('engineer', 'quality', 'admin')
  @ApiOperation({ summary: 'Object types and people that appear in the trail (for the filters)' })
  @ApiOkResponse({ type: AuditChoicesDto })
  choices(@CurrentUser() user: AuthUser): Promise<AuditChoicesDto> {
    return this.audit.choices(user);
  }
}
