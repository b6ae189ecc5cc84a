import { describe, expect, it } from 'vitest';
import { expandSerials, MAX_LOT_QUANTITY, splitSerialList } from './serial-input';

const K5A = String.raw`^K5A-\d{4}-\d{5}$`;

// self-constructed examples: serials of the demo pattern (docs/architecture.md), counted by hand
describe('expandSerials', () => {
  it('expands a range from its first to its last serial, both included', () => {
    const r = expandSerials({ kind: 'range', firstSerial: 'K5A-2649-00098', lastSerial: 'K5A-2649-00102' }, K5A, 5);
    expect(r).toEqual({ ok: true, serials: ['K5A-2649-00098', 'K5A-2649-00099', 'K5A-2649-00100', 'K5A-2649-00101', 'K5A-2649-00102'] });
  });

  it('refuses a range whose size differs from the planned quantity, saying both numbers', () => {
    const r = expandSerials({ kind: 'range', firstSerial: 'K5A-2649-00001', lastSerial: 'K5A-2649-00010' }, K5A, 12);
    expect(r).toEqual({ ok: false, problems: [{ field: 'plannedQuantity', message: expect.stringMatching(/planned quantity is 12 but .* holds 10 serials/) }] });
  });

  it('names each bad end of a range', () => {
    const r = expandSerials({ kind: 'range', firstSerial: 'K3E-2649-00001', lastSerial: 'K5A-2660-00004' }, K5A, 4);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems.map((p) => p.field)).toEqual(['firstSerial', 'lastSerial']);
    expect(r.problems[0].message).toMatch(/K3E-2649-00001 is not a serial of this product \(expected the form K5A-2649-00001\)/);
    // ISO 8601 weeks run 01..53: week 60 does not exist
    expect(r.problems[1].message).toMatch(/week 60; ISO weeks run 01 to 53/);
  });

  it('refuses a backwards range, a range across weeks, sequence 00000 and a range past the bound', () => {
    const bad = (first: string, last: string, qty = 1) => {
      const r = expandSerials({ kind: 'range', firstSerial: first, lastSerial: last }, K5A, qty);
      return r.ok ? '' : r.problems.map((p) => p.message).join(' | ');
    };
    expect(bad('K5A-2649-00010', 'K5A-2649-00001')).toMatch(/comes before the first/);
    expect(bad('K5A-2649-00001', 'K5A-2650-00001')).toMatch(/keeps prefix and year-week/);
    expect(bad('K5A-2649-00000', 'K5A-2649-00001', 2)).toMatch(/start at 00001/);
    expect(bad('K5A-2649-00001', 'K5A-2649-20000', 20000)).toMatch(new RegExp(`at most ${MAX_LOT_QUANTITY}`));
  });

  it('takes a list of serials of any weeks and refuses repeats, foreign serials and a wrong count', () => {
    expect(expandSerials({ kind: 'list', serials: ['K5A-2649-00007', 'K5A-2650-00001'] }, K5A, 2)).toEqual({ ok: true, serials: ['K5A-2649-00007', 'K5A-2650-00001'] });
    const r = expandSerials({ kind: 'list', serials: ['K5A-2649-00007', 'K5A-2649-00007', 'k5a-2649-00008'] }, K5A, 2);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems.map((p) => p.message).join(' | ')).toMatch(/k5a-2649-00008 is not a serial of this product.*listed more than once: K5A-2649-00007.*planned quantity is 2 but the list holds 3/);
  });

  it('refuses a product pattern it cannot read', () => {
    expect(expandSerials({ kind: 'list', serials: ['X'] }, '^.*$', 1)).toMatchObject({ ok: false, problems: [{ field: 'serials', message: expect.stringMatching(/correct the product first/) }] });
  });
});

describe('splitSerialList', () => {
  it('splits on commas, semicolons, spaces and line breaks', () => {
    expect(splitSerialList(' K5A-2649-00001,K5A-2649-00002;\r\nK5A-2649-00003  K5A-2649-00004\n')).toEqual(['K5A-2649-00001', 'K5A-2649-00002', 'K5A-2649-00003', 'K5A-2649-00004']);
  });
});
