import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, Injectable } from '@nestjs/common';
import { paretoTable } from '../stats';
import type { ParetoQueryDto, ParetoUnitsQueryDto } from './dto/yield-query.dto';
import { ALL_RUN_FILTERS, resolveFilter, runConditions } from './yield-filter';
import type { ParetoUnit, ParetoUnitsView, ParetoView } from '../contract/yield-views';

/** Most rows listed behind one bar; the total is always given, the CSV export has them all. */
export const PARETO_UNITS_LIMIT = 500;

/** Separates step and quantity in a quantity bar's key ("vout_nom/vout"). */
const KEY_SEPARATOR = '/';

/**
 * Failure Pareto over failing runs (verdict FAIL; errors and stops never judged the unit). By step: each failing
 * run counts once per step with a failing measurement. By quantity: each failing measurement counts once.
 * A guard-band failure (inside spec, outside the guarded limit) counts as a failure, as the station judged it.
 */
@Injectable()
export class FailureParetoService {
  constructor(private readonly em: EntityManager) {}

  async pareto(q: ParetoQueryDto): Promise<ParetoView> {
    const f = resolveFilter(q);
    const by = q.by ?? 'step';
    const where = runConditions(f, 'r', ALL_RUN_FILTERS);
    const conn = this.em.getConnection();
    const rows = (await conn.execute(
      by === 'step'
        ? `select m.step_key as key, max(m.step_name) as label, count(distinct m.run_id) as count
           from test_runs r join measurements m on m.run_id = r.id
           where r.verdict = 'fail' and m.verdict in ('fail', 'guard_fail')${where.sql}
           group by m.step_key`
        : `select m.step_key || '${KEY_SEPARATOR}' || m.quantity as key, max(m.step_name) || ' · ' || max(m.name) as label, count(*) as count
           from test_runs r join measurements m on m.run_id = r.id
           where r.verdict = 'fail' and m.verdict in ('fail', 'guard_fail')${where.sql}
           group by m.step_key, m.quantity`,
      where.params,
    )) as { key: string; label: string; count: number }[];
    const labels = new Map(rows.map((r) => [r.key, r.label]));
    const failed = (await conn.execute(`select count(*) as n from test_runs r where r.verdict = 'fail'${where.sql}`, where.params)) as { n: number }[];
    return {
      by,
      failedRuns: failed[0]?.n ?? 0,
      bars: paretoTable(rows.map((r) => ({ key: r.key, count: r.count }))).map((row) => ({ ...row, label: labels.get(row.key) ?? row.key })),
    };
  }

  /** The failing measurements behind one bar, newest first, with the serial and run to open. */
  async units(q: ParetoUnitsQueryDto): Promise<ParetoUnitsView> {
    const f = resolveFilter(q);
    const by = q.by ?? 'step';
    let step = q.key;
    let quantity: string | undefined;
    if (by === 'quantity') {
      const at = q.key.indexOf(KEY_SEPARATOR);
      if (at <= 0 || at === q.key.length - 1) {
        throw new BadRequestException({
          message: `key: "${q.key}" is not a quantity bar; write it stepKey${KEY_SEPARATOR}quantity, e.g. vout_nom${KEY_SEPARATOR}vout`,
          details: [{ field: 'key', problems: ['must be stepKey/quantity for by=quantity'] }],
        });
      }
      step = q.key.slice(0, at);
      quantity = q.key.slice(at + 1);
    }
    const where = runConditions(f, 'r', ALL_RUN_FILTERS);
    const own = quantity === undefined ? { sql: ' and m.step_key = ?', params: [step] } : { sql: ' and m.step_key = ? and m.quantity = ?', params: [step, quantity] };
    const from = `from test_runs r join measurements m on m.run_id = r.id join units u on u.id = r.unit_id
      where r.verdict = 'fail' and m.verdict in ('fail', 'guard_fail')${where.sql}${own.sql}`;
    const params = [...where.params, ...own.params];
    const conn = this.em.getConnection();
    const rows = (await conn.execute(
      `select u.serial, r.id as run_id, r.attempt, r.started_at, m.step_name, m.quantity, m.name, m.value, m.unit, m.low_limit, m.high_limit,
         m.guarded_low, m.guarded_high, m.verdict
       ${from} order by r.started_at desc, r.id desc, m.id limit ${PARETO_UNITS_LIMIT}`,
      params,
    )) as Record<string, unknown>[];
    const total = ((await conn.execute(`select count(*) as n ${from}`, params)) as { n: number }[])[0]?.n ?? 0;
    const units: ParetoUnit[] = rows.map((r) => ({
      serial: String(r.serial),
      runId: Number(r.run_id),
      attempt: Number(r.attempt),
      startedAt: new Date(Number(r.started_at)).toISOString(),
      stepName: String(r.step_name),
      quantity: String(r.quantity),
      quantityName: String(r.name),
      value: num(r.value),
      unit: String(r.unit),
      lowLimit: num(r.low_limit),
      highLimit: num(r.high_limit),
      guardedLow: num(r.guarded_low),
      guardedHigh: num(r.guarded_high),
      verdict: r.verdict as ParetoUnit['verdict'],
    }));
    const label = units[0] ? (quantity === undefined ? units[0].stepName : `${units[0].stepName} · ${units[0].quantityName}`) : q.key;
    return { key: q.key, label, units, total, limit: PARETO_UNITS_LIMIT };
  }
}

function num(v: unknown): number | null {
  return v === null || v === undefined ? null : Number(v);
}
