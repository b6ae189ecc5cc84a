import { fireEvent, screen, within } from '@testing-library/react';
import { Route, Routes } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import type { HistoryRun, UnitHistory } from '../api/get-unit-history';
import { timelineOf, UnitHistoryScreen } from './unit-history-screen';

const run = (over: Partial<HistoryRun>): HistoryRun => ({
  id: 40,
  attempt: 1,
  verdict: 'fail',
  endReason: null,
  errorMessage: null,
  failedStepKey: 'vout-load',
  startedAt: '2026-12-01T08:00:00.000Z',
  finishedAt: '2026-12-01T08:00:09.000Z',
  plan: { versionId: 4, planId: 1, code: 'EOL-BK0503', version: 2, checksum: 'a1b2c3d4e5f60718293a' },
  station: { id: 1, code: 'EOL-1', name: 'Line B, end of line 1' },
  fixture: { id: 1, code: 'FX-101', identity: null, calibrationDueAtRun: '2027-03-01T00:00:00.000Z', calibrationId: null, calibratedAt: null, calibrationDueAt: '2027-03-01T00:00:00.000Z', certificate: 'CAL-2026-118' },
  operator: { username: 'operator', displayName: 'Line B operator' },
  overrideReason: null,
  measurements: [
    {
      id: 1,
      stepIndex: 2,
      stepKey: 'vout-load',
      stepName: 'Output voltage under load',
      quantity: 'voutV',
      name: 'Output voltage at 1.5 A',
      value: 3.21,
      unit: 'V',
      lowLimit: 3.25,
      highLimit: 3.35,
      guardedLow: 3.26,
      guardedHigh: 3.34,
      uncertainty: 0.01,
      rule: 'guarded',
      verdict: 'fail',
      decision: 'fail',
      measuredAt: '2026-12-01T08:00:05.000Z',
    },
  ],
  ...over,
});

const history: UnitHistory = {
  unit: {
    id: 4,
    serial: 'K5A-2649-00017',
    state: 'passed',
    stateWords: 'Passed',
    disposition: 'Passed its final test',
    testCount: 2,
    sentToRepairAt: null,
    product: { id: 1, partNumber: 'OB-BK0503', name: 'Buck 5 V to 3.3 V' },
    lot: { id: 3, code: 'LB-2649-01', state: 'open' },
  },
  runs: [run({ id: 41, attempt: 2, verdict: 'pass', startedAt: '2026-12-01T10:00:00.000Z', measurements: [] }), run({})],
  events: [
    {
      id: 77,
      at: '2026-12-01T09:00:00.000Z',
      actorName: 'engineer',
      actorDisplayName: 'Test engineer',
      action: 'unit.repair_returned',
      what: 'Returned unit K5A-2649-00017 from repair for retest',
      entityType: 'unit',
      entityId: '4',
      reason: 'replaced R7',
      changes: [{ field: 'State', before: 'in repair', after: 'untested' }],
    },
  ],
  repairRecords: { '77': [{ field: 'Cause', value: 'Wrong feedback resistor' }] },
};

let fetchMock: ReturnType<typeof vi.fn>;

function renderScreen(serial = 'K5A-2649-00017') {
  return renderApp(
    <Routes>
      <Route path="/units/:serial" element={<UnitHistoryScreen serial={serial} />} />
    </Routes>,
    { route: `/units/${serial}`, signedInAs: makeUser(['quality']) },
  );
}

beforeEach(() => {
  fetchMock = vi.fn(async (input: RequestInfo | URL) => {
    const url = new URL(String(input), 'http://x');
    if (url.pathname === '/api/units/K5A-2649-00017/history') return jsonResponse(200, history);
    return jsonResponse(404, { message: 'No unit with serial "K5A-0000-00000" is registered. Check the label and try again.', details: { code: 'unknown_serial' } });
  });
  vi.stubGlobal('fetch', fetchMock);
});

afterEach(() => vi.unstubAllGlobals());

describe('UnitHistoryScreen', { timeout: 20_000 }, () => {
  it('puts runs and repair steps in one timeline, newest first', () => {
    expect(timelineOf(history).map((i) => (i.kind === 'run' ? `run ${i.run.id}` : `event ${i.event.id}`))).toEqual(['run 41', 'event 77', 'run 40']);
  });

  it('shows the unit, its lot and state, and each run with its traceability', async () => {
    renderScreen();
    expect(await screen.findByRole('heading', { name: 'K5A-2649-00017' })).toBeInTheDocument();
    expect(screen.getByTestId('unit-state')).toHaveTextContent('Passed');
    expect(screen.getByRole('link', { name: 'LB-2649-01' })).toHaveAttribute('href', '/lots?lot=3');
    const timeline = screen.getByRole('list', { name: 'Timeline' });
    const items = within(timeline).getAllByRole('listitem');
    expect(items).toHaveLength(3);
    expect(items[1]).toHaveTextContent('Returned unit K5A-2649-00017 from repair for retest');
    expect(items[1]).toHaveTextContent('Wrong feedback resistor');
    expect(items[1]).toHaveTextContent('Note: replaced R7');
    expect(items[2]).toHaveTextContent('EOL-BK0503 v2');
    expect(items[2]).toHaveTextContent('FX-101, calibration due');
    expect(items[2]).toHaveTextContent('CAL-2026-118');
    expect(items[2]).toHaveTextContent('Line B operator');
    expect(within(items[2]).getByRole('link', { name: '#40' })).toHaveAttribute('href', '/runs/40');
  });

  it('opens a run to its measurements with limits and verdict', async () => {
    renderScreen();
    const button = await screen.findByRole('button', { name: /Show 1 measurements \(1 failed\)/ });
    fireEvent.click(button);
    const table = screen.getByRole('table', { name: 'Measurements' });
    expect(table).toHaveTextContent('Output voltage at 1.5 A');
    expect(table).toHaveTextContent('3.210 V');
    expect(table).toHaveTextContent('FAIL');
  });

  it('says in words when the serial is unknown', async () => {
    renderScreen('K5A-0000-00000');
    expect(await screen.findByRole('alert')).toHaveTextContent('No unit with serial "K5A-0000-00000" is registered');
  });
});
