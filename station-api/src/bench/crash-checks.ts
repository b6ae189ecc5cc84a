import sqlite3 from 'sqlite3';

/*
 * What the crash harness checks after every restart, read straight from the server's SQLite file: no run
 * left running, every cut-off run closed with its reason, announced measurements unchanged, attempts counted,
 * and no unit passed without a complete passing run.
 */

/** The figures these checks add to (the harness's report). */
export interface CheckTally {
  runsInterrupted: number;
  measurementsChecked: number;
}

export interface Seen {
  runId: number;
  stationId: number;
  finished: boolean;
}

export interface MeasurementSnapshot {
  id: number;
  runId: number;
  quantity: string;
  value: number | null;
  verdict: string;
  lowLimit: number | null;
  highLimit: number | null;
}


/** A read-only query on the server's SQLite file (WAL: readers never block the server). */
export function query<T>(dbPath: string, sql: string, params: unknown[] = []): Promise<T[]> {
  return new Promise((done, fail) => {
    const db = new sqlite3.Database(dbPath, sqlite3.OPEN_READONLY, (err) => {
      if (err) return fail(err);
      db.all(sql, params, (e, rows) => {
        db.close();
        return e ? fail(e) : done(rows as T[]);
      });
    });
  });
}


/** Checks every promise after a restart; each broken one goes to `problem`. */
export async function checkAfterRestart(
  dbPath: string,
  seen: Map<number, Seen>,
  announced: Map<number, MeasurementSnapshot>,
  report: CheckTally,
  problem: (t: string) => void,
): Promise<void> {
  const running = await query<{ id: number }>(dbPath, "select id from test_runs where verdict = 'running'");
  if (running.length > 0) problem(`runs left running after restart: ${running.map((r) => r.id).join(', ')}`);

  // every run cut off by the kill: closed with its reason
  const cut = [...seen.values()].filter((r) => !r.finished);
  for (const r of cut) {
    const [row] = await query<{ verdict: string; end_reason: string | null; error_message: string | null }>(
      dbPath,
      'select verdict, end_reason, error_message from test_runs where id = ?',
      [r.runId],
    );
    if (!row) {
      problem(`run ${r.runId} answered 201 but is not stored`);
      continue;
    }
    if (row.verdict === 'pass' || row.verdict === 'fail') {
      // it finished in the instant before the kill; its event was lost with the socket, not the result
      r.finished = true;
      continue;
    }
    if (row.verdict !== 'error' || row.end_reason !== 'interrupted' || !row.error_message) {
      problem(`run ${r.runId} after the kill: verdict ${row.verdict}, end reason ${row.end_reason}, message ${row.error_message}`);
    } else report.runsInterrupted++;
    r.finished = true;
  }

  // every measurement announced before the kill is stored and unchanged
  const ids = [...announced.keys()];
  for (let i = 0; i < ids.length; i += 500) {
    const chunk = ids.slice(i, i + 500);
    const rows = await query<{ id: number; run_id: number; quantity: string; value: number | null; verdict: string; low_limit: number | null; high_limit: number | null }>(
      dbPath,
      `select id, run_id, quantity, value, verdict, low_limit, high_limit from measurements where id in (${chunk.map(() => '?').join(',')})`,
      chunk,
    );
    const byId = new Map(rows.map((r) => [r.id, r]));
    for (const id of chunk) {
      const a = announced.get(id)!;
      const s = byId.get(id);
      if (!s) problem(`measurement ${id} (run ${a.runId}, ${a.quantity}) was announced but is not stored`);
      else if (s.run_id !== a.runId || s.quantity !== a.quantity || s.value !== a.value || s.verdict !== a.verdict || s.low_limit !== a.lowLimit || s.high_limit !== a.highLimit) {
        problem(`measurement ${id} changed after the kill: announced ${JSON.stringify(a)}, stored ${JSON.stringify(s)}`);
      }
    }
  }
  report.measurementsChecked = announced.size;

  // attempts: every judged or interrupted run counts; no unit passed from an incomplete run
  const counts = await query<{ serial: string; test_count: number; counted: number }>(
    dbPath,
    `select u.serial, u.test_count, (select count(*) from test_runs r where r.unit_id = u.id and (r.verdict in ('pass','fail') or r.end_reason = 'interrupted')) as counted
       from units u where u.test_count > 0 or exists (select 1 from test_runs r where r.unit_id = u.id)`,
  );
  for (const c of counts) if (c.test_count !== c.counted) problem(`unit ${c.serial}: test count ${c.test_count}, but ${c.counted} runs count as attempts`);
  const passedWrongly = await query<{ serial: string }>(
    dbPath,
    `select u.serial from units u where u.state = 'passed' and not exists (
       select 1 from test_runs r where r.unit_id = u.id and r.verdict = 'pass'
         and (select count(*) from measurements m where m.run_id = r.id) =
             (select sum(json_array_length(json_extract(s.value, '$.limits'))) from plan_versions p, json_each(p.steps) s where p.id = r.plan_version_id))`,
  );
  for (const p of passedWrongly) problem(`unit ${p.serial} is passed without a complete passing run`);
}
