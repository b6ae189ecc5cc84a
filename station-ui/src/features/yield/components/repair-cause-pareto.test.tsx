import { screen, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import { emptyYieldFilters } from '../api/yield-filters';
import { RepairCausePareto } from './repair-cause-pareto';

let fetchMock: ReturnType<typeof vi.fn>;

beforeEach(() => {
  fetchMock = vi.fn(async () =>
    jsonResponse(200, {
      records: 7,
      bars: [
        { key: 'Solder bridge', label: 'Solder bridge', causeId: 1, count: 4, percent: (100 * 4) / 7, cumulativeCount: 4, cumulativePercent: (100 * 4) / 7 },
        { key: 'Cracked inductor', label: 'Cracked inductor', causeId: 2, count: 2, percent: (100 * 2) / 7, cumulativeCount: 6, cumulativePercent: (100 * 6) / 7 },
        { key: 'Cold joint', label: 'Cold joint', causeId: 3, count: 1, percent: 100 / 7, cumulativeCount: 7, cumulativePercent: 100 },
      ],
    }),
  );
  vi.stubGlobal('fetch', fetchMock);
});
afterEach(() => vi.unstubAllGlobals());

describe('RepairCausePareto (Quality screen)', { timeout: 20_000 }, () => {
  it('lists causes with counts and cumulative percentages for the lot, product and dates, not the station', async () => {
    renderApp(<RepairCausePareto filters={{ ...emptyYieldFilters, lotId: '3', stationId: '1', from: '2026-01-01' }} />, { signedInAs: makeUser(['quality']) });
    const table = await screen.findByRole('table', { name: 'Pareto by repair cause' });
    const rows = within(table).getAllByRole('row').slice(1);
    // self-constructed example: 4, 2, 1 of 7 → 57.1 %, 85.7 %, 100 % cumulative
    expect(rows.map((r) => r.textContent)).toEqual(['Solder bridge457.1 %57.1 %', 'Cracked inductor228.6 %85.7 %', 'Cold joint114.3 %100.0 %']);
    const url = new URL(String(fetchMock.mock.calls[0][0]), 'http://x');
    expect(url.pathname).toBe('/api/repair-records/pareto');
    expect(Object.fromEntries(url.searchParams)).toEqual({ lotId: '3', from: '2026-01-01' });
    expect(screen.getByText(/the station filter does not apply to repairs/)).toBeInTheDocument();
  });
});
