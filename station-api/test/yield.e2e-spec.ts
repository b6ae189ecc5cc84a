import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { capability, histogram, individualsChart, paretoTable, rolledThroughputYield, wilsonInterval } from '../src/stats';
import { createTestApp, login, TestApp } from './create-test-app';

/*
 * The yield views against a self-constructed example: five units of one demo lot, tested on two stations over
 * two days, written straight into test_runs and measurements (as the engine stores them), so every figure can be
 * counted by hand.
 *
 *  unit  runs (attempt: verdict)             first judged  latest judged  unit state   station of 1st judged
 *  U1    1: pass                             pass          pass           passed       EOL-1, day 1 08:00
 *  U2    1: fail (vout), 2: pass             fail          pass           passed       EOL-1, day 1 09:00
 *  U3    1: error, 2: pass                   pass (att. 2) pass           passed       EOL-2, day 1 10:00
 *  U4    1: fail (ripple), 2: fail (ripple)  fail          fail           failed       EOL-1, day 2 08:00
 *  U5    1: pass                             pass          pass           scrapped     EOL-2, day 2 15:00
 *
 * FPY = 3/5 (U1, U3, U5); final = 3/5 (U1, U2, U3 pass in the end; U5 passed but is scrapped, U4 failed).
 * By station: EOL-1 FPY 1/3, final 2/3; EOL-2 FPY 2/2, final 1/2.
 * RTY over the first judged runs: vout step 4/5 pass, ripple step 4/5 pass → 0.8 × 0.8 = 0.64.
 * Pareto by step over failing runs (U2 a1, U4 a1, U4 a2): ripple 2, vout 1 → cumulative 66.7 %, 100 %.
 */

const VOUT_LIMITS = { low: 4.9, high: 5.1, gLow: 4.91, gHigh: 5.09 };
const RIPPLE_HIGH = 50;

interface RunSpec {
  unit: number;
  attempt: number;
  verdict: 'pass' | 'fail' | 'error';
  station: 'EOL-1' | 'EOL-2';
  at: Date;
  vout: number;
  /** absent: the run stopped before the ripple step */
  ripple?: number;
}

// local times, as the plant's wall clock (the day and shift breakdowns use local time)
const day1 = (h: number) => new Date(2026, 9, 5, h, 0, 0);
const day2 = (h: number) => new Date(2026, 9, 6, h, 0, 0);
const RUNS: RunSpec[] = [
  { unit: 0, attempt: 1, verdict: 'pass', station: 'EOL-1', at: day1(8), vout: 5.0, ripple: 20 },
  { unit: 1, attempt: 1, verdict: 'fail', station: 'EOL-1', at: day1(9), vout: 5.3, ripple: 22 },
  { unit: 2, attempt: 1, verdict: 'error', station: 'EOL-2', at: day1(9), vout: 5.5 },
  { unit: 2, attempt: 2, verdict: 'pass', station: 'EOL-2', at: day1(10), vout: 4.99, ripple: 21 },
  { unit: 1, attempt: 2, verdict: 'pass', station: 'EOL-1', at: day1(11), vout: 5.01, ripple: 23 },
  { unit: 3, attempt: 1, verdict: 'fail', station: 'EOL-1', at: day2(8), vout: 5.02, ripple: 60 },
  { unit: 3, attempt: 2, verdict: 'fail', station: 'EOL-1', at: day2(9), vout: 5.03, ripple: 65 },
  { unit: 4, attempt: 1, verdict: 'pass', station: 'EOL-2', at: day2(15), vout: 4.98, ripple: 19 },
];

describe('yield views (self-constructed example)', () => {
  let t: TestApp;
  let quality: string;
  let lotId: number;
  let productId: number;
  let serials: string[];
  let stationIds: Record<string, number>;
  const get = (path: string, token = quality) => request(t.app.getHttpServer()).get(`/api/yield/${path}`).set('Authorization', `Bearer ${token}`);

  beforeAll(async () => {
    t = await createTestApp();
    quality = await login(t.app, 'quality');
    const conn = t.orm.em.getConnection();
    // the oldest demo lot: registered with units, untested (the test app seeds no history)
    const lot = ((await conn.execute('select id, product_id from lots order by id limit 1')) as { id: number; product_id: number }[])[0];
    lotId = lot.id;
    productId = lot.product_id;
    serials = ((await conn.execute('select serial from units where lot_id = ? order by serial limit 5', [lotId])) as { serial: string }[]).map((r) => r.serial);
    const unitIds = ((await conn.execute('select id from units where lot_id = ? order by serial limit 5', [lotId])) as { id: number }[]).map((r) => r.id);
    const stations = (await conn.execute('select id, code, fixture_id from stations')) as { id: number; code: string; fixture_id: number }[];
    stationIds = Object.fromEntries(stations.map((s) => [s.code, s.id]));
    const plan = ((await conn.execute('select pv.id from plan_versions pv join test_plans p on p.id = pv.plan_id where p.product_id = ? limit 1', [productId])) as { id: number }[])[0];
    const operator = ((await conn.execute(`select id from users where username = 'operator'`)) as { id: number }[])[0];
    for (const r of RUNS) {
      const st = stations.find((s) => s.code === r.station)!;
      const ms = r.at.getTime();
      const res = (await conn.execute(
        `insert into test_runs (created_at, updated_at, unit_id, lot_id, product_id, station_id, fixture_id, plan_version_id, operator_id, attempt, verdict, started_at, finished_at)
         values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) returning id`,
        [ms, ms, unitIds[r.unit], lotId, productId, st.id, st.fixture_id, plan.id, operator.id, r.attempt, r.verdict, ms, ms + 30_000],
      )) as { id: number }[];
      const runId = res[0].id;
      const voutVerdict = r.vout < VOUT_LIMITS.low || r.vout > VOUT_LIMITS.high ? 'fail' : 'pass';
      await measurement(runId, 0, 'vout', 'Output voltage', 'vout', 'Output voltage, no load', r.vout, 'V', VOUT_LIMITS.low, VOUT_LIMITS.high, VOUT_LIMITS.gLow, VOUT_LIMITS.gHigh, voutVerdict, ms);
      if (r.ripple !== undefined) {
        // a step name with a comma and quotes, so the CSV export has to quote it
        await measurement(runId, 1, 'ripple', 'Ripple, "full" load', 'rippleMvPp', 'Ripple peak-to-peak', r.ripple, 'mV', null, RIPPLE_HIGH, null, null, r.ripple > RIPPLE_HIGH ? 'fail' : 'pass', ms + 1000);
      }
    }
    await conn.execute(`update units set state = 'scrapped' where id = ?`, [unitIds[4]]);

    async function measurement(runId: number, idx: number, stepKey: string, stepName: string, quantity: string, name: string, value: number, unit: string,
      low: number | null, high: number | null, gLow: number | null, gHigh: number | null, verdict: string, ms: number) {
      await conn.execute(
        `insert into measurements (created_at, updated_at, run_id, step_index, step_key, step_name, quantity, name, value, unit, low_limit, high_limit, guarded_low, guarded_high, uncertainty, rule, verdict, started_at, measured_at)
         values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 0, 'simple', ?, ?, ?)`,
        [ms, ms, runId, idx, stepKey, stepName, quantity, name, value, unit, low, high, gLow, gHigh, verdict, ms, ms],
      );
    }
  });
  afterAll(async () => t?.close());

  it('counts first-pass and final yield by hand and gives the stats module’s Wilson intervals', async () => {
    const res = await get(`figures?lotId=${lotId}&by=station`).expect(200);
    const { overall } = res.body;
    expect(overall.unitsTested).toBe(5);
    expect(overall.firstPass).toMatchObject({ x: 3, n: 5, estimate: 0.6, method: 'Wilson score', confidence: 0.95 });
    expect(overall.final).toMatchObject({ x: 3, n: 5, estimate: 0.6 });
    expect(overall.firstPass).toEqual(wilsonInterval(3, 5));
    // Wilson (JASA 22, 1927) score interval for 3/5 at z = 1.96, computed by hand from the formula:
    // centre (0.6 + 1.9208/5)/(1 + 3.8416/5) = 0.55655, half-width 1.96·√(0.048 + 0.038416)/1.76832 = 0.32584
    expect(overall.firstPass.lower).toBeCloseTo(0.2307, 3);
    expect(overall.firstPass.upper).toBeCloseTo(0.8824, 3);
    const byStation = Object.fromEntries(res.body.breakdown.map((g: { label: string }) => [g.label, g]));
    expect(byStation['EOL-1']).toMatchObject({ unitsTested: 3, firstPass: { x: 1, n: 3 }, final: { x: 2, n: 3 } });
    expect(byStation['EOL-2']).toMatchObject({ unitsTested: 2, firstPass: { x: 2, n: 2 }, final: { x: 1, n: 2 } });
  });

  it('gives RTY as the product of the steps’ first-pass yields (stats rolledThroughputYield)', async () => {
    const { rty } = (await get(`figures?lotId=${lotId}`).expect(200)).body;
    expect(rty.steps.map((s: { stepKey: string; entered: number; passedFirstTime: number }) => [s.stepKey, s.entered, s.passedFirstTime])).toEqual([
      ['vout', 5, 4],
      ['ripple', 5, 4],
    ]);
    expect(rty.value).toBeCloseTo(0.64, 12);
    expect(rty.value).toBe(rolledThroughputYield([{ step: 'vout', entered: 5, passedFirstTime: 4 }, { step: 'ripple', entered: 5, passedFirstTime: 4 }]).rty);
  });

  it('breaks down by day and shift and keeps a daily trend; the date range filters the first judged run', async () => {
    const byDay = (await get(`figures?lotId=${lotId}&by=day`).expect(200)).body;
    expect(byDay.trend.map((g: { key: string; unitsTested: number }) => [g.key, g.unitsTested])).toEqual([
      ['2026-10-05', 3],
      ['2026-10-06', 2],
    ]);
    const byShift = (await get(`figures?lotId=${lotId}&by=shift`).expect(200)).body;
    // default SHIFT_STARTS 06:00,14:00,22:00: U5 started 15:00, the others in the morning
    expect(byShift.breakdown.map((g: { label: string; unitsTested: number }) => [g.label, g.unitsTested])).toEqual([
      ['Shift 1 (06:00–14:00)', 4],
      ['Shift 2 (14:00–22:00)', 1],
    ]);
    const day2Only = (await get(`figures?lotId=${lotId}&from=2026-10-06&to=2026-10-06`).expect(200)).body;
    expect(day2Only.overall).toMatchObject({ unitsTested: 2, firstPass: { x: 1 }, final: { x: 0 } });
    const eol2 = (await get(`figures?lotId=${lotId}&stationId=${stationIds['EOL-2']}`).expect(200)).body;
    expect(eol2.overall.unitsTested).toBe(2);
  });

  it('ranks failures by step with a cumulative percentage and lists the units behind a bar', async () => {
    const p = (await get(`pareto?lotId=${lotId}&by=step`).expect(200)).body;
    expect(p.failedRuns).toBe(3);
    expect(p.bars.map((b: { key: string; count: number; cumulativePercent: number }) => [b.key, b.count])).toEqual([
      ['ripple', 2],
      ['vout', 1],
    ]);
    expect(p.bars[0].cumulativePercent).toBeCloseTo(66.667, 2);
    expect(p.bars[1].cumulativePercent).toBe(100);
    expect(p.bars.map(({ label: _label, ...row }: { label: string }) => row)).toEqual(paretoTable([{ key: 'ripple', count: 2 }, { key: 'vout', count: 1 }]));
    const units = (await get(`pareto/units?lotId=${lotId}&by=step&key=ripple`).expect(200)).body;
    expect(units.total).toBe(2);
    expect(units.units.map((u: { serial: string; value: number; highLimit: number }) => [u.serial, u.value, u.highLimit])).toEqual([
      [serials[3], 65, 50],
      [serials[3], 60, 50],
    ]);
    const byQ = (await get(`pareto?lotId=${lotId}&by=quantity`).expect(200)).body;
    expect(byQ.bars[0]).toMatchObject({ key: 'ripple/rippleMvPp', count: 2 });
    expect((await get(`pareto/units?lotId=${lotId}&by=quantity&key=vout/vout`).expect(200)).body.units[0]).toMatchObject({ serial: serials[1], value: 5.3 });
  });

  it('gives capability, histogram and control chart exactly as the stats module computes them from the judged values', async () => {
    // judged runs only, in start order (U3's error run with 5.5 V is left out)
    const values = [5.0, 5.3, 4.99, 5.01, 5.02, 5.03, 4.98];
    const cap = (await get(`capability?productId=${productId}&step=vout&quantity=vout`).expect(200)).body;
    expect(cap.n).toBe(7);
    expect(cap.limits).toEqual({ lowLimit: 4.9, highLimit: 5.1, guardedLow: 4.91, guardedHigh: 5.09 });
    // mean by hand: 35.33 / 7
    expect(cap.capability.mean).toBeCloseTo(35.33 / 7, 12);
    expect(cap.capability).toEqual(capability(values, { lsl: 4.9, usl: 5.1 }));
    expect(cap.histogram).toEqual(histogram(values, { include: [4.9, 5.1, 4.91, 5.09] }));

    const oneSided = (await get(`capability?productId=${productId}&step=ripple&quantity=rippleMvPp`).expect(200)).body;
    expect(oneSided.capability.cp).toBeNull();
    expect(oneSided.capability.cpk.value).toBe(oneSided.capability.cpu);

    const chart = (await get(`control-chart?productId=${productId}&step=vout&quantity=vout&rules=nelson`).expect(200)).body;
    const ref = individualsChart(values, 'nelson');
    expect(chart.kind).toBe('individuals-moving-range');
    expect(chart.location.centre).toBe(ref.individuals.centre);
    expect(chart.location.upper).toBe(ref.individuals.upper);
    expect(chart.violations).toEqual(ref.individuals.violations);
    expect(chart.location.points.map((p: { label: string }) => p.label)[1]).toBe(serials[1]);

    const xbar = (await get(`control-chart?productId=${productId}&step=vout&quantity=vout&subgroupSize=3`).expect(200)).body;
    expect(xbar.kind).toBe('xbar-r');
    expect(xbar.n).toBe(6);
    const tooFew = (await get(`control-chart?productId=${productId}&step=vout&quantity=vout&subgroupSize=5`).expect(200)).body;
    expect(tooFew.kind).toBeNull();
    expect(tooFew.problem).toMatch(/needs at least 10 values/);
  });

  it('exports the measurements behind a view as RFC 4180 CSV with the filters applied', async () => {
    const res = await get(`measurements.csv?lotId=${lotId}&step=ripple`).expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    const lines = (res.text as string).split('\r\n').filter(Boolean);
    expect(lines[0].startsWith('measurement_id,run_id,serial,')).toBe(true);
    expect(lines).toHaveLength(1 + 7);
    // RFC 4180 §2: the comma and quotes in the step name are quoted and doubled
    expect(lines[1]).toContain(',"Ripple, ""full"" load",');
    // every failing measurement, the error run's included (U2 vout, U3's error-run vout, U4 ripple twice)
    const failing = await get(`measurements.csv?lotId=${lotId}&only=failing`).expect(200);
    expect((failing.text as string).split('\r\n').filter(Boolean)).toHaveLength(1 + 4);
  });

  it('refuses a malformed query with 400 naming the field, never a 500', async () => {
    const cases: [string, RegExp][] = [
      ['figures?by=colour', /by must be one of/],
      ['figures?from=2026-13-45', /from/],
      ['figures?from=yesterday', /from must be a date/],
      ['figures?from=2026-10-07&to=2026-10-01', /from .* must not be after to/],
      ['figures?lotId=abc', /lotId must be a whole number/],
      ['pareto?by=cause', /by must be one of step, quantity/],
      ['pareto/units?by=quantity&key=vout', /key: "vout" is not a quantity bar/],
      ['pareto/units', /key/],
      [`capability?step=vout&quantity=vout`, /productId: choose a product/],
      [`capability?productId=${productId}&quantity=vout`, /step/],
      [`control-chart?productId=${productId}&step=vout&quantity=vout&subgroupSize=11`, /subgroupSize must be from 1/],
      [`control-chart?productId=${productId}&step=vout&quantity=vout&rules=mine`, /rules must be one of/],
      ['measurements.csv?only=some', /only must be all or failing/],
      ['figures?colour=red', /Unknown field "colour"/],
    ];
    for (const [path, message] of cases) {
      const res = await get(path);
      expect(res.status, path).toBe(400);
      expect(res.body.message, path).toMatch(message);
    }
  });

  it('is open to engineer, quality and admin, not to operators', async () => {
    await get('figures', await login(t.app, 'engineer')).expect(200);
    await get('figures', await login(t.app, 'admin')).expect(200);
    await get('figures', await login(t.app, 'operator')).expect(403);
  });
});
