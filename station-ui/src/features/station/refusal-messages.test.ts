import { describe, expect, it } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { REFUSAL_CODES } from '@contract/refusal-codes';
import { describeRefusal } from './refusal-messages';

const refusal = (status: number, code: string, details: Record<string, unknown> = {}, message = 'server text') =>
  new ApiError(status, 'Conflict', message, { code, ...details });

const ctx = { serial: 'K5A-2648-00017', partNumber: 'OB-BK0503' };

describe('describeRefusal', () => {
  it('gives every refusal code of the server\'s list its own headline', () => {
    // the list itself, not a copy: a code the server adds is checked here without editing this test
    const titles = REFUSAL_CODES.map((code) => {
      const m = describeRefusal(refusal(409, code), ctx);
      expect(m.code).toBe(code);
      return m.title;
    });
    expect(new Set(titles).size).toBe(REFUSAL_CODES.length);
  });

  it('a unit under test at another station is named as such, with that station (regression: it read "Scan refused")', () => {
    const m = describeRefusal(refusal(409, 'unit_busy', { station: 'EOL-2' }), ctx);
    expect(m.code).toBe('unit_busy');
    expect(m.title).toBe('Unit under test elsewhere');
    expect(m.detail).toContain('K5A-2648-00017 is being tested at EOL-2');
  });

  it('a code the server does not list is refused with the server\'s own words', () => {
    const m = describeRefusal(refusal(409, 'no_such_code', {}, 'The server said why.'), ctx);
    expect(m.code).toBe('other');
    expect(m.detail).toBe('The server said why.');
  });

  it('unknown serial names the serial', () => {
    const m = describeRefusal(refusal(404, 'unknown_serial'), ctx);
    expect(m.title).toBe('Unknown serial');
    expect(m.detail).toContain('K5A-2648-00017 is not registered');
  });

  it('pattern mismatch names the product the label should belong to', () => {
    const m = describeRefusal(refusal(422, 'pattern_mismatch'), { serial: 'XYZ-1', partNumber: 'OB-BK0503' });
    expect(m.detail).toContain('“XYZ-1”');
    expect(m.detail).toContain('OB-BK0503');
  });

  it("wrong lot names the unit's lot and the station's lot", () => {
    const m = describeRefusal(refusal(409, 'wrong_lot', { unitLot: 'LB-2647-02', activeLot: 'LB-2648-01' }), ctx);
    expect(m.title).toBe('Wrong lot: set it aside');
    expect(m.detail).toBe('K5A-2648-00017 belongs to lot LB-2647-02, but this station is testing lot LB-2648-01.');
  });

  it("already passed needs an engineer's override; an engineer is offered it", () => {
    const op = describeRefusal(refusal(409, 'already_passed'), ctx);
    expect(op.detail).toContain("needs an engineer's override");
    expect(op.canOverride).toBe(false);
    const eng = describeRefusal(refusal(409, 'already_passed'), { ...ctx, isEngineer: true });
    expect(eng.canOverride).toBe(true);
  });

  it('retest limit says to send the unit to repair, with the counts', () => {
    const m = describeRefusal(refusal(409, 'retest_limit', { testCount: 3, maxAttempts: 3 }), ctx);
    expect(m.title).toContain('send it to repair');
    expect(m.detail).toBe('K5A-2648-00017 has been tested 3 times; the plan allows 3. Send it to repair.');
  });

  it('station blocked lists the reasons; busy says to wait', () => {
    const blocked = describeRefusal(refusal(409, 'station_blocked', { reasons: ['calibration of FX-101 overdue since 3 Nov'] }), ctx);
    expect(blocked.detail).toBe('Nothing was powered: calibration of FX-101 overdue since 3 Nov.');
    const busy = describeRefusal(refusal(409, 'station_busy'), ctx);
    expect(busy.detail).toContain('Wait for its result');
  });

  it('a validation error, a lost server and an unknown failure still get plain words', () => {
    expect(describeRefusal(new ApiError(400, 'Bad Request', 'serial must be shorter than or equal to 64 characters'), ctx).title).toBe('Scan not read');
    expect(describeRefusal(new ApiError(0, 'Network Error', 'x'), ctx).title).toBe('Station server not reachable');
    expect(describeRefusal(new Error('boom'), ctx).code).toBe('other');
  });

  it('text that is not a serial at all gets its own title, without "a OB-…" grammar', () => {
    const m = describeRefusal(refusal(422, 'not_a_serial'), { serial: 'hello world', partNumber: 'OB-BK0503' });
    expect(m.title).toBe('Not a serial');
    expect(m.detail).toBe('“hello world” is not a unit serial. Scan the label on the unit itself.');
    const p = describeRefusal(refusal(422, 'pattern_mismatch'), { serial: 'XYZ-1', partNumber: 'OB-BK0503' });
    expect(p.detail).not.toMatch(/\ba OB-/);
    expect(describeRefusal(refusal(422, 'pattern_mismatch'), { serial: 'XYZ-1' }).detail).not.toContain('a this product');
  });

  it("a unit that cannot be tested is titled by its state: scrapped is not 'held for repair'", () => {
    expect(describeRefusal(refusal(409, 'unit_not_testable', { unitState: 'scrapped' }), ctx).title).toBe('Unit scrapped: set it aside');
    expect(describeRefusal(refusal(409, 'unit_not_testable', { unitState: 'in_repair' }), ctx).title).toBe('Unit held for repair');
    expect(describeRefusal(refusal(409, 'unit_not_testable'), ctx).title).toBe('Unit cannot be tested');
  });
});
