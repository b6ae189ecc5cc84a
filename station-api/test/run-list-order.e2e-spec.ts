import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { refreshPlannerStatistics } from '../src/database/maintenance/planner-statistics';
import { groupSql, pageRunIds, runGroups, SMALL_LIST, type SqlExec } from '../src/runs/run-list-order';
import { RUN_SORT_KEYS, RUN_VERDICTS_SORTED, runFilterSql, type RunFilter } from '../src/runs/run-queries';
import { RunsService } from '../src/runs/runs.service';
import { RUN_VERDICTS, type RunsQueryDto } from '../src/runs/dto/runs.dto';
import { createTestApp, TestApp } from './create-test-app';

/** Deterministic pseudo-random numbers (mulberry32, common practice, no source). */
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

/**
 * The runs list reads each page from an index (issue 11): for every sort the list offers, both ways, with
 * offsets and filters, the walk gives exactly the page the full ORDER BY gives (runOrderSql, the reference), and
 * the plan of every statement of an unfiltered walk sorts nothing over the whole table ("USE TEMP B-TREE FOR
 * ORDER BY" in EXPLAIN QUERY PLAN; a "RIGHT PART" sort orders the ties of one key only), with and without
 * planner statistics. Before the walk, the unfiltered list sorted all runs: 490 ms p50 at 100,000 runs.
 */
describe('runs list: every sort read from an index', () => {
  let t: TestApp;
  let exec: SqlExec;
  let planSteps: { key: string; name: string }[];

  beforeAll(async () => {
    t = await createTestApp();
    const conn = t.orm.em.getConnection();
    exec = (q, p) => conn.execute<Record<string, unknown>[]>(q, p);
    const stations = await exec('select s.id, s.fixture_id from stations s where s.fixture_id is not null order by s.code', []);
    const [lot] = await exec('select l.id, l.product_id from lots l order by l.id limit 1', []);
    const [pv] = await exec('select id, steps from plan_versions order by id limit 1', []);
    // the plan's own step keys and one it does not know (a run of an edited plan keeps its key, without a name)
    planSteps = (typeof pv.steps === 'string' ? JSON.parse(pv.steps) : pv.steps) as { key: string; name: string }[];
    const stepKeys = [...planSteps.slice(0, 3).map((st) => st.key), 'retired-step'];
    const users = await exec('select id, display_name from users order by id', []);
    const random = rng(20261203);
    const now = Date.now();
    // self-constructed history: 1,200 units in 6 lots (two lot codes differ only in case, as do two operator
    // names), 1-3 runs each, every verdict, failed steps, equal start times, one run still going
    const lots: number[] = [];
    for (const code of ['LO-B', 'lo-b', 'LO-A', 'LO-C', 'LO-a2', 'LO-Z']) {
      await exec("insert into lots (created_at, updated_at, code, product_id, planned_quantity, state) values (?, ?, ?, ?, 500, 'closed')", [now, now, code, lot.product_id]);
      lots.push(Number((await exec('select last_insert_rowid() as id', []))[0].id));
    }
    const names = ['Ana Field', 'ana field', 'Bo Lind', 'Cy Moss'];
    await exec('begin', []);
    let at = now - 30 * 86_400_000;
    for (let u = 0; u < 1200; u++) {
      const lotId = lots[u % lots.length];
      await exec("insert into units (created_at, updated_at, serial, lot_id, product_id, state, test_count) values (?, ?, ?, ?, ?, 'passed', 1)", [
        now,
        now,
        `${u % 5 === 0 ? 'ob' : 'OB'}-${String((u * 7919) % 10007).padStart(5, '0')}`,
        lotId,
        lot.product_id,
      ]);
      const [{ id: unitId }] = await exec('select last_insert_rowid() as id', []);
      const runs = 1 + Math.floor(random() * 3);
      for (let k = 0; k < runs; k++) {
        const s = stations[Math.floor(random() * stations.length)];
        const pick = random();
        const verdict = pick < 0.6 ? 'pass' : pick < 0.85 ? 'fail' : pick < 0.93 ? 'error' : 'aborted';
        const failed = verdict === 'fail' ? stepKeys[Math.floor(random() * stepKeys.length)] : null;
        const durationMs = 2000 + Math.floor(random() * 6) * 500; // few distinct durations: many ties
        if (random() > 0.1) at += Math.floor(random() * 60_000); // about one run in ten shares its start time
        await exec(
          'insert into test_runs (created_at, updated_at, unit_id, lot_id, product_id, station_id, fixture_id, plan_version_id, operator_id, operator_name, attempt, verdict, started_at, finished_at, failed_step_key) ' +
            'values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
          [at, at, unitId, lotId, lot.product_id, s.id, s.fixture_id, pv.id, users[k % users.length].id, names[Math.floor(random() * names.length)], k + 1, verdict, at, at + durationMs, failed],
        );
      }
    }
    await exec(
      "insert into test_runs (created_at, updated_at, unit_id, lot_id, product_id, station_id, fixture_id, plan_version_id, operator_id, operator_name, attempt, verdict, started_at) select ?, ?, u.id, u.lot_id, u.product_id, ?, ?, ?, ?, 'Cy Moss', 4, 'running', ? from units u order by u.id desc limit 1",
      [now, now, stations[0].id, stations[0].fixture_id, pv.id, users[0].id, now - 1000],
    );
    await exec('commit', []);
  }, 120_000);

  afterAll(async () => {
    await t?.close();
  });

  it('lists the verdicts in the order SQLite sorts them', () => {
    expect([...RUN_VERDICTS_SORTED]).toEqual([...RUN_VERDICTS].sort());
  });

  it('gives the page of the full ORDER BY for every sort, both ways, with offsets and filters', async () => {
    const [{ id: stationId }] = await exec('select station_id as id from test_runs group by station_id order by count(*) desc limit 1', []);
    const filters: RunFilter[] = [{}, { verdict: 'fail' }, { stationId: Number(stationId) }, { from: new Date(Date.now() - 20 * 86_400_000).toISOString() }];
    let compared = 0;
    for (const f of filters) {
      const { where, params } = runFilterSql(f);
      const [{ n }] = await exec(`select count(*) as n from test_runs r${where}`, params);
      for (const sort of RUN_SORT_KEYS) {
        for (const dir of ['asc', 'desc'] as const) {
          for (const offset of [0, 37, 450, 1200]) {
            const q = { ...f, sort, dir, limit: 50, offset };
            const walked = await pageRunIds(exec, q, Number(n), 0);
            const reference = await pageRunIds(exec, q, Number(n), Number.MAX_SAFE_INTEGER);
            expect(walked, `${JSON.stringify(f)} ${sort} ${dir} offset ${offset}`).toEqual(reference);
            compared += reference.length;
          }
        }
      }
    }
    expect(compared).toBeGreaterThan(10_000);
  });

  it('reads every unfiltered sort from an index, with and without planner statistics', async () => {
    const fullSorts = async () => {
      const found: string[] = [];
      for (const sort of RUN_SORT_KEYS) {
        for (const dir of ['asc', 'desc'] as const) {
          const groups = await runGroups(exec, sort, dir);
          expect(groups, `${sort} has an index walk`).toBeDefined();
          for (const g of groups!) {
            const s = groupSql(g, runFilterSql({}));
            const plan = (await exec(`explain query plan ${s.sql}`, [...s.params, 50, 0])).map((r) => String(r.detail));
            // codes that differ only in case (LO-B, lo-b) form one group, sorted on its own: found by an index
            // seek, it never sorts the whole table
            const merged = g.where?.includes(' in (') ?? false;
            const sorts = plan.some((d) => d.includes('USE TEMP B-TREE FOR ORDER BY'));
            const bad = merged ? sorts && !plan.some((d) => d.startsWith('SEARCH r USING')) : sorts;
            if (bad) found.push(`${sort} ${dir}: ${plan.join(' / ')}`);
          }
        }
      }
      return found;
    };
    await exec('delete from sqlite_stat1', []).catch(() => undefined);
    // a schema change makes the connection reload its (now empty) statistics
    await exec('create table plan_check_reload (x integer)', []);
    await exec('drop table plan_check_reload', []);
    expect(await fullSorts()).toEqual([]);
    await refreshPlannerStatistics(t.orm.em.getConnection());
    expect(await fullSorts()).toEqual([]);
  });

  it('sends the list route no statement that sorts the whole table, for any sort (regression: 490 ms at 100,000 runs)', async () => {
    const conn = t.orm.em.getConnection();
    const [{ n }] = await exec('select count(*) as n from test_runs', []);
    expect(Number(n)).toBeGreaterThan(SMALL_LIST); // the history is large enough for the walk
    const sent: [string, unknown[]][] = [];
    const original = conn.execute.bind(conn) as (...a: unknown[]) => unknown;
    const spy = vi.spyOn(conn, 'execute').mockImplementation(((...args: unknown[]) => {
      sent.push([String(args[0]), (args[1] as unknown[] | undefined) ?? []]);
      return original(...args);
    }) as never);
    const found: string[] = [];
    try {
      for (const sort of RUN_SORT_KEYS) {
        for (const dir of ['asc', 'desc'] as const) await t.app.get(RunsService).list({ sort, dir });
      }
    } finally {
      spy.mockRestore();
    }
    for (const [sql, params] of sent.filter(([q]) => / order by /.test(q) && / limit \?/.test(q))) {
      const plan = (await exec(`explain query plan ${sql}`, params)).map((r) => String(r.detail));
      const merged = / in \(\?, \?/.test(sql);
      // runs found by the ids of one page (a LIMITed sub-select): one sort, of that page only; a second one is the
      // sub-select sorting every run (regression: a repeated ORDER BY term did that, 11 ms against 1 ms)
      const page =
        plan.some((d) => d.startsWith('SEARCH r USING INTEGER PRIMARY KEY')) &&
        / in \(select r\.id from test_runs r/.test(sql) &&
        plan.filter((d) => d.includes('USE TEMP B-TREE FOR ORDER BY')).length === 1;
      if (plan.some((d) => d.includes('USE TEMP B-TREE FOR ORDER BY')) && !page && !(merged && plan.some((d) => d.startsWith('SEARCH r USING')))) found.push(`${sql} -> ${plan.join(' / ')}`);
    }
    expect(sent.length).toBeGreaterThan(RUN_SORT_KEYS.length * 2);
    expect(found).toEqual([]);
  });

  it('reads newest first in one statement that gives the same page as the walk, under every filter', async () => {
    const [{ id: stationId }] = await exec('select station_id as id from test_runs group by station_id order by count(*) desc limit 1', []);
    const [{ id: lotId }] = await exec('select id from lots order by id desc limit 1', []);
    const filters: RunFilter[] = [{}, { verdict: 'fail' }, { stationId: Number(stationId) }, { lotId: Number(lotId) }, { serial: 'ob-0' }, { from: new Date(Date.now() - 20 * 86_400_000).toISOString() }];
    for (const f of filters) {
      const { where, params } = runFilterSql(f);
      const [{ n }] = await exec(`select count(*) as n from test_runs r${where}`, params);
      for (const offset of [0, 37, 450]) {
        const listed = await t.app.get(RunsService).list({ ...f, limit: 50, offset } as RunsQueryDto);
        const reference = await pageRunIds(exec, { ...f, sort: 'startedAt', dir: 'desc', limit: 50, offset }, Number(n), Number.MAX_SAFE_INTEGER);
        expect(listed.items.map((r) => r.id), `${JSON.stringify(f)} offset ${offset}`).toEqual(reference);
        expect(listed.total).toBe(Number(n));
      }
    }
  });

  it('answers the list route with the runs of the page in order, each with its failed step', async () => {
    const list = await t.app.get(RunsService).list({ sort: 'verdict', dir: 'asc', limit: 500, offset: 0 });
    expect(list.items).toHaveLength(500);
    expect(list.items.map((r) => r.verdict)).toEqual([...list.items.map((r) => r.verdict)].sort());
    const failed = list.items.filter((r) => r.verdict === 'fail');
    expect(failed.length).toBeGreaterThan(0);
    for (const r of failed) expect(r.failedStepName).toBe(planSteps.find((st) => st.key === r.failedStepKey)?.name ?? null);
    expect(failed.some((r) => r.failedStepName === null)).toBe(true);
    expect(failed.some((r) => r.failedStepName !== null)).toBe(true);
  });
});
