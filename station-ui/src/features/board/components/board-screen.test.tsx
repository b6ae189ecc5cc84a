import { screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { BOARD_DISPLAY_TOKEN_KEY } from '../board-display';
import { FakeSocket, fireOn } from '@/testing/fake-socket';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import { meQueryKey } from '@/lib/auth';
import { minutesFromNow, sampleBoard } from '../test-data';
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
  afterEach(() => {
    vi.unstubAllGlobals();
    window.localStorage.removeItem(BOARD_DISPLAY_TOKEN_KEY);
  });

  it('shows every station with state, lot, last verdicts and shift figures', async () => {
    const board = sampleBoard();
    // a week old: not this shift's, so not among "Last units"
    board[0]!.lastRuns.push({ id: 3, serial: 'K5A-2648-00003', verdict: 'pass', failedStepKey: null, finishedAt: minutesFromNow(-7 * 24 * 60) });
    vi.stubGlobal('fetch', vi.fn(async () => jsonResponse(200, board)));
    renderApp(<BoardScreen />, { signedInAs: makeUser(['operator']) });
    const one = await screen.findByTestId('tile-EOL-1');
    expect(one).toHaveTextContent('READY');
    expect(one).toHaveTextContent('LB-2648-01');
    expect(within(one).getByTestId('fpy-EOL-1')).toHaveTextContent('50.0%');
    const marks = within(one).getByRole('list', { name: 'Last verdicts, newest first' });
    expect(within(marks).getAllByRole('listitem').map((li) => li.getAttribute('data-verdict'))).toEqual(['fail', 'pass']);
    expect(marks).toHaveTextContent('FAIL K5A-2648-00012');
    // each unit with its time; the week-old unit is not this shift's and stays off the board
    expect(within(marks).getAllByTestId('recent-time')[0]!.textContent).toMatch(/^\d\d:\d\d$/);
    expect(one).not.toHaveTextContent('K5A-2648-00003');
    const two = screen.getByTestId('tile-EOL-2');
    expect(two).toHaveTextContent('BLOCKED');
    expect(within(two).getByRole('alert')).toHaveTextContent('Calibration of FX-102 overdue since 3 Nov');
    expect(within(two).getByTestId('fpy-EOL-2')).toHaveTextContent('—');
  });

  it('shows warnings as a heads-up on a station that still tests', async () => {
    const board = sampleBoard();
    Object.assign(board[0]!, { warnings: ['Contact cycles at 92 % (46,000 of 50,000); plan a probe change'] });
    vi.stubGlobal('fetch', vi.fn(async () => jsonResponse(200, board)));
    renderApp(<BoardScreen />, { signedInAs: makeUser(['operator']) });
    const one = await screen.findByTestId('tile-EOL-1');
    expect(one).toHaveTextContent('READY');
    expect(within(one).getByRole('note', { name: 'Heads-up' })).toHaveTextContent('Contact cycles at 92 % (46,000 of 50,000); plan a probe change');
    expect(within(one).queryByRole('alert')).toBeNull();
    expect(screen.queryByTestId('warnings-EOL-2')).toBeNull();
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

  it('signs in again when the server drops the live link with auth:error (regression: the board ignored it)', async () => {
    const { queryClient } = renderApp(<BoardScreen />, { signedInAs: makeUser(['operator']) });
    await screen.findByTestId('tile-EOL-1');
    await fire('connect', undefined);
    // the shell asks who is signed in; the server's 401 then leads to the sign-in page
    await fire('auth:error', { message: 'Your session has ended.' });
    expect(queryClient.getQueryState(meQueryKey)?.isInvalidated).toBe(true);
  });

  it('shows the board with a display link\'s token, never the sign-in page, and says when the link expired', async () => {
    const fetchMock = vi.fn(async () => jsonResponse(200, sampleBoard()));
    vi.stubGlobal('fetch', fetchMock);
    renderApp(<BoardScreen displayToken="board-only-token" />);
    await screen.findByTestId('tile-EOL-1');
    const [, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect((init.headers as Record<string, string>).Authorization).toBe('Bearer board-only-token');
    await fire('connect', undefined);
    await fire('auth:error', { message: 'Token expired' });
    expect(await screen.findByRole('alert')).toHaveTextContent('Board link expired — ask an administrator for a new one');
    expect(screen.queryByTestId('tile-EOL-1')).toBeNull();
  });

  it('says the link expired when the board itself is refused with the display token', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => jsonResponse(401, { statusCode: 401, error: 'Unauthorized', message: 'Token expired' })));
    renderApp(<BoardScreen displayToken="old-token" />);
    expect(await screen.findByRole('alert')).toHaveTextContent('Board link expired — ask an administrator for a new one');
  });
});
