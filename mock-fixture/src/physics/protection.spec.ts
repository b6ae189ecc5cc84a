import { describe, expect, it } from 'vitest';
import { PRODUCTS } from '../products';
import { applyDefect } from '../defects';
import { protectionTest } from './protection';
import { nominalUnit } from '../test-support/test-units';

/*
 * Fold-back, its depth and the "folded"/"recovered" criteria (below 50 % of nominal; back within 5 %) are the
 * simulator's own modelling choices (common practice, no source); these checks pin the behaviour the plans rely on.
 */
describe('protection test', () => {
  it('folds and recovers on a good unit of every product', () => {
    for (const p of Object.values(PRODUCTS)) {
      const r = protectionTest(nominalUnit(p), p.vinNomV, 0, 2 * p.ioutRatedA);
      expect(r).toMatchObject({ folded: true, recovered: true });
      expect(r.voutDuringV).toBeLessThan(0.5 * p.voutV);
      expect(r.voutAfterV).toBeGreaterThan(0.95 * p.voutV);
    }
  });

  it('does not fold below the current limit', () => {
    const p = PRODUCTS['OB-BK0503'];
    expect(protectionTest(nominalUnit(p), 12, 0, 4).folded).toBe(false);
  });

  it('reports no fold-back for no_protection and no recovery for open_output', () => {
    const p = PRODUCTS['OB-BK3305'];
    expect(protectionTest(applyDefect(nominalUnit(p), 'no_protection'), 24, 0, 10)).toMatchObject({ folded: false, recovered: true });
    expect(protectionTest(applyDefect(nominalUnit(p), 'open_output'), 24, 0, 10)).toMatchObject({ folded: true, recovered: false });
  });
});
