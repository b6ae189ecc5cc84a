import { act, screen, waitFor, within } from '@testing-library/react';
import type { MeasurementJudgedPayload, RunFinishedPayload, RunStartedPayload, StationStatePayload } from '@station-events';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { FakeSocket, fireOn } from '@/testing/fake-socket';
import { meQueryKey } from '@/lib/auth';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import { measurementFor, sampleRun, sampleSteps, sampleUnit } from '../test-data';
import { StationScreen } from './station-screen';

const sockets: FakeSocket<{ event: string; body: unknown }>[] = [];
vi.mock('@/lib/socket', () => ({
  connectLive: () => {
    const s = new FakeSocket({
      record: (event, body) => ({ event, body }),
      ackRoom: (body) => `station:${(body as { stationId?: number }).stationId}`,
    });
    sockets.push(s);
    return s;
  },
}));

const station = {
  id: 1,
  code: 'EOL-1',
  name: 'End-of-line 1',
  location: 'Line B',
  active: true,
  fixture: { id: 1, code: 'FX-101' },
  activeLot: { id: 6, code: 'LB-2648-01', partNumber: 'OB-BK0503' },
  state: 'ready',
  reasons: [],
};
const status = {
  stationId: 1,
  stationCode: 'EOL-1',
  stationName: 'End-of-line 1',
  state: 'ready',
  reasons: [],
  fixture: { id: 1, code: 'FX-101', calibrationDueAt: '2027-01-01T00:00:00.000Z', contactCyclesUsed: 10, contactCyclesAllowed: 50000 },
  activeLot: { id: 6, code: 'LB-2648-01', partNumber: 'OB-BK0503', state: 'open' },
};
const shift = {
  stationId: 1,
  shiftName: 'Early',
  shiftStart: '2026-11-26T06:00:00.000Z',
  shiftEnd: '2026-11-26T14:00:00.000Z',
  tested: 12,
  passed: 11,
  failed: 1,
  errors: 0,
  aborted: 0,
  firstPassYieldPct: 91.66666,
  unitsPerHour: 24.2,
};
const scanResult = {
  unit: sampleUnit,
  lot: { id: 6, code: 'LB-2648-01', state: 'open' },
  product: { id: 1, partNumber: 'OB-BK0503', name: 'Buck module 12 V to 5 V, 3 A', vinNomV: 12, voutNomV: 5, ioutRatedA: 3 },
  attempt: 1,
  plan: { versionId: 1, code: 'EOL-BK0503', name: 'End-of-line test', version: 1, stopAtFirstFailure: false, maxAttempts: 3, steps: sampleSteps },
};

interface Call {
  method: string;
  path: string;
  body: unknown;
}

let calls: Call[];
let now: number;

function serve() {
  calls = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string, init?: RequestInit) => {
      const path = new URL(url, 'http://localhost').pathname;
      const method = init?.method ?? 'GET';
      const body = init?.body ? JSON.parse(String(init.body)) : undefined;
      calls.push({ method, path, body });
      if (method === 'GET' && path === '/api/stations') return jsonResponse(200, [station]);
      if (method === 'GET' && path === '/api/stations/1/status') return jsonResponse(200, status);
      if (method === 'GET' && path === '/api/stations/1/shift-summary') return jsonResponse(200, shift);
      if (method === 'POST' && path === '/api/stations/1/scan') {
        const serial = (body as { serial: string }).serial;
        if (serial === 'K5A-2648-00017') return jsonResponse(200, scanResult);
        if (serial === 'K5A-2648-00018') return jsonResponse(200, { ...scanResult, unit: { ...sampleUnit, id: 8, serial } });
        if (serial === 'K5A-2648-00021') {
          // a slow check: the next label arrives before its answer
          await new Promise((r) => setTimeout(r, 300));
          return jsonResponse(200, { ...scanResult, unit: { ...sampleUnit, id: 21, serial } });
        }
        if (serial === 'K5A-2648-00019') return jsonResponse(200, { ...scanResult, attempt: 3, unit: { ...sampleUnit, id: 9, serial, state: 'failed', testCount: 2 } });
        if (serial === 'K5A-2648-00020') {
          return jsonResponse(409, { statusCode: 409, error: 'Conflict', message: 'K5A-2648-00020 has been scrapped; it cannot be tested again. Set it aside.', details: { code: 'unit_not_testable', unitState: 'scrapped' } });
        }
        if (serial === 'K5A-2648-00003') {
          return jsonResponse(409, { statusCode: 409, error: 'Conflict', message: 'x', details: { code: 'already_passed' } });
        }
        if (serial === 'K5A-2647-00005') {
          return jsonResponse(409, {
            statusCode: 409,
            error: 'Conflict',
            message: 'x',
            details: { code: 'wrong_lot', unitLot: 'LB-2647-02', activeLot: 'LB-2648-01' },
          });
        }
        return jsonResponse(404, { statusCode: 404, error: 'Not Found', message: 'x', details: { code: 'unknown_serial' } });
      }
      if (method === 'POST' && path === '/api/stations/1/runs') return jsonResponse(201, { run: sampleRun });
      if (method === 'GET' && path === '/api/plan-versions/1') return jsonResponse(200, { id: 1, maxAttempts: 3 });
      if (method === 'POST' && path === '/api/units/K5A-2648-00017/send-to-repair') {
        return jsonResponse(200, { ...sampleUnit, state: 'failed', testCount: 1 });
      }
      if (method === 'GET' && path === '/api/runs/41/repair-tag.pdf') {
        return new Response('%PDF-1.7 tag', { status: 200, headers: { 'Content-Type': 'application/pdf' } });
      }
      if (method === 'POST' && path === '/api/runs/41/abort') return jsonResponse(200, { runId: 41, verdict: 'aborted' });
      return jsonResponse(404, { statusCode: 404, error: 'Not Found', message: `no route ${method} ${path}` });
    }),
  );
}

const live = () => sockets[sockets.length - 1]!;
const fire = (event: string, payload: unknown) => fireOn(live(), event, payload);

async function openStation(roles: Parameters<typeof makeUser>[0] = ['operator']) {
  window.localStorage.setItem('railwright.station.id', '1');
  const r = renderApp(<StationScreen />, { route: '/station', signedInAs: makeUser(roles) });
  const field = await screen.findByRole('textbox', { name: 'Serial' });
  // READY only once the live link is up
  await waitFor(() => expect(sockets.length).toBeGreaterThan(0));
  await fire('connect', undefined);
  await screen.findByTestId('ready-prompt');
  await waitFor(() => expect(field).toHaveFocus());
  return { ...r, field };
}

describe('StationScreen', () => {
  beforeEach(() => {
    sockets.length = 0;
    serve();
    now = 100_000;
    // the safety prompt ignores keys in its first moments; the test moves this clock past that
    vi.spyOn(performance, 'now').mockImplementation(() => now);
  });
  afterEach(() => {
    vi.unstubAllGlobals();
  });

  it('asks which station this is the first time, and remembers the answer', async () => {
    const { user } = renderApp(<StationScreen />, { route: '/station', signedInAs: makeUser(['operator']) });
    await screen.findByRole('heading', { name: 'Which station is this?' });
    const choice = await screen.findByRole('button', { name: /EOL-1/ });
    await waitFor(() => expect(choice).toHaveFocus());
    await user.keyboard('{Enter}');
    expect(window.localStorage.getItem('railwright.station.id')).toBe('1');
    expect(await screen.findByTestId('station-code')).toHaveTextContent('EOL-1');
    expect(screen.getByTestId('active-lot')).toHaveTextContent('LB-2648-01');
    await fire('connect', undefined);
    expect(live().sent).toContainEqual({ event: 'station:join', body: { stationId: 1 } });
  });

  it('shows the shift counters of this station', async () => {
    await openStation();
    expect(await screen.findByTestId('shift-tested')).toHaveTextContent('12');
    expect(screen.getByTestId('shift-fpy')).toHaveTextContent('91.7 %');
  });

  it('an unknown serial is refused in plain words, starts nothing, and the field keeps focus', async () => {
    const { user, field } = await openStation();
    await user.type(field, 'K5A-2648-99999{Enter}');
    const refusal = await screen.findByTestId('refusal');
    expect(refusal).toHaveTextContent('Unknown serial');
    expect(refusal).toHaveTextContent('K5A-2648-99999 is not registered');
    expect(calls.some((c) => c.path === '/api/stations/1/runs')).toBe(false);
    expect(screen.queryByRole('dialog')).toBeNull();
    await waitFor(() => expect(field).toHaveFocus());
    expect(field).toHaveValue('');
  });

  it("a unit of another lot is refused naming both lots", async () => {
    const { user, field } = await openStation();
    await user.type(field, 'K5A-2647-00005{Enter}');
    expect(await screen.findByTestId('refusal')).toHaveTextContent('belongs to lot LB-2647-02, but this station is testing lot LB-2648-01');
  });

  it('Esc on the safety prompt cancels: no power, focus back on the scan field', async () => {
    const { user, field } = await openStation();
    await user.type(field, 'K5A-2648-00017{Enter}');
    const dialog = await screen.findByRole('dialog', { name: 'Before power is applied' });
    now += 1_000;
    await user.keyboard('{Escape}');
    await waitFor(() => expect(dialog).not.toBeInTheDocument());
    expect(screen.queryByTestId('refusal')).toBeNull();
    await waitFor(() => expect(field).toHaveFocus());
    expect(calls.some((c) => c.path === '/api/stations/1/runs')).toBe(false);
  });

  it('scan → F9 on the prompt (Enter does nothing) → steps stream in → FAIL with the failing value and what to do', async () => {
    const { user, field } = await openStation();
    await user.type(field, 'K5A-2648-00017{Enter}');
    const dialog = await screen.findByRole('dialog', { name: 'Before power is applied' });
    expect(dialog).toHaveTextContent('Attempt 1 of 3');
    now += 1_000;
    // Enter and Space never apply power (a scanner sends them); the prompt says which key does
    await user.keyboard('{Enter} ');
    expect(calls.some((c) => c.path === '/api/stations/1/runs')).toBe(false);
    expect(within(dialog).getByRole('status')).toHaveTextContent('Enter does not apply power. Press F9');
    now += 1_000;
    await user.keyboard('{F9}');
    await waitFor(() => expect(calls).toContainEqual({ method: 'POST', path: '/api/stations/1/runs', body: { serial: 'K5A-2648-00017', safetyConfirmed: true } }));
    await waitFor(() => expect(field).toHaveFocus());

    const started: RunStartedPayload = { stationId: 1, emittedAt: Date.now(), run: sampleRun, unit: sampleUnit, steps: sampleSteps };
    await fire('run:started', started);
    const table = await screen.findByRole('table', { name: 'Test steps' });
    expect(within(table).getAllByRole('row')).toHaveLength(6);
    expect(screen.getByTestId('testing-serial')).toHaveTextContent('K5A-2648-00017');

    await fire('step:started', { stationId: 1, emittedAt: Date.now(), runId: 41, stepKey: 'iin-no-load', stepIndex: 0 });
    expect(screen.getByText(/Step 1 of 3/)).toBeInTheDocument();
    const ok = measurementFor(0, 'iinNoLoadMa', 8.1);
    await fire('measurement:judged', { stationId: 1, emittedAt: Date.now(), runId: 41, stepKey: ok.stepKey, measurement: ok } satisfies MeasurementJudgedPayload);
    const bad = measurementFor(1, 'voutV@3', 4.612, 'fail');
    await fire('measurement:judged', { stationId: 1, emittedAt: Date.now(), runId: 41, stepKey: bad.stepKey, measurement: bad } satisfies MeasurementJudgedPayload);
    expect(screen.getByTestId('row-vout-load|voutV@3')).toHaveTextContent('4.612V');

    const finished: RunFinishedPayload = {
      stationId: 1,
      emittedAt: Date.now(),
      runId: 41,
      verdict: 'fail',
      failedStepKey: 'vout-load',
      failures: [bad],
      durationMs: 8_400,
      unit: { ...sampleUnit, state: 'failed', testCount: 1 },
    };
    await fire('run:finished', finished);
    const verdict = await screen.findByTestId('verdict');
    expect(within(verdict).getByTestId('verdict-word')).toHaveTextContent('FAIL');
    expect(verdict).toHaveTextContent('Output voltage at 3 A: 4.612 V, limits 4.900 … 5.100 V');
    expect(within(verdict).getByTestId('verdict-attempt')).toHaveTextContent('attempt 1 of 3');
    // attempts left: the unit stays here, and the panel does not claim it is on the repair queue
    expect(within(verdict).getByTestId('verdict-advice')).toHaveTextContent('2 attempts left: re-seat the unit and test it again, or send it to repair.');
    expect(verdict).not.toHaveTextContent('repair queue');
    expect(within(verdict).getByRole('button', { name: /Print repair tag/ })).toBeInTheDocument();
    await user.click(within(verdict).getByRole('button', { name: 'Send to repair' }));
    await waitFor(() => expect(calls).toContainEqual({ method: 'POST', path: '/api/units/K5A-2648-00017/send-to-repair', body: {} }));
    await waitFor(() => expect(within(verdict).getByTestId('verdict-advice')).toHaveTextContent('Sent to the repair queue'));
    expect(within(verdict).queryByRole('button', { name: 'Send to repair' })).toBeNull();
    await waitFor(() => expect(field).toHaveFocus());
    // the shift counters are asked again after a verdict
    await waitFor(() => expect(calls.filter((c) => c.path === '/api/stations/1/shift-summary').length).toBeGreaterThan(1));

    // the verdict stays until the next scan
    await user.type(field, 'K5A-2648-99999{Enter}');
    await screen.findByTestId('refusal');
    expect(screen.queryByTestId('verdict')).toBeNull();
  }, 15_000);

  it('Esc twice stops a running test', async () => {
    const { user, field } = await openStation();
    await user.type(field, 'K5A-2648-00017{Enter}');
    await screen.findByRole('dialog', { name: 'Before power is applied' });
    now += 1_000;
    await user.keyboard('{F9}');
    await fire('run:started', { stationId: 1, emittedAt: Date.now(), run: sampleRun, unit: sampleUnit, steps: sampleSteps });
    await screen.findByTestId('testing-serial');
    await user.keyboard('{Escape}');
    expect(await screen.findByTestId('abort-confirm')).toHaveTextContent('again to stop');
    expect(calls.some((c) => c.path === '/api/runs/41/abort')).toBe(false);
    await user.keyboard('{Escape}');
    await waitFor(() => expect(calls.some((c) => c.method === 'POST' && c.path === '/api/runs/41/abort')).toBe(true));
    await fire('run:finished', { stationId: 1, emittedAt: Date.now(), runId: 41, verdict: 'aborted', failures: [], errorMessage: 'Aborted by the operator', durationMs: 900, unit: sampleUnit });
    expect(await screen.findByTestId('verdict-word')).toHaveTextContent('Stopped');
    expect(screen.getByTestId('verdict')).toHaveTextContent('Unit not judged — test it again.');
  });

  it('says so when the live link drops: no green READY, no "Scan a unit", and a scan starts nothing', async () => {
    const { user, field } = await openStation();
    expect(screen.getByText('READY')).toBeInTheDocument();
    await fire('disconnect', 'transport close');
    expect(await screen.findByTestId('live-link-banner')).toHaveTextContent('Live link lost — reconnecting');
    expect(screen.getByTestId('link-mark')).toHaveTextContent('Server not reachable');
    expect(screen.queryByText('READY')).toBeNull();
    expect(screen.queryByTestId('ready-prompt')).toBeNull();
    expect(screen.getByTestId('offline')).toHaveTextContent('Server not reachable');
    await user.type(field, 'K5A-2648-00017{Enter}');
    expect(await screen.findByTestId('refusal')).toHaveTextContent('Server not reachable');
    expect(calls.some((c) => c.path === '/api/stations/1/scan')).toBe(false);
    await fire('connect', undefined);
    await waitFor(() => expect(screen.queryByTestId('live-link-banner')).toBeNull());
    expect(screen.getByText('READY')).toBeInTheDocument();
  });

  it('never shows READY before the live link is up', async () => {
    window.localStorage.setItem('railwright.station.id', '1');
    renderApp(<StationScreen />, { route: '/station', signedInAs: makeUser(['operator']) });
    expect(await screen.findByTestId('link-mark')).toHaveTextContent('Connecting');
    expect(screen.queryByText('READY')).toBeNull();
    expect(screen.queryByTestId('ready-prompt')).toBeNull();
    await waitFor(() => expect(sockets.length).toBeGreaterThan(0));
    await fire('connect_error', new Error('xhr poll error'));
    expect(screen.getByTestId('link-mark')).toHaveTextContent('Server not reachable');
    expect(screen.getByTestId('offline')).toBeInTheDocument();
  });

  it('rejoins the station room after a reconnect and asks for what it missed (status, run, shift counters)', async () => {
    await openStation();
    const gets = (path: string) => calls.filter((c) => c.method === 'GET' && c.path === path).length;
    const before = { status: gets('/api/stations/1/status'), shift: gets('/api/stations/1/shift-summary') };
    await fire('disconnect', 'transport close');
    await fire('connect', undefined);
    expect(live().sent.filter((m) => m.event === 'station:join')).toEqual([
      { event: 'station:join', body: { stationId: 1 } },
      { event: 'station:join', body: { stationId: 1 } },
    ]);
    await waitFor(() => expect(gets('/api/stations/1/shift-summary')).toBeGreaterThan(before.shift));
    expect(gets('/api/stations/1/status')).toBeGreaterThan(before.status);
    expect(await screen.findByTestId('ready-prompt')).toBeInTheDocument();
  });

  it('a session the server ends (auth:error) leads to signing in again; nothing looks READY meanwhile', async () => {
    const { queryClient } = await openStation();
    await fire('auth:error', { message: 'Your session has ended.' });
    // the shell asks who is signed in; the server's 401 then leads to the sign-in page
    expect(queryClient.getQueryState(meQueryKey)?.isInvalidated).toBe(true);
    expect(screen.getByTestId('live-link-banner')).toHaveTextContent('Live link refused: sign in again');
    expect(screen.getByTestId('link-mark')).toHaveTextContent('Server not reachable');
    expect(screen.queryByText('READY')).toBeNull();
    expect(screen.getByTestId('offline')).toHaveTextContent('sign in again');
  });

  it('a scanner burst while the prompt is open cancels it (no power) and becomes the next scan', async () => {
    const { user, field } = await openStation();
    await user.type(field, 'K5A-2648-00017{Enter}');
    const first = await screen.findByRole('dialog', { name: 'Before power is applied' });
    expect(first).toHaveTextContent('K5A-2648-00017');
    now += 1_000;
    // the next label, typed into the open prompt the way a scanner does, Enter included
    await user.keyboard('K5A-2648-00018{Enter}');
    await waitFor(() => expect(calls).toContainEqual({ method: 'POST', path: '/api/stations/1/scan', body: { serial: 'K5A-2648-00018' } }));
    const second = await screen.findByRole('dialog', { name: 'Before power is applied' });
    await waitFor(() => expect(second).toHaveTextContent('K5A-2648-00018'));
    expect(calls.some((c) => c.path === '/api/stations/1/runs')).toBe(false);
    expect(field).toHaveValue('');
    // the new unit is confirmed with F9 only
    now += 1_000;
    await user.keyboard('{F9}');
    await waitFor(() => expect(calls).toContainEqual({ method: 'POST', path: '/api/stations/1/runs', body: { serial: 'K5A-2648-00018', safetyConfirmed: true } }));
    expect(calls.filter((c) => c.path === '/api/stations/1/runs')).toHaveLength(1);
  });

  it('a label scanned while the last one is still being checked wins: only it gets the safety prompt', async () => {
    const { user, field } = await openStation();
    await user.type(field, 'K5A-2648-00021{Enter}');
    await user.type(field, 'K5A-2648-00018{Enter}');
    const dialog = await screen.findByRole('dialog', { name: 'Before power is applied' }, { timeout: 3_000 });
    // however the second label's keys fell (into the field, into the prompt), it is scanned whole
    expect(calls.filter((c) => c.path === '/api/stations/1/scan').map((c) => (c.body as { serial: string }).serial)).toEqual([
      'K5A-2648-00021',
      'K5A-2648-00018',
    ]);
    await waitFor(() => expect(dialog).toHaveTextContent('K5A-2648-00018'));
    await act(() => new Promise((r) => setTimeout(r, 500)));
    expect(screen.getByRole('dialog', { name: 'Before power is applied' })).toHaveTextContent('K5A-2648-00018');
    expect(screen.queryByText('K5A-2648-00021')).toBeNull();
    expect(calls.some((c) => c.path === '/api/stations/1/runs')).toBe(false);
  }, 15_000);

  it('a second scan during a run is refused in its own place; the run, then its verdict, keep the panel', async () => {
    const { user, field } = await openStation();
    await fire('run:started', { stationId: 1, emittedAt: Date.now(), run: sampleRun, unit: sampleUnit, steps: sampleSteps });
    await screen.findByTestId('testing-serial');
    await user.type(field, 'K5A-2648-00018{Enter}');
    const refusal = await screen.findByTestId('refusal');
    expect(refusal).toHaveTextContent('Station busy');
    expect(screen.getByTestId('testing-serial')).toHaveTextContent('K5A-2648-00017');
    await fire('run:finished', { stationId: 1, emittedAt: Date.now(), runId: 41, verdict: 'pass', failures: [], durationMs: 8000, unit: { ...sampleUnit, state: 'passed', testCount: 1 } });
    expect(await screen.findByTestId('verdict-word')).toHaveTextContent('PASS');
    expect(screen.getByTestId('refusal')).toHaveTextContent('Station busy');
    expect(screen.getByTestId('verdict')).not.toHaveTextContent('Station busy');
  });

  it('a FAIL with no attempts left says the unit goes to repair, and offers no retest', async () => {
    const { user, field } = await openStation();
    await user.type(field, 'K5A-2648-00019{Enter}');
    const dialog = await screen.findByRole('dialog', { name: 'Before power is applied' });
    expect(dialog).toHaveTextContent('Attempt 3 of 3');
    now += 1_000;
    await user.keyboard('{F9}');
    const run = { ...sampleRun, serial: 'K5A-2648-00019', unitId: 9, attempt: 3 };
    await fire('run:started', { stationId: 1, emittedAt: Date.now(), run, unit: sampleUnit, steps: sampleSteps });
    const bad = measurementFor(0, 'iinNoLoadMa', 22, 'fail');
    await fire('run:finished', { stationId: 1, emittedAt: Date.now(), runId: 41, verdict: 'fail', failures: [bad], durationMs: 1000, unit: sampleUnit });
    const verdict = await screen.findByTestId('verdict');
    expect(within(verdict).getByTestId('verdict-attempt')).toHaveTextContent('attempt 3 of 3');
    expect(within(verdict).getByTestId('verdict-advice')).toHaveTextContent('No attempts left: the unit goes to the repair queue.');
    expect(within(verdict).queryByRole('button', { name: 'Send to repair' })).toBeNull();
  });

  it('a scrapped unit is titled as scrapped, not as held for repair', async () => {
    const { user, field } = await openStation();
    await user.type(field, 'K5A-2648-00020{Enter}');
    const refusal = await screen.findByTestId('refusal');
    expect(refusal).toHaveTextContent('Unit scrapped: set it aside');
    expect(refusal).not.toHaveTextContent('held for repair');
  });

  it('a value just under its limit is written with the digit that shows it (92.96 against ≥ 93.00)', async () => {
    await openStation();
    await fire('run:started', { stationId: 1, emittedAt: Date.now(), run: sampleRun, unit: sampleUnit, steps: sampleSteps });
    const eff = {
      ...measurementFor(0, 'iinNoLoadMa', 92.96, 'fail'),
      name: 'Efficiency at 1.5 A',
      quantity: 'efficiencyPct@1.5',
      unit: '%',
      lowLimit: 93,
      highLimit: null,
    };
    await fire('run:finished', { stationId: 1, emittedAt: Date.now(), runId: 41, verdict: 'fail', failures: [eff], durationMs: 1000, unit: sampleUnit });
    expect(await screen.findByTestId('verdict-failure')).toHaveTextContent('Efficiency at 1.5 A: 92.96 %, limits ≥ 93.00 %');
  });

  it('shows the blocking reasons of a blocked station from the live state', async () => {
    await openStation();
    const blocked: StationStatePayload = { stationId: 1, emittedAt: Date.now(), state: 'blocked', reasons: ['Calibration of FX-101 overdue since 3 Nov'], warnings: [] };
    await fire('station:state', blocked);
    const panel = await screen.findByTestId('not-ready');
    expect(panel).toHaveTextContent('BLOCKED');
    expect(panel).toHaveTextContent('Calibration of FX-101 overdue since 3 Nov');
    expect(screen.getByTestId('header-reasons')).toHaveTextContent('Calibration of FX-101 overdue since 3 Nov');
  });

  it('shows a warning from the live state as a heads-up while the station stays ready', async () => {
    await openStation();
    expect(screen.queryByTestId('header-warnings')).toBeNull();
    const warned: StationStatePayload = {
      stationId: 1,
      emittedAt: Date.now(),
      state: 'ready',
      reasons: [],
      warnings: ['Calibration due 22 Dec 2026 (in 20 days); book the recalibration'],
    };
    await fire('station:state', warned);
    const note = await screen.findByTestId('header-warnings');
    expect(note).toHaveTextContent('Heads-up: Calibration due 22 Dec 2026 (in 20 days); book the recalibration');
    expect(screen.queryByTestId('not-ready')).toBeNull();
    expect(screen.getByRole('textbox', { name: 'Serial' })).toBeEnabled();
  });

  it("an operator's already-passed unit needs an engineer; nothing to override", async () => {
    const { user, field } = await openStation();
    await user.type(field, 'K5A-2648-00003{Enter}');
    expect(await screen.findByTestId('refusal')).toHaveTextContent("needs an engineer's override");
    expect(screen.queryByRole('dialog')).toBeNull();
  });

  it('an engineer retests a passed unit after giving a reason, then confirms safety', async () => {
    const { user, field } = await openStation(['operator', 'engineer']);
    await user.type(field, 'K5A-2648-00003{Enter}');
    const dialog = await screen.findByRole('dialog', { name: 'Test a passed unit again' });
    const reason = within(dialog).getByRole('textbox', { name: 'Reason for the retest' });
    await waitFor(() => expect(reason).toHaveFocus());
    await user.type(reason, 'no{Enter}');
    expect(within(dialog).getByText(/at least 5 characters/)).toBeInTheDocument();
    await user.type(reason, ' - customer return, rework of C12{Enter}');
    const safety = await screen.findByRole('dialog', { name: 'Before power is applied' });
    expect(safety).toHaveTextContent('Reason: no - customer return, rework of C12');
    now += 1_000;
    await user.keyboard('{F9}');
    await waitFor(() =>
      expect(calls).toContainEqual({
        method: 'POST',
        path: '/api/stations/1/runs',
        body: { serial: 'K5A-2648-00003', safetyConfirmed: true, overrideReason: 'no - customer return, rework of C12' },
      }),
    );
    await waitFor(() => expect(field).toHaveFocus());
  });

  it('F8 prints the repair tag of a failed unit', async () => {
    const createObjectURL = vi.fn(() => 'blob:tag');
    const revokeObjectURL = vi.fn();
    Object.assign(URL, { createObjectURL, revokeObjectURL });
    await openStation();
    await fire('run:started', { stationId: 1, emittedAt: Date.now(), run: sampleRun, unit: sampleUnit, steps: sampleSteps });
    const bad = measurementFor(0, 'iinNoLoadMa', 22, 'fail');
    await fire('run:finished', { stationId: 1, emittedAt: Date.now(), runId: 41, verdict: 'fail', failures: [bad], durationMs: 1000, unit: sampleUnit });
    await screen.findByTestId('verdict');
    await act(async () => {
      window.dispatchEvent(new KeyboardEvent('keydown', { key: 'F8' }));
      await new Promise((r) => setTimeout(r, 0));
    });
    await waitFor(() => expect(calls.some((c) => c.path === '/api/runs/41/repair-tag.pdf')).toBe(true));
    await waitFor(() => expect(screen.getByTestId('verdict').textContent).toContain('Tag sent'));
    expect(createObjectURL).toHaveBeenCalled();
    expect(await screen.findByText(/Tag sent to the printer/)).toHaveAttribute('href', 'blob:tag');
    expect(document.querySelector('iframe[title="Repair tag"]')).toHaveAttribute('src', 'blob:tag');
  });

  it('an ERROR says the unit was not judged and must be tested again', async () => {
    await openStation();
    await fire('run:started', { stationId: 1, emittedAt: Date.now(), run: sampleRun, unit: sampleUnit, steps: sampleSteps });
    await fire('run:finished', {
      stationId: 1,
      emittedAt: Date.now(),
      runId: 41,
      verdict: 'error',
      failures: [],
      errorMessage: 'Fixture FX-101 did not answer MEAS:VOLT:OUT? within 2000 ms',
      durationMs: 2500,
      unit: sampleUnit,
    });
    const verdict = await screen.findByTestId('verdict');
    expect(within(verdict).getByTestId('verdict-word')).toHaveTextContent('ERROR');
    expect(verdict).toHaveTextContent('Fixture FX-101 did not answer');
    expect(verdict).toHaveTextContent('Unit not judged — test it again.');
    expect(within(verdict).queryByRole('button', { name: /Print repair tag/ })).toBeNull();
  });
});
