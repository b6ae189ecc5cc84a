import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, Injectable } from '@nestjs/common';
import { PlanVersionState } from '../plans/plan-version.entity';
import { PlansService } from '../plans/plans.service';
import type { WhatIfRequestDto, WhatIfResultDto } from './dto/what-if.dto';
import { rejudge, type StoredMeasurement, type UnitRun } from './rejudge';

/** Finds the stored runs and measurements in scope (reading only the columns judging needs) and re-judges them. */
@Injectable()
export class WhatIfService {
  constructor(
    private readonly em: EntityManager,
    private readonly plans: PlansService,
  ) {}

  async forVersion(versionId: number, dto: WhatIfRequestDto): Promise<WhatIfResultDto> {
    const t0 = performance.now();
    const v = await this.plans.versionEntity(versionId);
    if (v.state !== PlanVersionState.Draft) {
      throw new BadRequestException({ message: `Version ${v.version} of ${v.plan.code} is ${v.state}; a what-if is run on a draft before it is released.`, details: { code: 'not_draft' } });
    }
    const { runs, scopeText } = await this.unitRuns(v.plan.product.id, dto);
    const measurements = await this.measurementsOf(runs.map((r) => r.runId));
    const result = rejudge(v.steps, runs, measurements);
    return { planVersionId: v.id, scopeText, ...result, elapsedMs: Math.round(performance.now() - t0) };
  }

  /** One first judged run per unit of the product, in the scope asked for. */
  async unitRuns(productId: number, dto: WhatIfRequestDto): Promise<{ runs: UnitRun[]; scopeText: string; sql: string; params: unknown[] }> {
    const conn = this.em.getConnection();
    const where: string[] = [];
    const params: unknown[] = [productId];
    let extra = '';
    let scopeText: string;
    if (dto.scope === 'last_units') {
      const n = dto.units;
      if (!n) throw new BadRequestException({ message: 'scope last_units needs units: how many of the most recently tested units to re-judge', details: [{ field: 'units', problems: ['required for scope last_units'] }] });
      extra = ' order by r.started_at desc, r.id desc limit ?';
      scopeText = `last ${n} units tested`;
    } else if (dto.scope === 'lot') {
      if (!dto.lotId) throw new BadRequestException({ message: 'scope lot needs lotId', details: [{ field: 'lotId', problems: ['required for scope lot'] }] });
      where.push('r.lot_id = ?');
      params.push(dto.lotId);
      const lot = await conn.execute<{ code: string }[]>('select code from lots where id = ?', [dto.lotId]);
      if (lot.length === 0) throw new BadRequestException({ message: `There is no lot with id ${dto.lotId}.`, details: [{ field: 'lotId', problems: ['unknown lot'] }] });
      scopeText = `lot ${lot[0].code}`;
    } else {
      if (!dto.from || !dto.to) throw new BadRequestException({ message: 'scope dates needs from and to', details: [{ field: dto.from ? 'to' : 'from', problems: ['required for scope dates'] }] });
      const from = new Date(dto.from);
      const to = new Date(dto.to);
      // a bare date as "to" means the whole of that day
      if (/^\d{4}-\d{2}-\d{2}$/.test(dto.to)) to.setUTCHours(23, 59, 59, 999);
      if (to < from) throw new BadRequestException({ message: `to (${dto.to}) is before from (${dto.from})`, details: [{ field: 'to', problems: ['must not be before from'] }] });
      where.push('r.started_at >= ? and r.started_at <= ?');
      params.push(+from, +to);
      scopeText = `units first tested ${dto.from} … ${dto.to}`;
    }
    // a unit's first judged run stands for its first pass (ids grow with time)
    const sql =
      `select r.id as run_id, r.unit_id, u.serial, r.verdict, r.started_at from test_runs r join units u on u.id = r.unit_id ` +
      `where r.id in (select min(f.id) from test_runs f where f.product_id = ? and f.verdict in ('pass', 'fail') group by f.unit_id)` +
      (where.length ? ` and ${where.join(' and ')}` : '') +
      (extra || ' order by r.started_at desc, r.id desc');
    if (dto.scope === 'last_units') params.push(dto.units);
    const rows = await conn.execute<{ run_id: number; unit_id: number; serial: string; verdict: 'pass' | 'fail'; started_at: number | string }[]>(sql, params);
    return {
      scopeText,
      sql,
      params,
      runs: rows.map((r) => ({ runId: r.run_id, unitId: r.unit_id, serial: r.serial, verdict: r.verdict, startedAt: new Date(Number(r.started_at)).toISOString() })),
    };
  }

  /** The measurements of the given runs: only the columns re-judging reads, in chunks under SQLite's parameter limit. */
  async measurementsOf(runIds: number[]): Promise<StoredMeasurement[]> {
    const conn = this.em.getConnection();
    const out: StoredMeasurement[] = [];
    const CHUNK = 900;
    for (let i = 0; i < runIds.length; i += CHUNK) {
      const ids = runIds.slice(i, i + CHUNK);
      // the rows come back already named as StoredMeasurement: no second object per row (what-if p95, issue 11)
      const rows = await conn.execute<StoredMeasurement[]>(
        `select run_id as runId, step_key as stepKey, quantity, value, verdict, uncertainty from measurements where run_id in (${ids.map(() => '?').join(',')})`,
        ids,
      );
      for (const r of rows) out.push(r);
    }
    return out;
  }
}
