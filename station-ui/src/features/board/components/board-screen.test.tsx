import { screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { FakeSocket, fireOn } from '@/testing/fake-socket';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import { sampleBoard } from '../test-data';
import { BoardScreen } from './board-screen';

const sockets: FakeSocket<string>[] = [];
vi.mock('@/lib/socket', () => ({
  connectLive: () => {
    const s = new FakeSocket({ record: (event) => event, ackRoom: () => 'board' });
    sockets.push(s);
    return s;
  },
}));

const fire = (event: string, payload: unknown) => fireOn(sockets[sockets.length - 1]!, event, payload);

describe('BoardScreen', () => {
  beforeEach(() => {
    sockets.length = 0;
    vi.stubGlobal('fetch', vi.fn(async () => jsonResponse(200, sampleBoard())));
  });
  afterEach(() => vi.unstubAllGlobals());

  it('shows every station with state, lot, last verdicts and shift figures', async () => {
    renderApp(<BoardScreen />, { signedInAs: makeUser(['operator']) });
    const one = await screen.findByTestId('tile-EOL-1');
    expect(one).toHaveTextContent('READY');
    expect(one).toHaveTextContent('LB-2648-01');
    expect(within(one).getByTestId('fpy-EOL-1')).toHaveTextContent('50.0%');
    const marks = within(one).getByRole('list', { name: 'Last verdicts, newest first' });
    expect(within(marks).getAllByRole('listitem').map((li) => li.getAttribute('data-verdict'))).toEqual(['fail', 'pass']);
    expect(marks).toHaveTextContent('FAIL K5A-2648-00012');
    const two = screen.getByTestId('tile-EOL-2');
    expect(two).toHaveTextContent('BLOCKED');
    expect(within(two).getByRole('alert')).toHaveTextContent('Calibration of FX-102 overdue since 3 Nov');
    expect(within(two).getByTestId('fpy-EOL-2')).toHaveTextContent('—');
  });

  it('joins the board room and follows a unit through its steps', async () => {
    renderApp(<BoardScreen />, { signedInAs: makeUser(['operator']) });
    await screen.findByTestId('tile-EOL-1');
    await fire('connect', undefined);
    expect(sockets[0]!.sent).toContain('board:join');
    await fire('run:started', {
      stationId: 1,
      emittedAt: 1,
      run: { id: 13, serial: 'K5A-2648-00013', startedAt: '2026-11-26T08:11:00.000Z' },
      unit: { serial: 'K5A-2648-00013' },
      steps: [
        { key: 'a', name: 'Input current at no load', kind: 'input_current_no_load', limits: [] },
        { key: 'b', name: 'Output voltage at no load', kind: 'vout_no_load', limits: [] },
      ],
    });
    await fire('step:started', { stationId: 1, emittedAt: 2, runId: 13, stepKey: 'b', stepIndex: 1 });
    const current = screen.getByTestId('current-EOL-1');
    expect(current).toHaveTextContent('K5A-2648-00013');
    expect(current).toHaveTextContent('Step 2 of 2: Output voltage at no load');
    expect(screen.getByTestId('tile-EOL-1')).toHaveTextContent('TESTING');
    await fire('run:finished', { stationId: 1, emittedAt: 3, runId: 13, verdict: 'error', failures: [], durationMs: 10, unit: { serial: 'K5A-2648-00013' } });
    await waitFor(() => expect(screen.getByTestId('current-EOL-1')).toHaveTextContent('No unit under test'));
    expect(screen.getByTestId('tile-EOL-1')).toHaveTextContent('ERROR K5A-2648-00013');
  });

  it('says so when the live link is lost', async () => {
    renderApp(<BoardScreen />, { signedInAs: makeUser(['operator']) });
    await screen.findByTestId('tile-EOL-1');
    await fire('disconnect', 'transport close');
    expect(screen.getByRole('status')).toHaveTextContent('Live link lost — reconnecting');
  });
});
