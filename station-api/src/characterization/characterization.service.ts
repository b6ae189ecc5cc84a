import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { PlanVersionsService } from '../plans/plan-versions.service';
import { PlansService } from '../plans/plans.service';
import { Product } from '../products/product.entity';
import { User } from '../users/user.entity';
import { analyseQuantity, type CharacterizationAnalysis } from './characterization-analysis';
import { readCharacterizationCsv, type CharacterizationColumn, type CsvProblem } from './characterization-csv';
import { CharacterizationDataSet } from './characterization-data-set.entity';
import type { AcceptLimitsDto, AnalysisQueryDto, UploadDataSetDto } from './dto/characterization.dto';

/** A data set as lists show it (no values). */
export interface DataSetSummary {
  id: number;
  name: string;
  fileName: string;
  product: { id: number; partNumber: string; name: string } | null;
  uploadedBy: { id: number; username: string; displayName: string };
  uploadedAt: string;
  rowCount: number;
  columns: CharacterizationColumn[];
}

export interface DataSetDetail extends DataSetSummary {
  serials: string[];
  values: Record<string, (number | null)[]>;
}

export interface AnalysisView extends CharacterizationAnalysis {
  dataSet: DataSetSummary;
  column: CharacterizationColumn;
}

export interface AcceptResult {
  planVersionId: number;
  planCode: string;
  version: number;
  stepKey: string;
  limitBefore: Record<string, unknown>;
  limitAfter: Record<string, unknown>;
  /** what the audit event recorded as statistics */
  statistics: Record<string, unknown>;
  auditEventId: number;
}

export interface UploadedFile {
  originalname: string;
  buffer: Buffer;
  size: number;
}

/** One line per problem: "line 4, column vout_V: "5,01" is not a number; …" */
function problemText(p: CsvProblem): string {
  const where = [p.line > 0 ? `line ${p.line}` : '', p.column ? `column ${p.column}` : ''].filter(Boolean).join(', ');
  return where ? `${where}: ${p.message}` : p.message;
}

/** 400 listing every problem of a refused file; nothing is stored. */
export function fileRefusal(fileName: string, problems: CsvProblem[]): BadRequestException {
  return new BadRequestException({
    message: `${fileName} was not stored: ${problems.map(problemText).join('; ')}`,
    details: { code: 'bad_file', problems },
  });
}

function toSummary(d: Omit<CharacterizationDataSet, 'values' | 'serials'>): DataSetSummary {
  return {
    id: d.id,
    name: d.name,
    fileName: d.fileName,
    product: d.product ? { id: d.product.id, partNumber: d.product.partNumber, name: d.product.name } : null,
    uploadedBy: { id: d.uploadedBy.id, username: d.uploadedBy.username, displayName: d.uploadedBy.displayName },
    uploadedAt: d.uploadedAt.toISOString(),
    rowCount: d.rowCount,
    columns: d.columns,
  };
}

/** The figures the audit trail keeps beside accepted limits. */
function auditStatistics(a: CharacterizationAnalysis): Record<string, unknown> {
  const est = (e: { value: number; lower: number; upper: number } | null | undefined) => (e ? { value: e.value, lower95: e.lower, upper95: e.upper } : null);
  const t = a.normality.primary;
  return {
    n: a.n,
    missing: a.missing,
    mean: a.mean,
    sd: a.sd,
    sigmaWithin: a.sigmaWithin,
    normality: t ? { test: t.test, statistic: t.statistic, pValue: t.pValue } : null,
    cp: est(a.capability?.cp),
    cpk: est(a.capability?.cpk),
    pp: est(a.capability?.pp),
    ppk: est(a.capability?.ppk),
    ppmOutside: a.ppmOutside,
    // the suggestion as the engineer set it on screen (k and U), so the record shows what the limits were compared with
    suggestion: a.suggestion
      ? { k: a.suggestion.k, uncertainty: a.suggestion.uncertainty, tolerance: a.suggestion.tolerance, acceptance: a.suggestion.acceptance }
      : null,
  };
}

/**
 * Characterization data: pilot-build measurements uploaded as CSV, the figures of one quantity against proposed
 * limits, and accepting those limits into a draft plan version (through PlanVersionsService, so a released
 * version refuses with 409 exactly as in the editor), with the data set and its statistics in the audit trail.
 */
@Injectable()
export class CharacterizationService {
  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
    private readonly plans: PlansService,
    private readonly versions: PlanVersionsService,
  ) {}

  /** Stores an uploaded file as a data set; a file with any problem is refused whole and stores nothing. */
  async upload(file: UploadedFile | undefined, dto: UploadDataSetDto, actor: AuthUser): Promise<DataSetSummary> {
    if (!file) {
      throw new BadRequestException({ message: 'No file: send the CSV as multipart form field "file".', details: { code: 'no_file', problems: [{ line: 0, column: null, message: 'no file was sent' }] } });
    }
    const fileName = file.originalname || 'the file';
    const read = readCharacterizationCsv(new Uint8Array(file.buffer.buffer, file.buffer.byteOffset, file.buffer.byteLength));
    if (!read.ok) throw fileRefusal(fileName, read.problems);
    let product: Product | null = null;
    if (dto.product) {
      product = await this.em.findOne(Product, { partNumber: dto.product });
      if (!product) {
        const known = (await this.em.find(Product, {}, { orderBy: { partNumber: 'asc' } })).map((p) => p.partNumber);
        throw new BadRequestException({ message: `There is no product ${dto.product}; use one of ${known.join(', ')} or leave product empty.`, details: [{ field: 'product', problems: [`unknown part number ${dto.product}`] }] });
      }
    }
    if (await this.em.count(CharacterizationDataSet, { name: dto.name })) {
      throw new ConflictException({ message: `A data set named "${dto.name}" already exists; give this one another name.`, details: { code: 'duplicate_name' } });
    }
    const { table } = read;
    const set = this.em.create(
      CharacterizationDataSet,
      {
        name: dto.name,
        fileName,
        product: product ?? undefined,
        uploadedBy: this.em.getReference(User, actor.id),
        uploadedAt: new Date(),
        rowCount: table.serials.length,
        columns: table.columns,
        serials: table.serials,
        values: table.values,
      },
      { partial: true },
    );
    await this.em.flush();
    await this.audit.record(
      {
        actor: actor.id,
        action: 'characterization.uploaded',
        entityType: 'characterization',
        entityId: set.id,
        after: { name: set.name, file: fileName, bytes: file.size, product: product?.partNumber ?? null, units: set.rowCount, columns: table.columns.map((c) => c.key) },
      },
      this.em,
    );
    await this.em.flush();
    await this.em.populate(set, ['product', 'uploadedBy']);
    return toSummary(set);
  }

  async list(): Promise<DataSetSummary[]> {
    const sets = await this.em.find(CharacterizationDataSet, {}, { populate: ['product', 'uploadedBy'], orderBy: { uploadedAt: 'desc', id: 'desc' }, exclude: ['values', 'serials'] });
    return sets.map(toSummary);
  }

  async get(id: number): Promise<DataSetDetail> {
    const d = await this.entity(id);
    return { ...toSummary(d), serials: d.serials, values: d.values };
  }

  /** Figures of one quantity, against proposed limits when given. */
  async analyse(id: number, q: AnalysisQueryDto): Promise<AnalysisView> {
    const d = await this.entity(id);
    const column = this.column(d, q.column);
    return { dataSet: toSummary(d), column, ...this.figures(d, column, q) };
  }

  /**
   * Puts proposed limits into one limit of a draft plan version, with the data set's name, size and statistics in
   * the audit trail (`characterization.limits_accepted`) beside the editor's own `plan_version.edited` event.
   */
  async accept(id: number, dto: AcceptLimitsDto, actor: AuthUser): Promise<AcceptResult> {
    const d = await this.entity(id);
    const column = this.column(d, dto.column);
    if (dto.low === undefined && dto.high === undefined) {
      throw new BadRequestException({ message: 'Give a low limit, a high limit or both.', details: [{ field: 'low', problems: ['no limit given'] }] });
    }
    const analysis = this.figures(d, column, { low: dto.low, high: dto.high, k: dto.k, uncertainty: dto.uncertainty });
    const target = await this.plans.versionEntity(dto.planVersionId);
    const limit = target.steps.find((s) => s.key === dto.stepKey)?.limits.find((l) => l.key === dto.limitKey);
    if (limit && limit.unit !== column.unit) {
      throw new BadRequestException({
        message: `Column ${column.key} is in ${column.unit} but limit ${dto.limitKey} is in ${limit.unit}; pick the limit of the same quantity, or convert the column to ${limit.unit}.`,
        details: [{ field: 'column', problems: [`unit ${column.unit} differs from the limit's unit ${limit.unit}`] }],
      });
    }
    const statistics = auditStatistics(analysis);
    return this.em.transactional(async (em) => {
      const { version, before, after } = await this.versions.setLimit(
        dto.planVersionId,
        { stepKey: dto.stepKey, limitKey: dto.limitKey, low: dto.low, high: dto.high, uncertainty: dto.uncertainty, rule: dto.rule },
        dto.reason,
        actor,
      );
      const event = await this.audit.record(
        {
          actor: actor.id,
          action: 'characterization.limits_accepted',
          entityType: 'characterization',
          entityId: d.id,
          reason: dto.reason,
          before: { plan: version.plan.code, version: version.version, step: dto.stepKey, limit: before },
          after: {
            dataSet: { id: d.id, name: d.name, file: d.fileName, units: d.rowCount, product: d.product?.partNumber ?? null },
            quantity: { column: column.key, unit: column.unit },
            n: analysis.n,
            statistics,
            plan: version.plan.code,
            planVersionId: version.id,
            version: version.version,
            step: dto.stepKey,
            limit: after,
          },
        },
        em,
      );
      await em.flush();
      return {
        planVersionId: version.id,
        planCode: version.plan.code,
        version: version.version,
        stepKey: dto.stepKey,
        limitBefore: { ...before },
        limitAfter: { ...after },
        statistics,
        auditEventId: event.id,
      };
    });
  }

  private figures(d: CharacterizationDataSet, column: CharacterizationColumn, q: Pick<AnalysisQueryDto, 'low' | 'high' | 'k' | 'uncertainty'>): CharacterizationAnalysis {
    try {
      return analyseQuantity(d.values[column.key] ?? [], { low: q.low, high: q.high, k: q.k, uncertainty: q.uncertainty });
    } catch (e) {
      if (e instanceof RangeError) throw new BadRequestException({ message: `Cannot compute the figures: ${e.message}.`, details: [{ field: 'high', problems: [e.message] }] });
      throw e;
    }
  }

  private column(d: CharacterizationDataSet, key: string): CharacterizationColumn {
    const c = d.columns.find((x) => x.key === key);
    if (!c) {
      throw new BadRequestException({
        message: `Data set "${d.name}" has no column "${key}"; its columns are ${d.columns.map((x) => x.key).join(', ')}.`,
        details: [{ field: 'column', problems: [`unknown column ${key}`] }],
      });
    }
    return c;
  }

  private async entity(id: number): Promise<CharacterizationDataSet> {
    const d = await this.em.findOne(CharacterizationDataSet, { id }, { populate: ['product', 'uploadedBy'] });
    if (!d) throw new NotFoundException({ message: `There is no characterization data set with id ${id}.`, details: { code: 'unknown_data_set' } });
    return d;
  }
}
