import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BoardService } from '../src/board/board.service';
import { PlansService } from '../src/plans/plans.service';
import { RunEngineService } from '../src/runs/run-engine.service';
import { createTestApp, TestApp } from './create-test-app';

/**
 * The board works out every station's state from plain rows read once (issue 11: the ORM load of stations,
 * fixtures, lots and each product's released plan version was 22x its SQL). Its state, reasons and warnings
 * must be exactly those of GET /api/stations/:id/status for every station, in every situation readiness knows.
 */
describe('board: the state of every station equals the status route', () => {
  let t: TestApp;
  const sql = (q: string, p: unknown[] = []) => t.orm.em.getConnection().execute<Record<string, unknown>[]>(q, p);

  beforeAll(async () => {
    t = await createTestApp();
  });

  afterAll(async () => {
    await t?.close();
  });

  async function compare(situation: string): Promise<string[]> {
    const board = await t.app.get(BoardService).snapshot();
    const engine = t.app.get(RunEngineService);
    const [{ n }] = await sql('select count(*) as n from stations where active = 1');
    expect(board, situation).toHaveLength(Number(n));
    for (const entry of board) {
      const status = await engine.status(entry.station.id);
      expect({ state: entry.state, reasons: entry.reasons, warnings: entry.warnings }, `${situation}: ${entry.station.code}`).toEqual({
        state: status.state,
        reasons: status.reasons,
        warnings: status.warnings,
      });
      expect(entry.fixture?.code ?? null, situation).toBe(status.fixture?.code ?? null);
      expect(entry.activeLot?.code ?? null, situation).toBe(status.activeLot?.code ?? null);
      if (entry.activeLot) {
        // the released-plan check by SQL agrees with the ORM's lookup the run start uses
        const [{ product_id }] = await sql('select product_id from lots where id = ?', [entry.activeLot.id]);
        const plan = await t.app.get(PlansService).releasedVersionForProduct(Number(product_id), t.orm.em.fork() as never);
        expect(entry.reasons.includes(`No released plan for ${entry.activeLot.partNumber}`), situation).toBe(plan === null);
      }
    }
    return board.map((b) => b.state);
  }

  it('as seeded: ready, with the calibration warning of a fixture due soon', async () => {
    const states = await compare('as seeded');
    expect(states).toContain('ready');
  });

  it('lot on hold, no released plan, calibration overdue and contacts worn out', async () => {
    const stations = await sql('select s.id, s.fixture_id, s.active_lot_id, l.product_id from stations s join lots l on l.id = s.active_lot_id order by s.code');
    expect(stations.length).toBeGreaterThanOrEqual(3);
    const [a, b, c] = stations;
    await sql("update lots set state = 'on_hold', hold_reason = 'ripple drift under review' where id = ?", [a.active_lot_id]);
    await sql('update plan_versions set retired_at = ? where plan_id in (select id from test_plans where product_id = ?)', [Date.now(), b.product_id]);
    await sql('update fixtures set calibration_due_at = ?, contact_cycles_used = contact_cycles_allowed where id = ?', [Date.now() - 3 * 86_400_000, c.fixture_id]);
    const states = await compare('blocked three ways');
    expect(states.filter((s) => s === 'blocked')).toHaveLength(3);
  });

  it('no active lot, no fixture, fixture out of service, contacts nearly worn', async () => {
    const stations = await sql('select s.id, s.fixture_id from stations s order by s.code');
    const [a, b, c] = stations;
    await sql('update stations set active_lot_id = null where id = ?', [a.id]);
    await sql('update stations set fixture_id = null where id = ?', [b.id]);
    await sql("update lots set state = 'open', hold_reason = null", []);
    await sql('update plan_versions set retired_at = null', []);
    await sql('update fixtures set active = 0, calibration_due_at = ?, contact_cycles_used = 0 where id = ?', [Date.now() + 200 * 86_400_000, c.fixture_id]);
    await sql('update fixtures set contact_cycles_used = contact_cycles_allowed * 0.95 where id = ?', [a.fixture_id]);
    const states = await compare('idle and blocked');
    expect(states).toContain('idle');
  });
});
