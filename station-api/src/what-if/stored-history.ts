import type { EntityManager } from '@mikro-orm/sqlite';

/**
 * Writes stored test history straight into the tables, many rows per statement, for the what-if tests and
 * benchmark (the run engine would take minutes for 100,000 measurements). Rows look like the engine's: one run
 * per entry, its measurements with the limits that were in force. Dates are stored as epoch milliseconds, as
 * MikroORM stores them on SQLite.
 */
export interface HistoryRun {
  serial: string;
  verdict: 'pass' | 'fail' | 'error' | 'aborted';
  startedAt: Date;
  measurements: { stepIndex: number; stepKey: string; quantity: string; unit: string; value: number | null; low?: number; high?: number; uncertainty: number; rule: string; verdict: 'pass' | 'fail' | 'guard_fail' }[];
}

export interface HistoryContext {
  productId: number;
  lotId: number;
  stationId: number;
  fixtureId: number;
  planVersionId: number;
  operatorId: number;
}

/** Largest rows per INSERT: SQLite allows 32,766 bound parameters; measurements bind 17 each. */
const ROWS_PER_INSERT = 1500;

async function insertRows(em: EntityManager, table: string, columns: string[], rows: unknown[][]): Promise<void> {
  const conn = em.getConnection();
  for (let i = 0; i < rows.length; i += ROWS_PER_INSERT) {
    const chunk = rows.slice(i, i + ROWS_PER_INSERT);
    const one = `(${columns.map(() => '?').join(', ')})`;
    await conn.execute(`insert into ${table} (${columns.join(', ')}) values ${chunk.map(() => one).join(', ')}`, chunk.flat(), 'run', em.getTransactionContext());
  }
}

/** Inserts units (when new), runs and measurements; returns the run ids in the order given. */
export async function insertHistory(em: EntityManager, ctx: HistoryContext, runs: HistoryRun[]): Promise<number[]> {
  const now = Date.now();
  return em.transactional(async (tx) => {
    const serials = [...new Set(runs.map((r) => r.serial))];
    const known = new Map<string, number>();
    for (let i = 0; i < serials.length; i += 900) {
      const part = serials.slice(i, i + 900);
      const rows = await tx.getConnection().execute<{ id: number; serial: string }[]>(`select id, serial from units where serial in (${part.map(() => '?').join(',')})`, part, 'all', tx.getTransactionContext());
      for (const r of rows) known.set(r.serial, r.id);
    }
    const fresh = serials.filter((s) => !known.has(s));
    await insertRows(tx, 'units', ['created_at', 'updated_at', 'serial', 'lot_id', 'product_id', 'state', 'test_count', 'test_count_at_return'], fresh.map((s) => [now, now, s, ctx.lotId, ctx.productId, 'untested', 0, 0]));
    for (let i = 0; i < fresh.length; i += 900) {
      const part = fresh.slice(i, i + 900);
      const rows = await tx.getConnection().execute<{ id: number; serial: string }[]>(`select id, serial from units where serial in (${part.map(() => '?').join(',')})`, part, 'all', tx.getTransactionContext());
      for (const r of rows) known.set(r.serial, r.id);
    }
    const first = await tx.getConnection().execute<{ next: number | null }[]>('select max(id) as next from test_runs', [], 'all', tx.getTransactionContext());
    let nextId = (first[0]?.next ?? 0) + 1;
    const attempts = new Map<string, number>();
    const runRows: unknown[][] = [];
    const measureRows: unknown[][] = [];
    const ids: number[] = [];
    for (const r of runs) {
      const id = nextId++;
      ids.push(id);
      const attempt = (attempts.get(r.serial) ?? 0) + 1;
      attempts.set(r.serial, attempt);
      const t = +r.startedAt;
      runRows.push([id, now, now, known.get(r.serial), ctx.lotId, ctx.productId, ctx.stationId, ctx.fixtureId, ctx.planVersionId, ctx.operatorId, attempt, r.verdict, t, t + 20_000]);
      r.measurements.forEach((m, k) => {
        measureRows.push([now, now, id, m.stepIndex, m.stepKey, m.stepKey, m.quantity, m.quantity, m.value, m.unit, m.low ?? null, m.high ?? null, m.uncertainty, m.rule, m.verdict, t + k, t + k + 1]);
      });
    }
    await insertRows(tx, 'test_runs', ['id', 'created_at', 'updated_at', 'unit_id', 'lot_id', 'product_id', 'station_id', 'fixture_id', 'plan_version_id', 'operator_id', 'attempt', 'verdict', 'started_at', 'finished_at'], runRows);
    await insertRows(
      tx,
      'measurements',
      ['created_at', 'updated_at', 'run_id', 'step_index', 'step_key', 'step_name', 'quantity', 'name', 'value', 'unit', 'low_limit', 'high_limit', 'uncertainty', 'rule', 'verdict', 'started_at', 'measured_at'],
      measureRows,
    );
    return ids;
  });
}

/** The ids a history needs, from the seeded demo plant: the product's station, fixture, lot and released plan. */
export async function demoHistoryContext(em: EntityManager, partNumber: string): Promise<HistoryContext> {
  const conn = em.getConnection();
  const [row] = await conn.execute<{ product_id: number; lot_id: number; station_id: number; fixture_id: number; plan_version_id: number; operator_id: number }[]>(
    `select p.id as product_id,
            (select l.id from lots l where l.product_id = p.id order by l.id limit 1) as lot_id,
            (select s.id from stations s where s.fixture_id is not null order by s.code limit 1) as station_id,
            (select s.fixture_id from stations s where s.fixture_id is not null order by s.code limit 1) as fixture_id,
            (select v.id from plan_versions v join test_plans t on t.id = v.plan_id where t.product_id = p.id and v.state = 'released' order by v.version desc limit 1) as plan_version_id,
            (select u.id from users u where u.username = 'operator') as operator_id
       from products p where p.part_number = ?`,
    [partNumber],
  );
  if (!row) throw new Error(`no product ${partNumber} in the demo plant`);
  return { productId: row.product_id, lotId: row.lot_id, stationId: row.station_id, fixtureId: row.fixture_id, planVersionId: row.plan_version_id, operatorId: row.operator_id };
}
