import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import type { RepairQueueItem } from '../api/repair-types';
import { RepairScreen } from './repair-screen';

const item = (over: Partial<RepairQueueItem>): RepairQueueItem => ({
  unitId: 1,
  serial: 'K5A-2648-00017',
  state: 'failed',
  testCount: 3,
  reason: 'no_attempts_left',
  sentToRepairAt: null,
  lot: { id: 2, code: 'LB-2648-01', partNumber: 'OB-BK0503' },
  lastFailingRun: {
    id: 40,
    station: { id: 1, code: 'EOL-1', name: 'End-of-line 1' },
    attempt: 3,
    failedStepKey: 'vout_nl',
    finishedAt: '2026-12-02T07:30:00.000Z',
    firstFailure: {
      stepKey: 'vout_nl',
      stepName: 'Output voltage, no load',
      quantity: 'voutV',
      name: 'Vout',
      value: 5.412,
      unit: 'V',
      lowLimit: 4.9,
      highLimit: 5.1,
      guardedLow: 4.91,
      guardedHigh: 5.09,
      verdict: 'fail',
    },
  },
  ...over,
});

let fetchMock: ReturnType<typeof vi.fn>;
let queueTotal = 2;
const queueRequests = () =>
  fetchMock.mock.calls.map(([u]) => new URL(String(u), 'http://x')).filter((u) => u.pathname === '/api/repair-queue');
const lastQueueParams = () => queueRequests().at(-1)!.searchParams;

beforeEach(() => {
  queueTotal = 2;
  fetchMock = vi.fn(async (input: RequestInfo | URL) => {
    const url = new URL(String(input), 'http://x');
    if (url.pathname === '/api/repair-queue') {
      return jsonResponse(200, {
        items: [item({}), item({ unitId: 2, serial: 'K5A-2648-00018', state: 'in_repair', reason: 'in_repair' })],
        total: queueTotal,
        steps: [{ key: 'vout_nl', name: 'Output voltage, no load' }],
      });
    }
    if (url.pathname === '/api/lots') return jsonResponse(200, [{ id: 2, code: 'LB-2648-01' }]);
    if (url.pathname === '/api/repair-records/pareto') return jsonResponse(200, { records: 0, bars: [] });
    if (url.pathname === '/api/repair-causes') return jsonResponse(200, []);
    if (url.pathname === '/api/auth/me') return jsonResponse(200, makeUser(['engineer']));
    return jsonResponse(404, { message: 'not here' });
  });
  vi.stubGlobal('fetch', fetchMock);
});
afterEach(() => vi.unstubAllGlobals());

describe('RepairScreen', { timeout: 20_000 }, () => {
  it('lists the queue with a readable state, failed step, value against limits, and the forms each state offers', async () => {
    renderApp(<RepairScreen />, { signedInAs: makeUser(['engineer']) });
    const table = await screen.findByRole('table', { name: 'Repair queue' });
    const [waiting, bench] = within(table).getAllByRole('row').slice(1);
    expect(waiting).toHaveTextContent('K5A-2648-00017');
    expect(waiting).toHaveTextContent('OB-BK0503');
    expect(waiting).toHaveTextContent('LB-2648-01');
    expect(within(waiting).getByText('Waiting')).toBeInTheDocument();
    expect(waiting).toHaveTextContent('no attempts left');
    expect(waiting).toHaveTextContent('Output voltage, no load');
    expect(waiting).toHaveTextContent('3 tests');
    expect(waiting).toHaveTextContent('5.412 V');
    expect(waiting).toHaveTextContent('4.900 … 5.100 V');
    expect(waiting).toHaveTextContent('EOL-1');
    expect(within(waiting).getByRole('button', { name: 'Receive K5A-2648-00017' })).toBeInTheDocument();
    expect(within(bench).getByText('On the bench')).toBeInTheDocument();
    expect(within(bench).queryByRole('button', { name: /Receive/ })).toBeNull();
    await screen.findByText('No repair records in this selection.');
  });

  it('links each serial to the unit history page (issue 12: serials were not links)', async () => {
    renderApp(<RepairScreen />, { signedInAs: makeUser(['engineer']) });
    const link = await screen.findByRole('link', { name: 'K5A-2648-00017' });
    expect(link).toHaveAttribute('href', '/units/K5A-2648-00017');
  });

  it('finds a unit from a scanned repair tag: keystrokes and Enter ask the server, any case, any part (issue 12)', async () => {
    const { user } = renderApp(<RepairScreen />, { signedInAs: makeUser(['engineer']) });
    const box = await screen.findByRole('textbox', { name: /Scan or type a serial/ });
    expect(box).toHaveFocus();
    await user.type(box, 'k5a-2648-00017{Enter}');
    await waitFor(() => expect(lastQueueParams().get('search')).toBe('k5a-2648-00017'));
    expect(lastQueueParams().get('offset')).toBe('0');
    // typing without Enter applies once the typing settles
    fireEvent.change(box, { target: { value: '00018' } });
    await waitFor(() => expect(lastQueueParams().get('search')).toBe('00018'));
  });

  it('filters by state, lot and failed step on the server (issue 12)', async () => {
    const { user } = renderApp(<RepairScreen />, { signedInAs: makeUser(['engineer']) });
    await screen.findByRole('table', { name: 'Repair queue' });
    await user.click(screen.getByLabelText('State', { selector: 'input' }));
    await user.click(await screen.findByRole('option', { name: 'On the bench' }));
    await waitFor(() => expect(lastQueueParams().get('state')).toBe('in_repair'));
    await user.click(screen.getByLabelText('Failed step', { selector: 'input' }));
    await user.click(await screen.findByRole('option', { name: 'Output voltage, no load' }));
    await waitFor(() => expect(lastQueueParams().get('step')).toBe('vout_nl'));
    await user.click(screen.getByLabelText('Lot', { selector: 'input' }));
    await user.click(await screen.findByRole('option', { name: 'LB-2648-01' }));
    await waitFor(() => expect(lastQueueParams().get('lotId')).toBe('2'));
  });

  it('sorts by a column heading on the server, ascending then descending (issue 12)', async () => {
    const { user } = renderApp(<RepairScreen />, { signedInAs: makeUser(['engineer']) });
    const table = await screen.findByRole('table', { name: 'Repair queue' });
    expect(lastQueueParams().get('sort')).toBe('failedAt');
    await user.click(within(table).getByRole('button', { name: 'Sort by serial' }));
    await waitFor(() => expect([lastQueueParams().get('sort'), lastQueueParams().get('dir')]).toEqual(['serial', 'asc']));
    expect(within(table).getByRole('columnheader', { name: /Serial/ })).toHaveAttribute('aria-sort', 'ascending');
    await user.click(within(table).getByRole('button', { name: 'Sort by serial, descending' }));
    await waitFor(() => expect(lastQueueParams().get('dir')).toBe('desc'));
  });

  it('pages 25 units at a time on the server (issue 12: 52 rows on one page)', async () => {
    queueTotal = 52;
    const { user } = renderApp(<RepairScreen />, { signedInAs: makeUser(['engineer']) });
    expect(await screen.findByTestId('repair-count')).toHaveTextContent('1–25 of 52 units · page 1 of 3');
    expect(lastQueueParams().get('limit')).toBe('25');
    await user.click(screen.getByRole('button', { name: '2' }));
    await waitFor(() => expect(lastQueueParams().get('offset')).toBe('25'));
    expect(await screen.findByTestId('repair-count')).toHaveTextContent('26–50 of 52 units · page 2 of 3');
  });

  it('opens the repair record form for a unit on the bench', async () => {
    const { user } = renderApp(<RepairScreen />, { signedInAs: makeUser(['engineer']) });
    await user.click(await screen.findByRole('button', { name: 'Record repair K5A-2648-00018' }));
    expect(await screen.findByRole('dialog', { name: 'Record repair: K5A-2648-00018' })).toBeInTheDocument();
  });
});
