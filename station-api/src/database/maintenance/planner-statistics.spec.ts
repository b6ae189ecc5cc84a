import sqlite3 from 'sqlite3';
import { afterAll, describe, expect, it } from 'vitest';
import { refreshPlannerStatistics } from './planner-statistics';

// SQLite documentation, "ANALYZE" §1: ANALYZE writes one sqlite_stat1 row per index (tbl, idx, stat)
describe('refreshPlannerStatistics', () => {
  const db = new sqlite3.Database(':memory:');
  const run = (sql: string) => new Promise<unknown[]>((ok, fail) => db.all(sql, (err, rows) => (err ? fail(err) : ok(rows))));
  afterAll(() => db.close());

  it('writes statistics for every index, so the planner no longer guesses', async () => {
    await run('create table runs (id integer primary key, station_id integer, finished_at integer)');
    await run('create index runs_station_finished on runs (station_id, finished_at)');
    await run('insert into runs (station_id, finished_at) select value % 4, value from generate_series(1, 2000)').catch(async () => {
      // generate_series is an optional extension; a recursive CTE does the same
      await run('with recursive n(v) as (select 1 union all select v + 1 from n where v < 2000) insert into runs (station_id, finished_at) select v % 4, v from n');
    });
    const { ms } = await refreshPlannerStatistics({ execute: (sql) => run(sql) });
    expect(ms).toBeGreaterThanOrEqual(0);
    const stats = (await run("select idx, stat from sqlite_stat1 where tbl = 'runs'")) as { idx: string; stat: string }[];
    expect(stats).toEqual([{ idx: 'runs_station_finished', stat: expect.stringMatching(/^\d+ \d+ 1$/) }]);
    // with the analysis limit the counts are estimates (SQLite "ANALYZE" §2): 2000 rows, about 500 per station
    const [rows, perStation] = stats[0].stat.split(' ').map(Number);
    expect(rows).toBeGreaterThan(1000);
    expect(rows).toBeLessThanOrEqual(2000);
    expect(perStation).toBeGreaterThan(100);
    expect(perStation).toBeLessThan(1000);
  });
});
