import { describe, expect, it } from 'vitest';
import { createLotBody } from '../api/lots-api';
import { exampleSerial, splitSerials } from './new-lot-modal';

describe('new lot form helpers', () => {
  it('shows an example serial in the product’s format (the demo patterns of docs/architecture.md)', () => {
    expect(exampleSerial(String.raw`^K5A-\d{4}-\d{5}$`)).toBe('K5A-2649-00001');
    expect(exampleSerial(String.raw`^AB\.\d{4}\/\d{5}$`)).toBe('AB.2649/00001');
    expect(exampleSerial('^.*$')).toBe('');
  });

  it('splits a pasted list on commas, semicolons, spaces and line breaks', () => {
    expect(splitSerials('K5A-2649-00001,K5A-2649-00002;\nK5A-2649-00003  ')).toEqual(['K5A-2649-00001', 'K5A-2649-00002', 'K5A-2649-00003']);
  });

  it('sends only the fields of the chosen way of giving serials', () => {
    const base = { code: ' LB-2650-01 ', productId: 1, plannedQuantity: 2 };
    expect(createLotBody({ ...base, serials: { kind: 'next' } })).toEqual({ code: 'LB-2650-01', productId: 1, plannedQuantity: 2 });
    expect(createLotBody({ ...base, serials: { kind: 'list', serials: ['A', 'B'] } })).toEqual({ code: 'LB-2650-01', productId: 1, plannedQuantity: 2, serials: ['A', 'B'] });
  });
});
