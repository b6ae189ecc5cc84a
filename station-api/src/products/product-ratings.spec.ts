import { describe, expect, it } from 'vitest';
import { ratingProblems } from './product-ratings';

describe('ratingProblems', () => {
  it('accepts the demo products of docs/architecture.md', () => {
    expect(ratingProblems({ vinMinV: 9, vinNomV: 12, vinMaxV: 18, voutNomV: 5, ioutRatedA: 3 })).toEqual([]);
    expect(ratingProblems({ vinMinV: 16, vinNomV: 24, vinMaxV: 32, voutNomV: 12, ioutRatedA: 2 })).toEqual([]);
  });

  it('refuses an input range out of order, naming the field', () => {
    const p = ratingProblems({ vinMinV: 12, vinNomV: 9, vinMaxV: 18, voutNomV: 5, ioutRatedA: 3 });
    expect(p.map((x) => x.field)).toEqual(['vinNomV']);
  });

  it('refuses an output at or above the lowest input (buck duty D = Vout/Vin must stay below 1)', () => {
    // ideal CCM duty D = Vout/Vin from volt-second balance (Semtech "Power Supplies 101" tutorial)
    const p = ratingProblems({ vinMinV: 5, vinNomV: 12, vinMaxV: 18, voutNomV: 5, ioutRatedA: 3 });
    expect(p).toEqual([{ field: 'voutNomV', problems: [expect.stringMatching(/steps the voltage down/)] }]);
  });
});
