import { EntityManager, FilterQuery } from '@mikro-orm/sqlite';
import { Injectable } from '@nestjs/common';
import type { RunDetailDto, RunListDto, RunsQueryDto } from './dto/runs.dto';
import { Measurement } from './measurement.entity';
import { RunRefusal } from './run-refusal';
import { toMeasurementView, toRunView } from './run-views';
import { TestRun } from './test-run.entity';

const RUN_POPULATE = ['unit', 'lot', 'product', 'station', 'fixture', 'planVersion.plan', 'operator', 'overrideBy'] as const;

/** Read side of runs: lists with filters and one run with every measurement. */
@Injectable()
export class RunsService {
  constructor(private readonly em: EntityManager) {}

  /** Newest first. `to` is exclusive so consecutive windows do not overlap. */
  async list(q: RunsQueryDto): Promise<RunListDto> {
    const where: FilterQuery<TestRun> = {};
    if (q.stationId) where.station = q.stationId;
    if (q.lotId) where.lot = q.lotId;
    if (q.serial) where.unit = { serial: q.serial };
    if (q.verdict) where.verdict = q.verdict as TestRun['verdict'];
    if (q.from || q.to) {
      where.startedAt = { ...(q.from ? { $gte: new Date(q.from) } : {}), ...(q.to ? { $lt: new Date(q.to) } : {}) };
    }
    const [rows, total] = await this.em.fork().findAndCount(TestRun, where, {
      populate: RUN_POPULATE,
      orderBy: { startedAt: 'desc', id: 'desc' },
      limit: q.limit ?? 50,
      offset: q.offset ?? 0,
    });
    return { items: rows.map(toRunView), total };
  }

  async get(id: number): Promise<RunDetailDto> {
    const em = this.em.fork();
    const run = await em.findOne(TestRun, { id }, { populate: RUN_POPULATE });
    if (!run) throw new RunRefusal('run_not_found', `There is no run with id ${id}.`);
    const measurements = await em.find(Measurement, { run: id }, { orderBy: { stepIndex: 'asc', id: 'asc' } });
    return {
      ...toRunView(run),
      measurements: measurements.map((m) => toMeasurementView(m, id)),
      steps: run.planVersion.steps.map((s) => ({ key: s.key, name: s.name, kind: s.kind, limits: s.limits })),
    };
  }
}
