import { describe, expect, it } from 'vitest';
import { Fixture } from '../fixtures/fixture.entity';
import { Lot, LotState } from '../lots/lot.entity';
import { Station } from './station.entity';
import { staticBlockReasons } from './station-readiness';

const now = new Date('2026-12-02T08:00:00Z');

function station(over: { fixture?: Partial<Fixture> | null; lot?: Partial<Lot> | null; active?: boolean } = {}): Station {
  const fixture =
    over.fixture === null
      ? undefined
      : Object.assign(new Fixture(), { code: 'FX-1', active: true, calibrationDueAt: new Date('2027-01-01'), contactCyclesUsed: 10, contactCyclesAllowed: 50_000 }, over.fixture);
  const lot = over.lot === null ? undefined : Object.assign(new Lot(), { code: 'LB-2649-01', state: LotState.Open }, over.lot);
  return Object.assign(new Station(), { code: 'EOL-9', active: over.active ?? true, fixture, activeLot: lot });
}

describe('staticBlockReasons', () => {
  it('is empty for an active station with a good fixture and an open lot', () => {
    expect(staticBlockReasons(station(), now)).toEqual([]);
  });

  it('names every problem', () => {
    const reasons = staticBlockReasons(
      station({ active: false, fixture: { calibrationDueAt: new Date('2026-12-01'), contactCyclesUsed: 50_000 }, lot: { state: LotState.OnHold } }),
      now,
    );
    expect(reasons).toHaveLength(4);
    expect(reasons.join(' ')).toMatch(/out of service.*calibration expired.*contacts.*on hold/s);
    expect(staticBlockReasons(station({ fixture: null, lot: null }), now)).toEqual(['No fixture is assigned.', 'No active lot is set.']);
  });
});
