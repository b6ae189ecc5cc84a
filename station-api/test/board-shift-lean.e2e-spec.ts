import { EntityManager } from '@mikro-orm/sqlite';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BoardService, BOARD_LAST_RUNS } from '../src/board/board.service';
import { RunVerdict, TestRun } from '../src/runs/test-run.entity';
import { summarizeShift } from '../src/shift/shift';
import { ShiftSummaryService } from '../src/shift/shift-summary.service';
import { createTestApp, TestApp } from './create-test-app';

/** HH:MM, local time, 12 hours from now: one 24-hour shift that started 12 h ago. */
function shiftStartTwelveHoursAway(): string {
  const d = new Date(Date.now() + 12 * 3_600_000);
  return `${String(d.getHours()).padStart(2, '0')}:${String(d.getMinutes()).padStart(2, '0')}`;
}

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

/*
 * The previous implementation of the shift counters and the board's last runs (through the ORM, before
 * issue 11 made them hand-written SQL), kept here word for word as the reference the lean SQL must equal.
 */
async function previousShiftRuns(em: EntityManager, stationIds: number[], start: Date, end: Date) {
  const runs = await em.fork().find(
    TestRun,
    { station: { $in: stationIds }, finishedAt: { $gte: start, $lt: end } },
    { fields: ['unit', 'station', 'attempt', 'verdict', 'finishedAt'] },
  );
  return (stationId: number) =>
    runs.filter((r) => r.station.id === stationId).map((r) => ({ unitId: r.unit.id, attempt: r.attempt, verdict: r.verdict, finishedAt: r.finishedAt ?? null }));
}

async function previousLastRuns(em: EntityManager, stationId: number, shiftStart: Date) {
  const runs = await em.fork().find(
    TestRun,
    { station: stationId, verdict: { $ne: RunVerdict.Running }, finishedAt: { $ne: null, $gte: shiftStart } },
    { populate: ['unit'], orderBy: { finishedAt: 'desc', id: 'desc' }, limit: BOARD_LAST_RUNS },
  );
  return runs.map((r) => ({ id: r.id, serial: r.unit.serial, verdict: r.verdict, failedStepKey: r.failedStepKey ?? null, finishedAt: r.finishedAt!.toISOString() }));
}

/**
 * Board and shift summary read with lean SQL (issue 11) give the same answers as the ORM implementation
 * they replaced, on a seeded history: runs of every verdict on every station, retests, runs before the
 * shift and after it, runs still going, equal finish times.
 */
describe('board and shift summary: lean SQL equals the previous ORM answers', () => {
  let t: TestApp;
  let stationIds: number[];

  beforeAll(async () => {
    t = await createTestApp({ SHIFT_STARTS: shiftStartTwelveHoursAway() });
    const conn = t.orm.em.getConnection();
    const sql = <T = Record<string, unknown>[]>(q: string, p: unknown[] = []) => conn.execute(q, p) as Promise<T>;
    const stations = await sql('select s.id, s.fixture_id, s.active_lot_id, l.product_id from stations s join lots l on l.id = s.active_lot_id order by s.code');
    stationIds = stations.map((s) => Number(s.id));
    const [op] = await sql("select id from users where username = 'operator'");
    const [pv] = await sql('select id from plan_versions order by id limit 1');
    const random = rng(20261202);
    const now = Date.now();
    // self-constructed history: per station 60 units, 1–3 runs each, finish times from 20 h ago to 1 min ago
    // (the shift began 12 h ago), some with the same finish time, a few errors and aborts, one run still going
    let unitSeq = 0;
    for (const s of stations) {
      for (let u = 0; u < 60; u++) {
        const serial = `LEAN-${String(++unitSeq).padStart(5, '0')}`;
        await sql('insert into units (created_at, updated_at, serial, lot_id, product_id, state, test_count) values (?, ?, ?, ?, ?, ?, ?)', [now, now, serial, s.active_lot_id, s.product_id, 'failed', 0]);
        const [{ id: unitId }] = await sql('select last_insert_rowid() as id');
        const runs = 1 + Math.floor(random() * 3);
        let at = now - 20 * 3_600_000 + Math.floor(random() * 19 * 3_600_000);
        let attempt = 1;
        for (let k = 0; k < runs; k++) {
          const pick = random();
          const verdict = pick < 0.6 ? 'pass' : pick < 0.85 ? 'fail' : pick < 0.93 ? 'error' : 'aborted';
          const finished = u % 17 === 0 ? now - 3 * 3_600_000 : at; // equal finish times on several units
          await sql(
            'insert into test_runs (created_at, updated_at, unit_id, lot_id, product_id, station_id, fixture_id, plan_version_id, operator_id, attempt, verdict, started_at, finished_at, failed_step_key) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
            [at, at, unitId, s.active_lot_id, s.product_id, s.id, s.fixture_id, pv.id, op.id, attempt, verdict, finished - 4000, finished, verdict === 'fail' ? 'vout-load' : null],
          );
          if (verdict === 'pass' || verdict === 'fail') attempt++;
          at += Math.floor(random() * 40 * 60_000) + 1000;
          if (at > now - 60_000) break;
        }
      }
    }
    // a run still going on the first station (no finish time)
    const [{ id: lastUnit }] = await sql('select max(id) as id from units');
    await sql(
      'insert into test_runs (created_at, updated_at, unit_id, lot_id, product_id, station_id, fixture_id, plan_version_id, operator_id, attempt, verdict, started_at) select ?, ?, u.id, u.lot_id, u.product_id, ?, ?, ?, ?, 9, ?, ? from units u where u.id = ?',
      [now, now, stations[0].id, stations[0].fixture_id, pv.id, op.id, 'running', now - 1000, lastUnit],
    );
  }, 120_000);

  afterAll(async () => {
    await t?.close();
  });

  it('shift counters of every station equal the previous implementation', async () => {
    const shifts = t.app.get(ShiftSummaryService);
    const now = new Date();
    const window = shifts.currentShift(now);
    const lean = await shifts.forStations(stationIds, now);
    const previous = await previousShiftRuns(t.orm.em as EntityManager, stationIds, window.start, window.end);
    let tested = 0;
    for (const id of stationIds) {
      const expected = summarizeShift(previous(id), window, now);
      expect(lean.get(id)).toEqual({ stationId: id, shiftName: window.name, shiftStart: window.start.toISOString(), shiftEnd: window.end.toISOString(), ...expected });
      tested += expected.tested;
    }
    // the seeded history really exercises the counters
    expect(tested).toBeGreaterThan(50);
    expect((await shifts.forStation(stationIds[1])).tested).toBe(lean.get(stationIds[1])!.tested);
  });

  it("board's last runs and shift of every station equal the previous implementation", async () => {
    const board = await t.app.get(BoardService).snapshot();
    expect(board.map((b) => b.station.id)).toEqual(stationIds);
    for (const b of board) {
      const expected = await previousLastRuns(t.orm.em as EntityManager, b.station.id, new Date(b.shift.shiftStart));
      expect(expected).toHaveLength(BOARD_LAST_RUNS);
      expect(b.lastRuns).toEqual(expected);
    }
  });
});
