import { describe, expect, it } from 'vitest';
import { Fixture } from '../fixtures/fixture.entity';
import { Lot, LotState } from '../lots/lot.entity';
import { Station } from './station.entity';
import { fixtureWarnings, plainDate, readiness, ReadinessInput, staticBlockReasons } from './station-readiness';

const now = new Date('2026-11-20T08:00:00Z');
const base: ReadinessInput = {
  now,
  station: { code: 'EOL-1', active: true },
  fixture: { code: 'FX-101', active: true, calibrationDueAt: new Date('2027-06-01T00:00:00Z'), contactCyclesUsed: 3180, contactCyclesAllowed: 50000 },
  lot: { code: 'LB-2647-01', state: 'open', partNumber: 'OB-BK0503' },
  hasReleasedPlan: true,
};

describe('readiness', () => {
  it('is ready with nothing wrong', () => {
    expect(readiness(base)).toEqual({ state: 'ready', reasons: [], blocking: [], warnings: [] });
  });

  it('is idle with no active lot and nothing else wrong', () => {
    const r = readiness({ ...base, lot: undefined });
    expect(r.state).toBe('idle');
    expect(r.reasons).toEqual(['No active lot']);
  });

  it('words each blocking reason plainly', () => {
    const r = readiness({
      ...base,
      fixture: { ...base.fixture!, calibrationDueAt: new Date('2026-11-03T00:00:00Z'), contactCyclesUsed: 50000 },
      hasReleasedPlan: false,
    });
    expect(r.state).toBe('blocked');
    expect(r.reasons).toEqual(['Calibration overdue since 3 Nov 2026', 'Contact cycles at limit (50,000 of 50,000)', 'No released plan for OB-BK0503']);
  });

  it('says when the fixture is missing', () => {
    expect(readiness({ ...base, fixture: undefined }).reasons).toEqual(['Fixture not connected']);
  });

  it('treats the due date itself as still calibrated', () => {
    expect(readiness({ ...base, fixture: { ...base.fixture!, calibrationDueAt: now } }).state).toBe('ready');
  });

  it('shows a lot on hold with its reason', () => {
    const r = readiness({ ...base, lot: { ...base.lot!, state: 'on_hold', holdReason: 'solder voids found' } });
    expect(r.reasons).toEqual(['Lot LB-2647-01 is on hold: solder voids found']);
  });

  it('is in fault after a failed contact, and testing wins over everything', () => {
    expect(readiness({ ...base, fixtureFault: 'Fixture FX-101: no answer to *IDN? within 2000 ms' })).toMatchObject({
      state: 'fault',
      reasons: ['Fixture FX-101: no answer to *IDN? within 2000 ms'],
      blocking: [],
    });
    expect(readiness({ ...base, running: { runId: 4, serial: 'K5A-2647-00001' } }).state).toBe('testing');
  });

  it('formats dates as day, short month, year in UTC', () => {
    expect(plainDate(new Date('2026-11-03T23:30:00Z'))).toBe('3 Nov 2026');
  });
});

describe('warnings before blocking', () => {
  const DAY_MS = 86_400_000;
  const fx = (over: Partial<ReadinessInput['fixture']>) => ({ ...base, fixture: { ...base.fixture!, ...over } });

  it('warns, without blocking, when the calibration falls due within the warning window', () => {
    const r = readiness(fx({ calibrationDueAt: new Date(now.getTime() + 20 * DAY_MS) }));
    expect(r).toMatchObject({ state: 'ready', blocking: [], reasons: [] });
    expect(r.warnings).toEqual(['Calibration due 10 Dec 2026 (in 20 days); book the recalibration']);
  });

  it('counts the window in whole days and honours a configured number of days', () => {
    // 30 days exactly is inside the default 30-day window; 31 is outside; a 7-day window excludes 20
    expect(readiness(fx({ calibrationDueAt: new Date(now.getTime() + 30 * DAY_MS) })).warnings).toHaveLength(1);
    expect(readiness(fx({ calibrationDueAt: new Date(now.getTime() + 31 * DAY_MS) })).warnings).toEqual([]);
    expect(readiness({ ...fx({ calibrationDueAt: new Date(now.getTime() + 20 * DAY_MS) }), calibrationWarnDays: 7 }).warnings).toEqual([]);
    expect(readiness({ ...fx({ calibrationDueAt: new Date(now.getTime() + 5 * DAY_MS) }), calibrationWarnDays: 0 }).warnings).toEqual([]);
    expect(fixtureWarnings({ ...base.fixture!, calibrationDueAt: now }, now)).toEqual(['Calibration due 20 Nov 2026 (today); book the recalibration']);
    expect(fixtureWarnings({ ...base.fixture!, calibrationDueAt: new Date(now.getTime() + 3_600_000) }, now)[0]).toContain('(in 1 day)');
  });

  it('warns at 90 % of the contact allowance and blocks at 100 %', () => {
    expect(readiness(fx({ contactCyclesUsed: 44_999 })).warnings).toEqual([]);
    const at90 = readiness(fx({ contactCyclesUsed: 45_000 }));
    expect(at90).toMatchObject({ state: 'ready', blocking: [] });
    expect(at90.warnings).toEqual(['Contact cycles at 90 % (45,000 of 50,000); plan a probe change']);
    const worn = readiness(fx({ contactCyclesUsed: 50_000 }));
    expect(worn).toMatchObject({ state: 'blocked', blocking: ['Contact cycles at limit (50,000 of 50,000)'], warnings: [] });
  });

  it('blocks an overdue calibration instead of warning, and keeps warnings while testing', () => {
    const overdue = readiness(fx({ calibrationDueAt: new Date(now.getTime() - 1000) }));
    expect(overdue).toMatchObject({ state: 'blocked', blocking: ['Calibration overdue since 20 Nov 2026'], warnings: [] });
    const testing = readiness({ ...fx({ contactCyclesUsed: 46_000 }), running: { runId: 1, serial: 'K5A-2647-00001' } });
    expect(testing).toMatchObject({ state: 'testing', reasons: [] });
    expect(testing.warnings).toHaveLength(1);
  });
});

describe('staticBlockReasons', () => {
  function station(over: { fixture?: Partial<Fixture> | null; lot?: Partial<Lot> | null; active?: boolean } = {}): Station {
    const fixture =
      over.fixture === null
        ? undefined
        : Object.assign(new Fixture(), { code: 'FX-1', active: true, calibrationDueAt: new Date('2027-01-01'), contactCyclesUsed: 10, contactCyclesAllowed: 50_000 }, over.fixture);
    const lot = over.lot === null ? undefined : Object.assign(new Lot(), { code: 'LB-2649-01', state: LotState.Open, product: { partNumber: 'OB-BK0503' } }, over.lot);
    return Object.assign(new Station(), { code: 'EOL-9', active: over.active ?? true, fixture, activeLot: lot });
  }

  it('is empty for an active station with a good fixture and an open lot', () => {
    expect(staticBlockReasons(station(), now)).toEqual([]);
  });

  it('words every problem as the live state does (one wording for the list and the station)', () => {
    const reasons = staticBlockReasons(
      station({ active: false, fixture: { calibrationDueAt: new Date('2026-11-03T00:00:00Z'), contactCyclesUsed: 50_000 }, lot: { state: LotState.OnHold } }),
      now,
    );
    expect(reasons).toEqual([
      'Station EOL-9 is switched off in the settings',
      'Calibration overdue since 3 Nov 2026',
      'Contact cycles at limit (50,000 of 50,000)',
      'Lot LB-2649-01 is on hold',
    ]);
    expect(staticBlockReasons(station({ fixture: null, lot: null }), now)).toEqual(['No active lot', 'Fixture not connected']);
  });
});
