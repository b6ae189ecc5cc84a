import { describe, expect, it } from 'vitest';
import { plainDate, readiness, ReadinessInput } from './station-readiness';

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
    expect(readiness(base)).toEqual({ state: 'ready', reasons: [], blocking: [] });
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
