import { screen, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import type { RunDetail } from '../api/get-run';
import { makeCalibration, makeMeasurement, makeRunDetail } from '../test-data';
import { RunDetailScreen } from './run-detail-screen';

function serve(detail: RunDetail) {
  vi.stubGlobal(
    'fetch',
    vi.fn(async (input: RequestInfo | URL) => {
      const url = new URL(String(input), 'http://x');
      if (url.pathname === `/api/runs/${detail.id}`) return jsonResponse(200, detail);
      if (url.pathname === '/api/fixtures/2/calibrations/7/certificate') return jsonResponse(404, { message: 'Calibration record 7 has no certificate PDF (it was recorded without one).' });
      return jsonResponse(404, { message: 'There is no run with that id.' });
    }),
  );
}

beforeEach(() => serve(makeRunDetail()));
afterEach(() => vi.unstubAllGlobals());

const renderDetail = (runId = 41, roles: Parameters<typeof makeUser>[0] = ['quality']) =>
  renderApp(<RunDetailScreen runId={runId} />, { route: `/runs/${runId}`, signedInAs: makeUser(roles) });

describe('RunDetailScreen', () => {
  it('heads the page with serial, verdict word and shape, product, lot and station', async () => {
    const { container } = renderDetail();
    expect(await screen.findByTestId('run-serial')).toHaveTextContent('K5A-2648-00002');
    const header = container.querySelector('[data-verdict="fail"]');
    expect(header).toHaveTextContent('FAIL');
    expect(header?.querySelector('svg')).toHaveAttribute('data-shape', 'square-cross');
    expect(screen.getByTestId('run-context')).toHaveTextContent('OB-BK0503 · lot LB-2648-01 · EOL-1');
    expect(screen.getByRole('button', { name: 'Repair tag (PDF)' })).toBeInTheDocument();
  });

  it('shows the traceability fields stored with the run', async () => {
    renderDetail();
    await screen.findByTestId('run-serial');
    expect(screen.getByTestId('trace-plan')).toHaveTextContent('TP-BK0503 v2');
    expect(screen.getByTestId('trace-fixture')).toHaveTextContent('FX-01');
    expect(screen.getByTestId('trace-fixture-identity')).toHaveTextContent('Orrin Bay,EOL-FIXTURE,FX-01,1.4.0');
    expect(screen.getByTestId('trace-calibration')).toHaveTextContent(/2026-09-(29|30)/);
    expect(screen.getByTestId('trace-cycles')).toHaveTextContent('12345');
    expect(screen.getByTestId('trace-operator')).toHaveTextContent('Ada Operator');
    expect(screen.getByTestId('trace-attempt')).toHaveTextContent('1');
    expect(screen.getByTestId('trace-override')).toHaveTextContent('none');
  });

  it('marks a calibration that had lapsed at the time, an override and an error message', async () => {
    serve(
      makeRunDetail({
        verdict: 'error',
        attempt: 2,
        fixtureCalibrationDueAt: '2026-02-01T00:00:00.000Z',
        overrideReason: 'Retest after fixture swap',
        overrideByName: 'Eli Engineer',
        errorMessage: 'The fixture stopped answering during the ripple step.',
      }),
    );
    renderDetail();
    await screen.findByTestId('run-serial');
    expect(screen.getByTestId('trace-calibration')).toHaveTextContent('overdue when tested');
    expect(screen.getByTestId('trace-override')).toHaveTextContent('“Retest after fixture swap” — Eli Engineer');
    expect(screen.getByTestId('trace-error')).toHaveTextContent('The fixture stopped answering');
    expect(screen.getByTestId('trace-attempt')).toHaveTextContent('2 (retest)');
    // only a failed run has a repair tag (the server refuses one for error runs)
    expect(screen.queryByRole('button', { name: 'Repair tag (PDF)' })).toBeNull();
  });

  it('shows every measurement with value, limits, guarded limits and U; a guard-band fail in its own words', async () => {
    renderDetail();
    const table = await screen.findByRole('table', { name: 'Measurements' });
    const [, passRow, guardRow] = within(table).getAllByRole('row');
    expect(passRow).toHaveTextContent('3.300 V');
    expect(passRow).toHaveTextContent('3.250 … 3.350 V');
    expect(passRow).toHaveTextContent('same as spec');
    expect(passRow).toHaveTextContent('PASS');
    expect(guardRow).toHaveTextContent('3.348 V');
    expect(guardRow).toHaveTextContent('3.254 … 3.346 V');
    expect(guardRow).toHaveTextContent('0.004 V');
    expect(within(guardRow!).getByText('FAIL')).toBeInTheDocument();
    expect(guardRow).toHaveTextContent('inside spec, outside guard band');
    expect(guardRow?.querySelector('span[data-verdict="guard_fail"] svg')).toHaveAttribute('data-shape', 'square-cross');
    expect(within(table).getAllByText('inside spec, outside guard band')).toHaveLength(1);
  });

  it('shows each measurement\'s decision statement in words (ILAC-G8:09/2019 §4.2.3)', async () => {
    renderDetail();
    const table = await screen.findByRole('table', { name: 'Measurements' });
    const [, passRow, guardRow] = within(table).getAllByRole('row');
    expect(within(passRow!).getByTestId('measurement-decision')).toHaveTextContent(/^pass$/);
    expect(within(guardRow!).getByTestId('measurement-decision')).toHaveTextContent('fail, within uncertainty');
  });

  it('writes a value with the digit that shows why it failed (92.96 % against ≥ 93.0 %)', async () => {
    // self-constructed example: at one decimal 92.96 would read "93.0", inside the limit it failed
    serve(
      makeRunDetail({
        measurements: [
          makeMeasurement({ quantity: 'efficiencyPct@1.5', name: 'Efficiency', unit: '%', value: 92.96, lowLimit: 93, highLimit: null, guardedLow: 93, guardedHigh: null, verdict: 'fail', decision: 'fail' }),
        ],
      }),
    );
    renderDetail();
    const table = await screen.findByRole('table', { name: 'Measurements' });
    const [, row] = within(table).getAllByRole('row');
    expect(within(row!).getByTestId('measurement-value')).toHaveTextContent('92.96 %');
    expect(row).toHaveTextContent('≥ 93.00 %');
  });

  it('says why a run ended and calls a stopped run "stopped", not aborted', async () => {
    serve(makeRunDetail({ verdict: 'aborted', endReason: 'server_shutdown', errorMessage: 'Stopped: station server shut down' }));
    const { container } = renderDetail();
    await screen.findByTestId('run-serial');
    expect(container.querySelector('[data-verdict="aborted"]')).toHaveTextContent('Stopped');
    expect(screen.getByTestId('trace-error')).toHaveTextContent('Run ended: station server shut down');
    expect(screen.queryByText(/aborted/i)).toBeNull();
  });

  it('unfolds the raw readings as pretty-printed JSON', async () => {
    const { user } = renderDetail();
    await screen.findByRole('table', { name: 'Measurements' });
    const toggle = screen.getByRole('button', { name: 'Show raw readings of Output voltage' });
    expect(toggle).toHaveAttribute('aria-expanded', 'false');
    await user.click(toggle);
    const raw = screen.getByLabelText('Raw readings of Output voltage');
    expect(raw.textContent).toBe(JSON.stringify({ samples: [3.301, 3.299], dmmRange: '10V' }, null, 2));
    await user.click(screen.getByRole('button', { name: 'Hide raw readings of Output voltage' }));
    expect(screen.queryByLabelText('Raw readings of Output voltage')).toBeNull();
  });

  it('shows the calibration record the run was judged with, its certificate and the U per quantity of its guard bands', async () => {
    renderDetail(41, ['engineer']);
    const block = await screen.findByTestId('trace-calibration-record');
    expect(within(block).getByTestId('trace-cal-id')).toHaveTextContent('#7 (still in force)');
    expect(within(block).getByTestId('trace-cal-certificate')).toHaveTextContent('OBE-CAL-26-0042');
    expect(within(block).getByTestId('trace-cal-calibrated')).toHaveTextContent(/2026-01-12/);
    expect(within(block).getByTestId('trace-cal-due')).toHaveTextContent(/2026-09-(29|30)/);
    expect(within(block).getByTestId('trace-cal-by')).toHaveTextContent('Eli Engineer');
    expect(within(block).getByRole('button', { name: 'Download certificate OBE-CAL-26-0042 (PDF, 47.5 kB)' })).toBeInTheDocument();
    const table = within(block).getByRole('table', { name: 'Uncertainty used for guard banding' });
    const rows = within(table).getAllByRole('row');
    expect(rows[1]).toHaveTextContent('Output voltage');
    expect(rows[1]).toHaveTextContent('± 0.004 V');
    expect(rows[2]).toHaveTextContent('± 1.5 mV');
    // an engineer may open the Fixtures page, so the block links there
    expect(within(block).getByRole('link', { name: 'FX-01 on the Fixtures page' })).toHaveAttribute('href', '/fixtures');
  });

  it('says a record was since replaced, and shows the server\'s words when its certificate cannot be fetched', async () => {
    serve(makeRunDetail({ calibration: makeCalibration({ current: false }) }));
    const { user } = renderDetail();
    const block = await screen.findByTestId('trace-calibration-record');
    expect(within(block).getByTestId('trace-cal-id')).toHaveTextContent('since replaced by a later calibration');
    // quality cannot open the Fixtures page (engineers only): no link that would lead nowhere
    expect(within(block).queryByRole('link')).toBeNull();
    await user.click(within(block).getByRole('button', { name: /Download certificate/ }));
    expect(await within(block).findByRole('alert')).toHaveTextContent('has no certificate PDF');
  });

  it('says in words when a run was judged before calibration records were kept', async () => {
    serve(makeRunDetail({ calibration: null }));
    renderDetail();
    const block = await screen.findByTestId('trace-calibration-record');
    expect(block).toHaveTextContent('No calibration record (run before records were kept)');
    expect(within(block).queryByRole('table')).toBeNull();
  });

  it('says when a certificate came without a PDF', async () => {
    serve(makeRunDetail({ calibration: makeCalibration({ certificateFile: null, uncertainties: [] }) }));
    renderDetail();
    const block = await screen.findByTestId('trace-calibration-record');
    expect(within(block).getByTestId('trace-cal-pdf')).toHaveTextContent('no PDF on file');
    expect(block).toHaveTextContent('each limit kept the plan’s own value');
  });

  it('says so when the run does not exist', async () => {
    renderDetail(999);
    expect(await screen.findByRole('alert')).toHaveTextContent('There is no run with that id.');
  });
});
