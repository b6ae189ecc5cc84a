import { screen, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import type { RepairQueueItem } from '../api/get-repair-queue';
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

beforeEach(() => {
  vi.stubGlobal(
    'fetch',
    vi.fn(async () => jsonResponse(200, { items: [item({}), item({ unitId: 2, serial: 'K5A-2648-00018', state: 'in_repair' })], total: 2 })),
  );
});
afterEach(() => vi.unstubAllGlobals());

describe('RepairScreen', () => {
  it('lists the queue with state, failed step, value against limits, and the steps each state allows', async () => {
    const { user } = renderApp(<RepairScreen />, { signedInAs: makeUser(['engineer']) });
    const table = await screen.findByRole('table', { name: 'Repair queue' });
    const [waiting, bench] = within(table).getAllByRole('row').slice(1);
    expect(waiting).toHaveTextContent('K5A-2648-00017');
    expect(waiting).toHaveTextContent('OB-BK0503');
    expect(waiting).toHaveTextContent('LB-2648-01');
    expect(waiting).toHaveTextContent('Waiting');
    expect(waiting).toHaveTextContent('Output voltage, no load: Vout');
    expect(waiting).toHaveTextContent('5.412 V');
    expect(waiting).toHaveTextContent('4.900 … 5.100 V');
    expect(waiting).toHaveTextContent('EOL-1');
    expect(within(waiting).getByRole('button', { name: 'Receive K5A-2648-00017' })).toBeInTheDocument();
    expect(within(waiting).queryByRole('button', { name: /Return for retest/ })).toBeNull();
    expect(bench).toHaveTextContent('On the bench');
    expect(within(bench).getByRole('button', { name: 'Return for retest K5A-2648-00018' })).toBeInTheDocument();

    await user.click(within(bench).getByRole('button', { name: 'Scrap K5A-2648-00018' }));
    expect(await screen.findByRole('dialog', { name: 'Scrap this unit: K5A-2648-00018' })).toBeInTheDocument();
  });
});
