import type { EntityManager } from '@mikro-orm/sqlite';
import type { SpecLimits } from '../stats/capability';
import type { JudgedVerdict } from './rule-evaluation';

/*
 * The lean queries behind hold-rule evaluation, one per rule kind, each bounded by the rule's window (LIMIT)
 * and served by the test_runs (lot, started_at) and (station, …) indexes. Times are epoch ms, as stored.
 * Every window looks at the lot's tests since its last lifted hold: after quality lifts a hold, the rules start
 * afresh instead of tripping again on the tests that caused it.
 */

/** What the evaluation needs to know about the finished run, with the number of active rules of its product. */
export interface RunContext {
  runId: number;
  verdict: string;
  lotId: number;
  lotCode: string;
  lotState: string;
  productId: number;
  stationId: number;
  stationCode: string;
  activeRules: number;
}

export async function runContext(em: EntityManager, runId: number): Promise<RunContext | null> {
  const rows = (await em.getConnection().execute(
    `select r.id, r.verdict, r.lot_id, l.code as lot_code, l.state as lot_state, r.product_id, r.station_id, s.code as station_code,
       (select count(*) from hold_rules hr where hr.product_id = r.product_id and hr.active = 1) as active_rules
     from test_runs r join lots l on l.id = r.lot_id join stations s on s.id = r.station_id where r.id = ?`,
    [runId],
  )) as Record<string, unknown>[];
  const r = rows[0];
  if (!r) return null;
  return {
    runId,
    verdict: String(r.verdict),
    lotId: Number(r.lot_id),
    lotCode: String(r.lot_code),
    lotState: String(r.lot_state),
    productId: Number(r.product_id),
    stationId: Number(r.station_id),
    stationCode: String(r.station_code),
    activeRules: Number(r.active_rules),
  };
}

/** When the lot's last hold was lifted (epoch ms), or 0. */
export async function liftedSinceMs(em: EntityManager, lotId: number): Promise<number> {
  const rows = (await em.getConnection().execute(`select max(lifted_at) as at from holds where lot_id = ? and lifted_at is not null`, [lotId])) as {
    at: number | string | null;
  }[];
  const at = rows[0]?.at;
  if (at === null || at === undefined) return 0;
  return typeof at === 'number' ? at : new Date(at).getTime();
}

/**
 * The verdict of each unit's first judged test (lowest attempt), for the lot's latest `limit` units whose
 * first test started at or after `sinceMs`; oldest first.
 */
export async function firstVerdicts(em: EntityManager, lotId: number, sinceMs: number, limit: number): Promise<JudgedVerdict[]> {
  const rows = (await em.getConnection().execute(
    `with ranked as (
       select r.id, r.verdict, r.started_at, row_number() over (partition by r.unit_id order by r.attempt asc, r.id asc) as rk
       from test_runs r where r.lot_id = ? and r.verdict in ('pass', 'fail')
     )
     select verdict from ranked where rk = 1 and started_at >= ? order by started_at desc, id desc limit ?`,
    [lotId, sinceMs, limit],
  )) as { verdict: JudgedVerdict }[];
  return rows.map((r) => r.verdict).reverse();
}

export interface QuantitySeries {
  /** oldest first */
  values: number[];
  /** specification limits of the newest test */
  limits: SpecLimits;
  name: string;
  unit: string;
}

/** The latest `limit` values of one quantity from the lot's judged tests since `sinceMs`. */
export async function quantitySeries(em: EntityManager, lotId: number, sinceMs: number, stepKey: string, quantity: string, limit: number): Promise<QuantitySeries> {
  const rows = (await em.getConnection().execute(
    `select m.value, m.low_limit, m.high_limit, m.name, m.unit
     from test_runs r join measurements m on m.run_id = r.id
     where r.lot_id = ? and r.verdict in ('pass', 'fail') and r.started_at >= ? and m.step_key = ? and m.quantity = ? and m.value is not null
     order by r.started_at desc, r.id desc limit ?`,
    [lotId, sinceMs, stepKey, quantity, limit],
  )) as { value: number; low_limit: number | null; high_limit: number | null; name: string; unit: string }[];
  const newest = rows[0];
  return {
    values: rows.map((r) => Number(r.value)).reverse(),
    limits: {
      ...(newest?.low_limit !== null && newest?.low_limit !== undefined ? { lsl: Number(newest.low_limit) } : {}),
      ...(newest?.high_limit !== null && newest?.high_limit !== undefined ? { usl: Number(newest.high_limit) } : {}),
    },
    name: newest?.name ?? `${stepKey} · ${quantity}`,
    unit: newest?.unit ?? '',
  };
}

/** Verdicts of the latest `limit` judged tests of the lot at one station since `sinceMs`; oldest first. */
export async function stationVerdicts(em: EntityManager, lotId: number, stationId: number, sinceMs: number, limit: number): Promise<JudgedVerdict[]> {
  const rows = (await em.getConnection().execute(
    `select verdict from test_runs where lot_id = ? and station_id = ? and verdict in ('pass', 'fail') and started_at >= ?
     order by started_at desc, id desc limit ?`,
    [lotId, stationId, sinceMs, limit],
  )) as { verdict: JudgedVerdict }[];
  return rows.map((r) => r.verdict).reverse();
}
