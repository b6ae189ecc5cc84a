import { act, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { FakeSocket, fireOn } from '@/testing/fake-socket';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import type { Hold, HoldAlert, HoldRule, OutboxMessage } from '../api/types';
import { HoldsScreen } from './holds-screen';

const sockets: FakeSocket<string>[] = [];
vi.mock('@/lib/socket', () => ({
  connectLive: () => {
    const s = new FakeSocket({ record: (event) => event, ackRoom: () => 'board' });
    sockets.push(s);
    return s;
  },
}));

const hold: Hold = {
  id: 7,
  lotId: 3,
  lotCode: 'LB-2649-01',
  lotState: 'on_hold',
  partNumber: 'OB-BK0503',
  ruleId: 2,
  ruleDescription: 'Hold after 3 failed tests in a row at one station',
  reason: '3 failed tests in a row at station EOL-1',
  figures: { failuresInRow: 3, stationCode: 'EOL-1' },
  runId: 41,
  serial: 'K5A-2649-00012',
  stationCode: 'EOL-1',
  heldAt: '2026-12-02T10:00:00.000Z',
  liftedAt: null,
  liftedByName: null,
  liftReason: null,
};
const rule: HoldRule = {
  id: 2,
  productId: 1,
  partNumber: 'OB-BK0503',
  kind: 'consecutive_failures',
  description: 'Hold after 3 failed tests in a row at one station',
  windowUnits: null,
  minFpyPct: null,
  minCpk: null,
  stepKey: null,
  quantity: null,
  ruleSet: null,
  failuresInRow: 3,
  active: true,
  createdByName: 'Quality engineer',
  createdAt: '2026-12-01T09:00:00.000Z',
  switchedOffAt: null,
};
const alert: HoldAlert = { id: 5, kind: 'hold', at: hold.heldAt, message: 'Lot LB-2649-01 is on hold: 3 failed tests in a row at station EOL-1', ruleId: 2, ruleDescription: rule.description, lotCode: hold.lotCode, runId: 41, holdId: 7, figures: null };
const mail: OutboxMessage = {
  id: 9,
  to: 'quality@orrinbay.example',
  subject: 'Lot LB-2649-01 (OB-BK0503) is on hold',
  body: '…',
  status: 'failed',
  attempts: 3,
  lastError: 'connect ECONNREFUSED 127.0.0.1:25',
  createdAt: hold.heldAt,
  lastAttemptAt: hold.heldAt,
  sentAt: null,
  alertId: 5,
};

let activeHolds: Hold[];
let fetchMock: ReturnType<typeof vi.fn>;

beforeEach(() => {
  sockets.length = 0;
  activeHolds = [hold];
  fetchMock = vi.fn(async (url: string, init?: RequestInit) => {
    const u = new URL(url, 'http://x');
    if (u.pathname === '/api/holds') return jsonResponse(200, activeHolds);
    if (u.pathname === '/api/holds/7/lift') {
      const body = JSON.parse(String(init?.body));
      activeHolds = [];
      return jsonResponse(200, { ...hold, lotState: 'open', liftedAt: '2026-12-02T11:00:00.000Z', liftReason: body.reason });
    }
    if (u.pathname === '/api/hold-rules') return jsonResponse(200, [rule]);
    if (u.pathname === '/api/products') return jsonResponse(200, [{ id: 1, partNumber: 'OB-BK0503', name: 'Buck module', active: true }]);
    if (u.pathname === '/api/hold-alerts') return jsonResponse(200, [alert]);
    if (u.pathname === '/api/outbox') return jsonResponse(200, [mail]);
    return jsonResponse(404, { message: 'not here' });
  });
  vi.stubGlobal('fetch', fetchMock);
});
afterEach(() => vi.unstubAllGlobals());

describe('HoldsScreen', () => {
  it('shows the held lot with its reason, rule, figures and the run that tripped it', async () => {
    renderApp(<HoldsScreen />, { signedInAs: makeUser(['quality']) });
    const card = await screen.findByRole('article', { name: 'Lot LB-2649-01 on hold' });
    expect(card).toHaveTextContent('3 failed tests in a row at station EOL-1');
    expect(card).toHaveTextContent('Rule: Hold after 3 failed tests in a row at one station');
    expect(card).toHaveTextContent('3 failures in a row at EOL-1');
    expect(within(card).getByRole('link', { name: 'run 41' })).toHaveAttribute('href', '/runs/41');
    expect(await screen.findByRole('table', { name: 'Hold rules' })).toHaveTextContent('Watching');
  });

  it('lets quality lift a hold only with a reason and a confirmation', async () => {
    const { user } = renderApp(<HoldsScreen />, { signedInAs: makeUser(['quality']) });
    await user.click(await screen.findByRole('button', { name: 'Lift hold' }));
    const dialog = await screen.findByRole('dialog', { name: 'Lift the hold on lot LB-2649-01' });
    await user.click(within(dialog).getByRole('button', { name: 'Lift hold' }));
    expect(within(dialog).getByText(/Say in a few words why testing may go on/)).toBeInTheDocument();
    expect(within(dialog).getByText(/Tick this to confirm/)).toBeInTheDocument();
    expect(fetchMock.mock.calls.some(([url]) => String(url).includes('/lift'))).toBe(false);

    await user.type(within(dialog).getByLabelText(/Why may testing go on/), 'Reel 7 of the feedback resistors replaced');
    await user.click(within(dialog).getByLabelText(/I confirm that testing of lot LB-2649-01 may go on/));
    await user.click(within(dialog).getByRole('button', { name: 'Lift hold' }));
    await waitFor(() => expect(fetchMock.mock.calls.some(([url]) => String(url).includes('/api/holds/7/lift'))).toBe(true));
    const call = fetchMock.mock.calls.find(([url]) => String(url).includes('/lift'))!;
    expect(JSON.parse(String((call[1] as RequestInit).body))).toEqual({ reason: 'Reel 7 of the feedback resistors replaced' });
    expect(await screen.findByText(/No lot is on hold/)).toBeInTheDocument();
  }, 20_000);

  it('does not offer lifting to an engineer', async () => {
    renderApp(<HoldsScreen />, { signedInAs: makeUser(['engineer']) });
    const card = await screen.findByRole('article', { name: 'Lot LB-2649-01 on hold' });
    expect(within(card).queryByRole('button', { name: 'Lift hold' })).toBeNull();
    expect(card).toHaveTextContent('Only quality can lift a hold');
  });

  it('shows a new hold when a station state arrives, without a reload', async () => {
    activeHolds = [];
    renderApp(<HoldsScreen />, { signedInAs: makeUser(['quality']) });
    await screen.findByText(/No lot is on hold/);
    activeHolds = [hold];
    await waitFor(() => expect(sockets.length).toBeGreaterThan(0));
    await act(async () => fireOn(sockets[sockets.length - 1]!, 'station:state', { stationId: 1, state: 'blocked', reasons: ['Lot LB-2649-01 is on hold: x'], emittedAt: 0 }));
    expect(await screen.findByRole('article', { name: 'Lot LB-2649-01 on hold' }, { timeout: 3000 })).toBeInTheDocument();
  });

  it('lists alerts and the outbox with the delivery error', async () => {
    const { user } = renderApp(<HoldsScreen />, { signedInAs: makeUser(['quality']) });
    await user.click(await screen.findByRole('tab', { name: 'Alerts' }));
    expect(await screen.findByRole('table', { name: 'Alerts' })).toHaveTextContent('Lot held');
    await user.click(screen.getByRole('tab', { name: 'Outbox' }));
    const outbox = await screen.findByRole('table', { name: 'Outbox' });
    expect(outbox).toHaveTextContent('quality@orrinbay.example');
    expect(outbox).toHaveTextContent('Not sent');
    expect(outbox).toHaveTextContent('connect ECONNREFUSED 127.0.0.1:25');
  }, 15_000);
});
