import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { Route, Routes, useLocation } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import { makeRun } from '../test-data';
import { RunsScreen } from './runs-screen';

const runs = [
  makeRun({ failedStepName: 'Output voltage at nominal load' }),
  makeRun({ id: 40, serial: 'K5A-2648-00001', verdict: 'pass', failedStepKey: null, durationMs: 7_900, startedAt: '2026-03-02T09:14:00.000Z' }),
];

let fetchMock: ReturnType<typeof vi.fn>;

function Probe() {
  const loc = useLocation();
  return <output data-testid="location">{loc.pathname + loc.search}</output>;
}

function renderScreen(route = '/runs') {
  return renderApp(
    <>
      <Routes>
        <Route path="/runs" element={<RunsScreen />} />
        <Route path="/runs/:id" element={<p>run detail</p>} />
      </Routes>
      <Probe />
    </>,
    { route, signedInAs: makeUser(['quality']) },
  );
}

const requested = (path: string) =>
  fetchMock.mock.calls.map(([u]) => new URL(String(u), 'http://x')).filter((u) => u.pathname === path);

beforeEach(() => {
  fetchMock = vi.fn(async (input: RequestInfo | URL) => {
    const url = new URL(String(input), 'http://x');
    if (url.pathname === '/api/runs') return jsonResponse(200, { items: runs, total: 2 });
    if (url.pathname === '/api/stations') return jsonResponse(200, [{ id: 1, code: 'EOL-1', name: 'Line 1' }]);
    if (url.pathname === '/api/lots') return jsonResponse(200, [{ id: 3, code: 'LB-2648-01', state: 'open', product: { id: 1, partNumber: 'OB-BK0503', name: 'Buck 5→3.3' } }]);
    return jsonResponse(404, { message: 'not here' });
  });
  vi.stubGlobal('fetch', fetchMock);
});

afterEach(() => vi.unstubAllGlobals());

describe('RunsScreen', { timeout: 20_000 }, () => {
  it('lists the runs of the response with their traceability columns and verdicts', async () => {
    renderScreen();
    const table = await screen.findByRole('table', { name: 'Runs' });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(2);
    expect(rows[0]).toHaveTextContent('K5A-2648-00002');
    expect(rows[0]).toHaveTextContent('OB-BK0503');
    expect(rows[0]).toHaveTextContent('LB-2648-01');
    expect(rows[0]).toHaveTextContent('FX-01');
    expect(rows[0]).toHaveTextContent('Ada Operator');
    expect(rows[0]).toHaveTextContent('TP-BK0503 v2');
    // the step's name, not its internal key (issue 12)
    expect(rows[0]).toHaveTextContent('Output voltage at nominal load');
    expect(rows[0]).not.toHaveTextContent('vout_nominal');
    expect(rows[0]).toHaveTextContent('8.4 s');
    expect(within(rows[0]!).getByText('FAIL')).toBeInTheDocument();
    expect(within(rows[1]!).getByText('PASS')).toBeInTheDocument();
    expect(screen.getByTestId('runs-count')).toHaveTextContent('1–2 of 2 runs');
  });

  it('sorts by a column heading on the server and keeps the sort in the address (issue 12)', async () => {
    const { user } = renderScreen('/runs?verdict=fail');
    const table = await screen.findByRole('table', { name: 'Runs' });
    expect(within(table).getByRole('columnheader', { name: /Started/ })).toHaveAttribute('aria-sort', 'descending');
    expect(requested('/api/runs')[0]?.searchParams.get('sort')).toBeNull();
    await user.click(within(table).getByRole('button', { name: 'Sort by serial, ascending' }));
    await waitFor(() => expect(screen.getByTestId('location')).toHaveTextContent('/runs?verdict=fail&sort=serial&dir=asc'));
    await waitFor(() => expect(requested('/api/runs').at(-1)?.searchParams.get('sort')).toBe('serial'));
    expect(requested('/api/runs').at(-1)?.searchParams.get('dir')).toBe('asc');
    await user.click(within(await screen.findByRole('table', { name: 'Runs' })).getByRole('button', { name: 'Sort by serial, descending' }));
    await waitFor(() => expect(requested('/api/runs').at(-1)?.searchParams.get('dir')).toBe('desc'));
  });

  it('searches a serial by any part and in lower case, as typed (issue 12)', async () => {
    const { user } = renderScreen();
    await screen.findByRole('table', { name: 'Runs' });
    expect(screen.getByText('Any part, any case, then Enter')).toBeInTheDocument();
    await user.type(screen.getByLabelText('Serial', { exact: false, selector: 'input' }), 'k5a-2648{Enter}');
    await waitFor(() => expect(requested('/api/runs').at(-1)?.searchParams.get('serial')).toBe('k5a-2648'));
  });

  it('calls a stopped run "Stopped" in the verdict filter (issue 12)', async () => {
    const { user } = renderScreen();
    await screen.findByRole('table', { name: 'Runs' });
    await user.click(screen.getByLabelText('Verdict', { selector: 'input' }));
    expect(await screen.findByRole('option', { name: 'Stopped' })).toBeInTheDocument();
    expect(screen.queryByRole('option', { name: /aborted|STOPPED/ })).toBeNull();
  });

  it('sends the filters in the address to the server', async () => {
    renderScreen('/runs?verdict=fail&station=1&page=2');
    await screen.findByRole('table', { name: 'Runs' });
    const [url] = requested('/api/runs');
    expect(url?.searchParams.get('verdict')).toBe('fail');
    expect(url?.searchParams.get('stationId')).toBe('1');
    expect(url?.searchParams.get('offset')).toBe('50');
  });

  it('writes the serial (on Enter), the dates and the verdict into the address', async () => {
    const { user } = renderScreen();
    await screen.findByRole('table', { name: 'Runs' });
    await user.type(screen.getByLabelText('Serial', { exact: false, selector: 'input' }), 'K5A-2648-00002{Enter}');
    await waitFor(() => expect(screen.getByTestId('location')).toHaveTextContent('/runs?serial=K5A-2648-00002'));

    fireEvent.change(screen.getByLabelText('Started from'), { target: { value: '2026-03-02' } });
    await waitFor(() => expect(screen.getByTestId('location')).toHaveTextContent('from=2026-03-02'));

    await user.click(screen.getByLabelText('Verdict', { selector: 'input' }));
    await user.click(await screen.findByRole('option', { name: 'FAIL' }));
    await waitFor(() => expect(screen.getByTestId('location')).toHaveTextContent('/runs?serial=K5A-2648-00002&verdict=fail&from=2026-03-02'));
    await waitFor(() => expect(requested('/api/runs').at(-1)?.searchParams.get('serial')).toBe('K5A-2648-00002'));
    // typing a serial key by key plus a select takes ~5 s of jsdom work on a loaded 2-core machine
  }, 15_000);

  it('opens a run from the keyboard (Enter on a focused row) and by click', async () => {
    const { user } = renderScreen();
    const table = await screen.findByRole('table', { name: 'Runs' });
    const row = within(table).getByRole('row', { name: /Run 41/ });
    row.focus();
    await user.keyboard('{Enter}');
    expect(screen.getByTestId('location')).toHaveTextContent('/runs/41');
    expect(screen.getByText('run detail')).toBeInTheDocument();
  });
});
