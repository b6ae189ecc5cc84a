import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { Route, Routes, useLocation } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import type { AuditEntry } from '../api/audit-types';
import { AuditScreen } from './audit-screen';

const entry = (over: Partial<AuditEntry>): AuditEntry => ({
  id: 1,
  at: '2026-12-02T08:00:00.000Z',
  actorId: 2,
  actorName: 'engineer',
  actorDisplayName: 'Test engineer',
  action: 'plan_version.edited',
  what: 'Changed the high limit of Output voltage at 1.5 A in EOL-BK3305 version 4 from 3.35 V to 3.36 V',
  entityType: 'plan_version',
  entityId: '9',
  reason: 'pilot build data',
  before: null,
  after: null,
  changes: [{ field: 'High limit of Output voltage at 1.5 A', before: '3.35 V', after: '3.36 V' }],
  link: { kind: 'plan_version', id: '9', label: 'EOL-BK3305 version 4', planId: 3 },
  ...over,
});

const items = [
  entry({}),
  entry({ id: 2, action: 'unit.scrapped', what: 'Scrapped unit K5A-2649-00017', entityType: 'unit', entityId: '4', reason: 'burnt inductor', changes: [], link: { kind: 'unit', id: '4', label: 'K5A-2649-00017', serial: 'K5A-2649-00017' } }),
];

let fetchMock: ReturnType<typeof vi.fn>;

function Probe() {
  const loc = useLocation();
  return <output data-testid="location">{loc.pathname + loc.search}</output>;
}

function renderScreen(route = '/audit') {
  return renderApp(
    <>
      <Routes>
        <Route path="/audit" element={<AuditScreen />} />
        <Route path="/units/:serial" element={<p>unit history page</p>} />
      </Routes>
      <Probe />
    </>,
    { route, signedInAs: makeUser(['quality']) },
  );
}

const requested = (path: string) => fetchMock.mock.calls.map(([u]) => new URL(String(u), 'http://x')).filter((u) => u.pathname === path);

beforeEach(() => {
  fetchMock = vi.fn(async (input: RequestInfo | URL) => {
    const url = new URL(String(input), 'http://x');
    if (url.pathname === '/api/audit') return jsonResponse(200, { items, total: 2 });
    if (url.pathname === '/api/audit/choices') return jsonResponse(200, { entityTypes: [{ type: 'unit', words: 'unit' }], users: [{ username: 'engineer', displayName: 'Test engineer' }] });
    return jsonResponse(404, { message: 'not here' });
  });
  vi.stubGlobal('fetch', fetchMock);
});

afterEach(() => vi.unstubAllGlobals());

describe('AuditScreen', { timeout: 20_000 }, () => {
  it('shows when, who, what in words and why, with a link to the object', async () => {
    renderScreen();
    const table = await screen.findByRole('table', { name: 'Audit records' });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(2);
    expect(rows[0]).toHaveTextContent('Test engineer');
    expect(rows[0]).toHaveTextContent('pilot build data');
    expect(within(rows[0]).getByRole('link', { name: /Changed the high limit/ })).toHaveAttribute('href', '/plans?plan=3&version=9');
    expect(within(rows[1]).getByRole('link', { name: 'Scrapped unit K5A-2649-00017' })).toHaveAttribute('href', '/units/K5A-2649-00017');
    expect(table).not.toHaveTextContent('plan_version.edited');
  });

  it('expands a record to its before and after', async () => {
    renderScreen();
    const show = await screen.findByRole('button', { name: 'Show before and after of record 1' });
    fireEvent.click(show);
    const list = screen.getByLabelText('Before and after');
    expect(list).toHaveTextContent('High limit of Output voltage at 1.5 A');
    expect(list).toHaveTextContent('3.35 V → 3.36 V');
    expect(screen.getByRole('button', { name: 'Hide before and after of record 1' })).toHaveAttribute('aria-expanded', 'true');
  });

  it('sends the filters from the address to the server and keeps new ones in the address', async () => {
    renderScreen('/audit?type=unit&id=k5a-2649-00017&from=2026-12-01&to=2026-12-01');
    await screen.findByRole('table', { name: 'Audit records' });
    const q = requested('/api/audit').at(-1)!.searchParams;
    expect(q.get('entityType')).toBe('unit');
    expect(q.get('entityId')).toBe('k5a-2649-00017');
    expect(q.get('from')).toBe(new Date(2026, 11, 1).toISOString());
    expect(q.get('to')).toBe(new Date(2026, 11, 2).toISOString());
    fireEvent.change(screen.getByRole('textbox', { name: /Search/ }), { target: { value: 'inductor' } });
    fireEvent.click(screen.getByRole('button', { name: 'Show' }));
    await waitFor(() => expect(screen.getByTestId('location')).toHaveTextContent('q=inductor'));
    await waitFor(() => expect(requested('/api/audit').at(-1)!.searchParams.get('q')).toBe('inductor'));
  });

  it('refuses a reversed date range on the page, without asking the server', async () => {
    renderScreen('/audit?from=2026-12-05&to=2026-12-01');
    expect(await screen.findByRole('alert')).toHaveTextContent('The first day is after the last day.');
    expect(requested('/api/audit')).toHaveLength(0);
  });
});
