import type { MikroORM } from '@mikro-orm/sqlite';
import { performance } from 'node:perf_hooks';

/**
 * Builds the floor benchmark's database: a year of one line's history (default 100,000 runs, 14 measurements
 * for each judged run). Template runs go through the real engine first (real rows, real raw JSON); the bulk
 * copies them with the product's own measurement INSERT (`insertMeasurementsSql`, many rows a statement) in
 * large transactions, with every column the engine writes. Not product code.
 */
export interface BuiltHistory {
  runs: number;
  measurements: number;
  units: number;
  lots: { id: number; code: string }[];
  stations: { id: number; code: string }[];
  buildMs: number;
}

type Row = Record<string, unknown>;
interface SqliteHandle {
  prepare(sql: string): { run(params: unknown[], cb: (err: Error | null) => void): void; finalize(): void };
}

/** Deterministic pseudo-random numbers (mulberry32; self-constructed use, not a statistical source). */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export async function buildHistory(orm: MikroORM, runTarget: number, log: (s: string) => void): Promise<BuiltHistory> {
  const t0 = performance.now();
  const { DemoPlantSeeder } = await import('../database/seeders/DemoPlantSeeder');
  const { PlanSeeder } = await import('../database/seeders/PlanSeeder');
  const { registerLot } = await import('../lots/lot-registration');
  const { Station } = await import('../stations/station.entity');
  const { User } = await import('../users/user.entity');
  const { createSimulatedEngine } = await import('../simulation/simulated-engine');
  const { insertMeasurementsSql } = await import('../runs/measurement-store');
  await orm.getMigrator().up();
  await orm.getSeeder().seed(DemoPlantSeeder, PlanSeeder);

  // 1. templates: 40 units through the real engine (the simulator's default defect rates give some fails)
  const em = orm.em.fork();
  const station = await em.findOneOrFail(Station, { code: 'EOL-1' }, { populate: ['fixture', 'activeLot.product'] });
  const product = station.activeLot!.product;
  const { lot, serials } = await registerLot(em, { code: 'LB-TEMPLATE', product, plannedQuantity: 40, at: new Date() });
  await em.flush();
  station.activeLot = lot;
  await em.flush();
  const operator = await em.findOneOrFail(User, { username: 'operator' });
  const { engine, links, close, simulation } = createSimulatedEngine(orm.em.fork());
  links.linkFor(station.fixture!);
  await simulation.reconfigure(station.fixture!.code, { defectRates: { weak_switch: 0.3 } });
  for (const serial of serials) {
    const started = await engine.start({ stationId: station.id, serial, requester: { id: operator.id, roles: operator.roles }, safetyConfirmed: true, audit: false });
    await started.done;
  }
  await close();
  const conn = orm.em.getConnection();
  const sql = <T = Row[]>(q: string, p: unknown[] = []) => conn.execute(q, p) as Promise<T>;
  const templateRuns = await sql<Row[]>(`select * from test_runs where lot_id = ? and verdict in ('pass', 'fail') order by id`, [lot.id]);
  const templateRows = new Map<number, Row[]>();
  for (const m of await sql<Row[]>('select * from measurements order by id')) {
    const k = Number(m.run_id);
    templateRows.set(k, [...(templateRows.get(k) ?? []), m]);
  }
  const passes = templateRuns.filter((r) => r.verdict === 'pass');
  const fails = templateRuns.filter((r) => r.verdict === 'fail');
  if (passes.length === 0 || fails.length === 0) throw new Error(`templates need a pass and a fail (got ${passes.length} / ${fails.length})`);
  log(`templates: ${passes.length} pass, ${fails.length} fail runs through the engine`);

  // 2. bulk: lots of 500 runs, round-robin over the demo stations; 8 % fail, most failed units retested
  const stations = (await sql<Row[]>('select s.id, s.code, s.fixture_id from stations s where s.fixture_id is not null order by s.code')).map((s) => ({
    id: Number(s.id),
    code: String(s.code),
    fixtureId: Number(s.fixture_id),
  }));
  const prefix = String(serials[0]).split('-')[0];
  const pv = templateRuns[0];
  const random = rng(11);
  const now = Date.now();
  const spanMs = 365 * 24 * 3600 * 1000;
  const runsPerLot = 500;
  const lotCount = Math.ceil(runTarget / runsPerLot);
  const lots: { id: number; code: string }[] = [];
  const measurementColumns = [
    'created_at', 'updated_at', 'run_id', 'step_index', 'step_key', 'step_name', 'quantity', 'name', 'value', 'unit', 'low_limit', 'high_limit',
    'guarded_low', 'guarded_high', 'uncertainty', 'rule', 'verdict', 'decision', 'raw', 'started_at', 'measured_at',
  ];
  const CHUNK = 1000;
  // the one pooled connection's sqlite3 handle (same driver, same settings as every other statement)
  const knex = (conn as unknown as { getKnex(): { client: { acquireConnection(): Promise<SqliteHandle>; releaseConnection(c: unknown): Promise<void> } } }).getKnex();
  const handle = await knex.client.acquireConnection();
  await knex.client.releaseConnection(handle);
  const bulk = handle.prepare(insertMeasurementsSql(CHUNK).replace(/ returning `id`$/, ""));
  let pending: unknown[] = [];
  let pendingRows = 0;
  let runs = 0;
  let measurements = 0;
  let units = 0;
  let runId = Number((await sql<Row[]>('select coalesce(max(id), 0) as id from test_runs'))[0].id);
  let unitId = Number((await sql<Row[]>('select coalesce(max(id), 0) as id from units'))[0].id);
  const runInsert =
    'insert into test_runs (id, created_at, updated_at, unit_id, lot_id, product_id, station_id, fixture_id, plan_version_id, operator_id, operator_name, attempt, verdict, ' +
    'started_at, finished_at, failed_step_key, fixture_identity, fixture_calibration_due_at, fixture_contact_cycles) values ';
  for (let l = 0; l < lotCount && runs < runTarget; l++) {
    await sql('begin');
    const st = stations[l % stations.length];
    const code = `LB-B${String(l).padStart(4, '0')}`;
    const lotStart = now - spanMs + (l * spanMs) / lotCount;
    await sql(`insert into lots (created_at, updated_at, code, product_id, planned_quantity, state) values (?, ?, ?, ?, ?, 'closed')`, [lotStart, lotStart, code, product.id, runsPerLot]);
    const lotId = Number((await sql<Row[]>('select last_insert_rowid() as id'))[0].id);
    lots.push({ id: lotId, code });
    const runRows: unknown[][] = [];
    const unitRows: unknown[][] = [];
    let seq = 0;
    const retests: number[] = [];
    const addRun = async (uid: number, attempt: number, at: number, fail: boolean) => {
      const tpl = fail ? fails[Math.floor(random() * fails.length)] : passes[Math.floor(random() * passes.length)];
      const durationMs = Number(tpl.finished_at) - Number(tpl.started_at);
      runId++;
      runs++;
      runRows.push([runId, at, at + durationMs, uid, lotId, product.id, st.id, st.fixtureId, pv.plan_version_id, pv.operator_id, pv.operator_name, attempt, tpl.verdict,
        at, at + durationMs, tpl.failed_step_key, tpl.fixture_identity, tpl.fixture_calibration_due_at, tpl.fixture_contact_cycles]);
      const offset = at - Number(tpl.started_at);
      for (const m of templateRows.get(Number(tpl.id)) ?? []) {
        const value = m.value === null ? null : Number(m.value) * (1 + (random() - 0.5) * 0.002);
        pending.push(...measurementColumns.map((c) =>
          c === 'run_id' ? runId : c === 'value' ? value : ['created_at', 'updated_at', 'started_at', 'measured_at'].includes(c) ? Number(m[c]) + offset : m[c]));
        pendingRows++;
        measurements++;
      }
      return tpl.verdict === 'pass';
    };
    const firstRuns = Math.floor(runsPerLot * 0.93);
    const lotUnits: { id: number; serial: string; passed: boolean; count: number; last: number }[] = [];
    for (let i = 0; i < firstRuns && runs < runTarget; i++) {
      const at = lotStart + (i * spanMs) / lotCount / runsPerLot;
      const u = { id: ++unitId, serial: `${prefix}-${String(2000 + l).padStart(4, '0')}-${String(++seq).padStart(5, '0')}`, passed: false, count: 1, last: at };
      u.passed = await addRun(u.id, 1, at, random() < 0.08);
      lotUnits.push(u);
      if (!u.passed && random() < 0.9) retests.push(lotUnits.length - 1);
    }
    for (const [k, idx] of retests.entries()) {
      if (runs >= runTarget) break;
      const u = lotUnits[idx];
      const at = lotStart + ((firstRuns + k) * spanMs) / lotCount / runsPerLot;
      u.passed = await addRun(u.id, 2, at, random() < 0.3);
      u.count = 2;
      u.last = at;
    }
    // a unit that failed more than 30 days ago has long left the queue (repaired and passed, or scrapped):
    // scrapped here, so the repair queue holds the last month's failures, as on a working floor
    const failedState = now - lotStart > 30 * 86400_000 ? 'scrapped' : 'failed';
    for (const u of lotUnits) unitRows.push([u.id, lotStart, u.last, u.serial, lotId, product.id, u.passed ? 'passed' : failedState, u.count, u.last]);
    units += lotUnits.length;
    for (let i = 0; i < unitRows.length; i += 400) {
      const part = unitRows.slice(i, i + 400);
      await sql(`insert into units (id, created_at, updated_at, serial, lot_id, product_id, state, test_count, last_tested_at) values ${part.map(() => '(?, ?, ?, ?, ?, ?, ?, ?, ?)').join(', ')}`, part.flat());
    }
    for (let i = 0; i < runRows.length; i += 400) {
      const part = runRows.slice(i, i + 400);
      await sql(runInsert + part.map(() => `(${Array.from({ length: 19 }, () => '?').join(', ')})`).join(', '), part.flat());
    }
    // foreign keys are checked at once: units, then runs, then their measurements
    // the product's INSERT, prepared once on the driver's own connection (the ORM's per-call SQL formatting
    // of 21,000 parameters was most of the build time)
    const width = measurementColumns.length;
    let at = 0;
    while (pendingRows - at >= CHUNK) {
      await new Promise<void>((ok, fail) => bulk.run(pending.slice(at * width, (at + CHUNK) * width), (err: Error | null) => (err ? fail(err) : ok())));
      at += CHUNK;
    }
    if (pendingRows > at) await conn.execute(insertMeasurementsSql(pendingRows - at), pending.slice(at * width), 'all');
    pending = [];
    pendingRows = 0;
    await sql('commit');
    if (l % 40 === 39) log(`  ${runs} runs, ${measurements} measurements (${((performance.now() - t0) / 1000).toFixed(0)} s)`);
  }
  bulk.finalize();
  await sql('PRAGMA wal_checkpoint(TRUNCATE)');
  return { runs, measurements, units, lots, stations: stations.map(({ id, code }) => ({ id, code })), buildMs: performance.now() - t0 };
}

/** What the builder reported, read back from a kept file (the build time is not known then). */
export async function describeHistory(path: string): Promise<BuiltHistory> {
  const { MikroORM } = await import('@mikro-orm/sqlite');
  const { createOrmConfig } = await import('../mikro-orm.config');
  const orm = await MikroORM.init(createOrmConfig(path));
  try {
    const sql = (q: string) => orm.em.getConnection().execute(q) as Promise<Record<string, unknown>[]>;
    await orm.getMigrator().up();
    const [{ runs }] = await sql('select count(*) as runs from test_runs');
    const [{ measurements }] = await sql('select count(*) as measurements from measurements');
    const [{ units }] = await sql('select count(*) as units from units');
    const lots = (await sql("select id, code from lots where code like 'LB-B%' order by id")).map((l) => ({ id: Number(l.id), code: String(l.code) }));
    const stations = (await sql('select id, code from stations where fixture_id is not null order by code')).map((s) => ({ id: Number(s.id), code: String(s.code) }));
    return { runs: Number(runs), measurements: Number(measurements), units: Number(units), lots, stations, buildMs: Number.NaN };
  } finally {
    await orm.close(true);
  }
}
