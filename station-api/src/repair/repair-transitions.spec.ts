import { describe, expect, it } from 'vitest';
import { allowedActions, repairTransition, type UnitStateName } from './repair-transitions';

// The rules are our own repair loop (the brief of the feature), not an outside standard: no source to cite.
describe('repairTransition', () => {
  it('moves failed → in_repair → untested, and failed or in_repair → scrapped', () => {
    expect(repairTransition('S', 'failed', 'receive')).toEqual({ ok: true, to: 'in_repair' });
    expect(repairTransition('S', 'in_repair', 'return')).toEqual({ ok: true, to: 'untested' });
    expect(repairTransition('S', 'failed', 'scrap')).toEqual({ ok: true, to: 'scrapped' });
    expect(repairTransition('S', 'in_repair', 'scrap')).toEqual({ ok: true, to: 'scrapped' });
  });

  it('refuses every other pair with a sentence naming the state and what is allowed', () => {
    const all: UnitStateName[] = ['untested', 'passed', 'failed', 'in_repair', 'scrapped'];
    const okPairs = new Set(['failed/receive', 'in_repair/return', 'failed/scrap', 'in_repair/scrap']);
    for (const state of all) {
      for (const action of ['receive', 'return', 'scrap'] as const) {
        if (okPairs.has(`${state}/${action}`)) continue;
        const r = repairTransition('K5A-2648-00001', state, action);
        expect(r.ok, `${state}/${action}`).toBe(false);
      }
    }
    const r = repairTransition('K5A-2648-00001', 'failed', 'return');
    expect(r).toEqual({
      ok: false,
      allowed: ['receive', 'scrap'],
      message: 'K5A-2648-00001 is failed and waiting for repair, so it cannot be returned for retest. From failed and waiting for repair you can receive it into repair or scrap it.',
    });
    expect(repairTransition('X', 'in_repair', 'receive')).toMatchObject({ ok: false, allowed: ['return', 'scrap'] });
    expect(repairTransition('X', 'passed', 'scrap')).toMatchObject({ ok: false, allowed: [], message: expect.stringMatching(/is passed.*Only failed units/) });
    expect(repairTransition('X', 'scrapped', 'return')).toMatchObject({ ok: false, message: expect.stringMatching(/stays scrapped/) });
  });

  it('lists the allowed actions per state', () => {
    expect(allowedActions('failed')).toEqual(['receive', 'scrap']);
    expect(allowedActions('in_repair')).toEqual(['return', 'scrap']);
    expect(allowedActions('untested')).toEqual([]);
  });
});
