import { describe, expect, it } from 'vitest';
import { runFiltersFromParams, runParamsFrom, runsQueryFrom } from './run-filters';

describe('run filters in the address', () => {
  it('round-trips through the query string and drops empty fields', () => {
    const { filters, page } = runFiltersFromParams(new URLSearchParams('station=2&verdict=fail&serial=%20K5A-2648-00002%20&page=3'));
    expect(filters).toMatchObject({ station: '2', verdict: 'fail', serial: 'K5A-2648-00002', lot: '', from: '' });
    expect(page).toBe(3);
    expect(runParamsFrom(filters, page).toString()).toBe('station=2&serial=K5A-2648-00002&verdict=fail&page=3');
  });

  it('turns the inclusive day range into the server window [from 00:00, day after to 00:00) in local time', () => {
    const q = runsQueryFrom({ station: '', lot: '', serial: '', verdict: '', from: '2026-03-02', to: '2026-03-04' }, 1);
    expect(q.from).toBe(new Date(2026, 2, 2).toISOString());
    expect(q.to).toBe(new Date(2026, 2, 5).toISOString());
  });

  it('keeps a sort other than newest first in the address and the query; ignores an unknown column (issue 12)', () => {
    const { filters, sort } = runFiltersFromParams(new URLSearchParams('sort=serial&dir=desc'));
    expect(sort).toEqual({ sort: 'serial', dir: 'desc' });
    expect(runParamsFrom(filters, 1, sort).toString()).toBe('sort=serial&dir=desc');
    expect(runsQueryFrom(filters, 1, sort)).toMatchObject({ sort: 'serial', dir: 'desc' });
    expect(runFiltersFromParams(new URLSearchParams('sort=password&dir=asc')).sort).toEqual({ sort: 'startedAt', dir: 'desc' });
    expect(runFiltersFromParams(new URLSearchParams('sort=lot')).sort).toEqual({ sort: 'lot', dir: 'asc' });
    expect(runsQueryFrom(filters, 1)).not.toHaveProperty('sort');
  });

  it('sends nothing malformed: bad ids, verdicts and dates are left out; page sets the offset', () => {
    const q = runsQueryFrom({ station: 'x', lot: '0', serial: ' ', verdict: 'great', from: '2026-13', to: '' }, 2);
    expect(q).toEqual({ stationId: undefined, lotId: undefined, serial: undefined, verdict: undefined, from: undefined, to: undefined, limit: 50, offset: 50 });
  });
});
