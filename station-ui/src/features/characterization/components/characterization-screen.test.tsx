import { screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import type { Analysis, DataSetSummary } from '../api/types';
import { CharacterizationScreen } from './characterization-screen';

const dataSet: DataSetSummary = {
  id: 7,
  name: 'OB-BK0503 pilot build P2',
  fileName: 'OB-BK0503-pilot-P2.csv',
  product: { id: 1, partNumber: 'OB-BK0503', name: 'Buck module 12 V to 5 V, 3 A' },
  uploadedBy: { id: 2, username: 'engineer', displayName: 'Test engineer' },
  uploadedAt: '2026-12-02T15:00:00.000Z',
  rowCount: 60,
  columns: [
    { key: 'vout_1.5A_V', name: 'vout_1.5A', unit: 'V', count: 60 },
    { key: 'ripple_mV', name: 'ripple', unit: 'mV', count: 59 },
  ],
};

const est = (value: number) => ({ value, lower: value - 0.2, upper: value + 0.2, confidence: 0.95, method: 'Bissell normal approximation' });

/** The server's answer; the suggestion follows k and U as the API computes it (x̄ ± k·s, guarded by U). */
function analysis(low: number | null, high: number | null, k = 4, u = 0): Analysis {
  const withLimits = low !== null || high !== null;
  return {
    dataSet,
    column: dataSet.columns[0]!,
    n: 60,
    missing: 0,
    mean: 5.0041,
    sd: 0.0102,
    sigmaWithin: 0.0098,
    min: 4.981,
    max: 5.029,
    histogram: { edges: [4.98, 4.99, 5.0, 5.01, 5.02, 5.03], counts: [5, 14, 20, 15, 6], binWidth: 0.01, rule: 'freedman-diaconis' },
    normality: {
      andersonDarling: { test: 'Anderson–Darling', statistic: 0.3, pValue: 0.54, method: 'AD' },
      shapiroWilk: { test: 'Shapiro–Wilk', statistic: 0.98, pValue: 0.61, method: 'SW' },
      primary: { test: 'Anderson–Darling', statistic: 0.3, pValue: 0.54, method: 'AD' },
      reading: 'No evidence against normality (Anderson–Darling p ≥ 0.05); this does not prove the values are normal.',
    },
    limits: { low, high },
    capability: withLimits
      ? { n: 60, mean: 5.0041, sigmaWithin: 0.0098, sigmaOverall: 0.0102, cp: est(1.45), cpk: est(1.39), pp: est(1.39), ppk: est(1.34), ppmWithin: { below: 1, above: 2, total: 3 }, ppmOverall: { below: 2, above: 3, total: 5 } }
      : null,
    ppmOutside: withLimits ? { below: 2.1, above: 3.2, total: 5.3 } : null,
    suggestion: {
      k,
      uncertainty: u,
      tolerance: { low: 5.0041 - k * 0.0102, high: 5.0041 + k * 0.0102 },
      acceptance: { low: 5.0041 - k * 0.0102 + u, high: 5.0041 + k * 0.0102 - u },
      ppmOutsideTolerance: { below: 31.7, above: 31.7, total: 63.3 },
      ppmOutsideAcceptance: { below: 31.7, above: 31.7, total: 63.3 },
    },
    problems: withLimits ? [] : ['Propose a low limit, a high limit or both to see Cpk, Ppk and the expected ppm outside them.'],
  };
}

const plans = [{ id: 3, code: 'EOL-BK0503', name: 'End-of-line', product: dataSet.product }];
const planDetail = { ...plans[0], versions: [{ id: 11, version: 2, stage: 'draft' }, { id: 10, version: 1, stage: 'released' }] };
const version = {
  id: 11,
  version: 2,
  stage: 'draft',
  plan: plans[0],
  steps: [
    { key: 'vout-load', name: 'Output voltage at half and full load', kind: 'vout_at_load', limits: [{ key: 'voutV@1.5', unit: 'V', low: 4.9, high: 5.1, uncertainty: 0.01, rule: 'guarded' }] },
    { key: 'ripple', name: 'Ripple', kind: 'ripple', limits: [{ key: 'rippleMvPp', unit: 'mV', high: 30 }] },
  ],
};

let fetchMock: ReturnType<typeof vi.fn>;
let uploadAnswer: Response | null = null;

beforeEach(() => {
  uploadAnswer = null;
  fetchMock = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const url = new URL(String(input), 'http://x');
    const method = init?.method ?? 'GET';
    if (url.pathname === '/api/characterization/data-sets' && method === 'POST') return uploadAnswer ?? jsonResponse(201, dataSet);
    if (url.pathname === '/api/characterization/data-sets') return jsonResponse(200, [dataSet]);
    if (url.pathname === '/api/characterization/data-sets/7/analysis') {
      const low = url.searchParams.get('low');
      const high = url.searchParams.get('high');
      const k = url.searchParams.get('k');
      const u = url.searchParams.get('uncertainty');
      return jsonResponse(200, analysis(low === null ? null : Number(low), high === null ? null : Number(high), k === null ? 4 : Number(k), u === null ? 0 : Number(u)));
    }
    if (url.pathname === '/api/characterization/data-sets/7/accept') {
      const body = JSON.parse(String(init?.body));
      return jsonResponse(200, { planVersionId: 11, planCode: 'EOL-BK0503', version: 2, stepKey: body.stepKey, limitBefore: version.steps[0]!.limits[0], limitAfter: { ...version.steps[0]!.limits[0], low: body.low, high: body.high }, statistics: {}, auditEventId: 99 });
    }
    if (url.pathname === '/api/plans') return jsonResponse(200, plans);
    if (url.pathname === '/api/plans/3') return jsonResponse(200, planDetail);
    if (url.pathname === '/api/plan-versions/11') return jsonResponse(200, version);
    return jsonResponse(404, { message: 'not here' });
  });
  vi.stubGlobal('fetch', fetchMock);
});
afterEach(() => vi.unstubAllGlobals());

const engineer = makeUser(['engineer']);

describe('CharacterizationScreen', { timeout: 60_000 }, () => {
  it('shows the figures of the first quantity of the newest data set, and follows proposed limits', async () => {
    const { user } = renderApp(<CharacterizationScreen />, { signedInAs: engineer });
    await screen.findByRole('heading', { name: 'Figures of vout_1.5A_V' });
    expect(await screen.findByText('5.0041')).toBeInTheDocument();
    expect(screen.getByText(/No evidence against normality/)).toBeInTheDocument();
    expect(screen.getByText('0.540')).toBeInTheDocument();
    expect(screen.getByText(/Propose a low limit, a high limit or both to see Cpk/)).toBeInTheDocument();

    await user.click(screen.getByRole('button', { name: 'Use suggested limits' }));
    expect(screen.getByLabelText('Proposed low (V)')).toHaveValue('4.963');
    const table = await screen.findByRole('table', { name: 'Capability indices' });
    await waitFor(() => expect(within(table).getByText('1.34')).toBeInTheDocument());
    expect(within(table).getByText('1.14 – 1.54')).toBeInTheDocument();
    expect(screen.getByText('5.3')).toBeInTheDocument();
    const calls = fetchMock.mock.calls.map(([u]) => new URL(String(u), 'http://x')).filter((u) => u.pathname.endsWith('/analysis'));
    expect(calls.at(-1)!.searchParams.get('high')).toBe('5.045');
  });

  it('marks a high limit below the low one on its field and does not ask the server with it', async () => {
    const { user } = renderApp(<CharacterizationScreen />, { signedInAs: engineer });
    const low = await screen.findByLabelText('Proposed low (V)');
    await user.type(low, '5.1');
    await user.type(screen.getByLabelText('Proposed high (V)'), '5');
    expect(await screen.findByText('must be above the low limit')).toBeInTheDocument();
    await new Promise((r) => setTimeout(r, 400));
    const calls = fetchMock.mock.calls.map(([u]) => new URL(String(u), 'http://x')).filter((u) => u.pathname.endsWith('/analysis'));
    expect(calls.some((u) => u.searchParams.get('high') === '5')).toBe(false);
  });

  it('lists every problem of a refused file plainly', async () => {
    uploadAnswer = jsonResponse(400, {
      statusCode: 400,
      error: 'Bad Request',
      message: 'bad.csv was not stored: …',
      details: { code: 'bad_file', problems: [{ line: 4, column: 'vout_V', message: '"5,01" is not a number; use a point as the decimal separator (5.012, not 5,012)' }, { line: 1, column: 'ripple', message: '"ripple" does not end in its unit' }] },
    });
    const { user } = renderApp(<CharacterizationScreen />, { signedInAs: engineer });
    await screen.findByLabelText('CSV file');
    // Mantine's FileInput is a button with a hidden file input behind it
    const input = document.querySelector('input[type="file"]') as HTMLInputElement;
    await user.upload(input, new File(['serial,vout_V\nA1,5,01\n'], 'bad.csv', { type: 'text/csv' }));
    await user.click(screen.getByRole('button', { name: 'Upload' }));
    const list = await screen.findByRole('list', { name: 'Problems in the file' });
    expect(within(list).getByText('Line 4, column vout_V: "5,01" is not a number; use a point as the decimal separator (5.012, not 5,012)')).toBeInTheDocument();
    expect(within(list).getAllByRole('listitem')).toHaveLength(2);
    expect(screen.getByText(/Nothing was stored/)).toBeInTheDocument();
    const sent = fetchMock.mock.calls.find(([u, i]) => String(u).endsWith('/characterization/data-sets') && i?.method === 'POST')!;
    expect((sent[1]!.body as FormData).get('name')).toBe('bad');
  });

  it('puts the proposed limits into the chosen draft after a confirmation', async () => {
    const { user } = renderApp(<CharacterizationScreen />, { signedInAs: engineer });
    // typing re-renders the whole screen per key; pasting keeps the test quick
    await user.click(await screen.findByLabelText('Proposed low (V)'));
    await user.paste('4.96');
    await user.click(screen.getByLabelText('Proposed high (V)'));
    await user.paste('5.045');
    // the plan of the data set's product and its only draft are chosen already; only limits in V are offered
    await waitFor(() => expect(screen.getByLabelText('Draft version', { selector: 'input' })).toHaveValue('v2 — draft'));
    await user.click(screen.getByLabelText('Limit', { exact: false, selector: 'input' }));
    expect(screen.queryByText(/rippleMvPp/)).not.toBeInTheDocument();
    await user.click(await screen.findByRole('option', { name: /voutV@1\.5 · now 4\.900 … 5\.100 V/ }));
    await user.click(screen.getByLabelText('Reason'));
    await user.paste('Pilot build P2: Ppk above 1.33');
    await user.click(screen.getByRole('button', { name: 'Put into draft…' }));
    const dialog = await screen.findByRole('dialog', { name: 'Put these limits into the draft?' });
    expect(within(dialog).getByText('4.960 … 5.045 V')).toBeInTheDocument();
    await user.click(within(dialog).getByRole('button', { name: 'Put into draft' }));
    expect(await screen.findByText('Limit put into the draft')).toBeInTheDocument();
    const sent = fetchMock.mock.calls.find(([u]) => String(u).endsWith('/accept'))!;
    // the default k goes along for the audit trail; U = 0 leaves the limit's own uncertainty and rule
    expect(JSON.parse(String(sent[1]!.body))).toEqual({ column: 'vout_1.5A_V', planVersionId: 11, stepKey: 'vout-load', limitKey: 'voutV@1.5', low: 4.96, high: 5.045, k: 4, reason: 'Pilot build P2: Ppk above 1.33' });
  });

  const analysisCalls = () => fetchMock.mock.calls.map(([u]) => new URL(String(u), 'http://x')).filter((u) => u.pathname.endsWith('/analysis'));

  it('asks the server again when k or U change, and the suggested and guarded limits follow', async () => {
    const { user } = renderApp(<CharacterizationScreen />, { signedInAs: engineer });
    // defaults: k = 4, U = 0 (a data set is not tied to a fixture, the hint says so)
    expect(await screen.findByTestId('suggested-limits')).toHaveTextContent('4.963 … 5.045 V');
    expect(screen.getByLabelText('Width k')).toHaveValue('4');
    expect(screen.getByLabelText('Guard U (V)')).toHaveValue('0');
    expect(screen.getByText(/U starts at 0 because a data set is not tied to a fixture/)).toBeInTheDocument();
    expect(screen.getByTestId('guarded-limits')).toHaveTextContent('4.963 … 5.045 V');

    await user.clear(screen.getByLabelText('Width k'));
    await user.paste('3');
    // self-constructed example: 5.0041 ± 3 × 0.0102 = 4.9735 … 5.0347
    await waitFor(() => expect(screen.getByTestId('suggested-limits')).toHaveTextContent('4.974 … 5.035 V'));
    expect(analysisCalls().at(-1)!.searchParams.get('k')).toBe('3');
    expect(screen.getByText('Suggested (mean ± 3·s)')).toBeInTheDocument();

    await user.clear(screen.getByLabelText('Guard U (V)'));
    await user.paste('0.005');
    // ILAC-G8:09/2019 §4.2.2 guarded acceptance: 4.9735 + 0.005 = 4.9785, 5.0347 − 0.005 = 5.0297
    await waitFor(() => expect(screen.getByTestId('guarded-limits')).toHaveTextContent('4.979 … 5.030 V'));
    expect(screen.getByText('Guarded by U = 0.005 V')).toBeInTheDocument();
    const last = analysisCalls().at(-1)!;
    expect([last.searchParams.get('k'), last.searchParams.get('uncertainty')]).toEqual(['3', '0.005']);
  });

  it('marks k and U outside the API\'s bounds on their fields, in its words, and does not send them', async () => {
    const { user } = renderApp(<CharacterizationScreen />, { signedInAs: engineer });
    await screen.findByTestId('suggested-limits');
    await user.clear(screen.getByLabelText('Width k'));
    await user.paste('12');
    expect(await screen.findByText('k must be at most 10')).toBeInTheDocument();
    await user.clear(screen.getByLabelText('Width k'));
    await user.paste('0.2');
    expect(await screen.findByText('k must be at least 0.5')).toBeInTheDocument();
    await user.clear(screen.getByLabelText('Width k'));
    expect(await screen.findByText(/k must be a number from 0.5 to 10/)).toBeInTheDocument();
    await user.paste('4');
    await user.clear(screen.getByLabelText('Guard U (V)'));
    await user.paste('-0.01');
    expect(await screen.findByText('uncertainty must be 0 or more')).toBeInTheDocument();
    // a U wider than k·s leaves no guarded zone: said on the field, before the server answers without a suggestion
    await user.clear(screen.getByLabelText('Guard U (V)'));
    await user.paste('0.05');
    expect(await screen.findByText(/U closes the guarded zone: keep it below k·s = 0\.0408 V/)).toBeInTheDocument();
    await new Promise((r) => setTimeout(r, 400));
    const sent = analysisCalls();
    expect(sent.some((u) => ['12', '0.2', ''].includes(u.searchParams.get('k') ?? 'none'))).toBe(false);
    expect(sent.some((u) => u.searchParams.get('uncertainty') === '-0.01')).toBe(false);
    // put into draft waits for a good k and U
    await user.click(screen.getByLabelText('Proposed low (V)'));
    await user.paste('4.96');
    await user.clear(screen.getByLabelText('Width k'));
    await user.paste('20');
    expect(await screen.findByText('Correct k or U above first.')).toBeInTheDocument();
  });

  it('puts the chosen k and U into the draft: U guards the limit, and the confirmation says what the station will accept', async () => {
    const { user } = renderApp(<CharacterizationScreen />, { signedInAs: engineer });
    await screen.findByTestId('suggested-limits');
    await user.clear(screen.getByLabelText('Width k'));
    await user.paste('3');
    await user.clear(screen.getByLabelText('Guard U (V)'));
    await user.paste('0.005');
    await waitFor(() => expect(screen.getByTestId('suggested-limits')).toHaveTextContent('4.974 … 5.035 V'));
    await user.click(screen.getByRole('button', { name: 'Use suggested limits' }));
    expect(screen.getByLabelText('Proposed low (V)')).toHaveValue('4.974');
    await waitFor(() => expect(screen.getByLabelText('Draft version', { selector: 'input' })).toHaveValue('v2 — draft'));
    await user.click(screen.getByLabelText('Limit', { exact: false, selector: 'input' }));
    await user.click(await screen.findByRole('option', { name: /voutV@1\.5/ }));
    await user.click(screen.getByLabelText('Reason'));
    await user.paste('Pilot build P2 at 3 s');
    await user.click(screen.getByRole('button', { name: 'Put into draft…' }));
    const dialog = await screen.findByRole('dialog', { name: 'Put these limits into the draft?' });
    expect(within(dialog).getByTestId('accept-guard')).toHaveTextContent('Uncertainty U becomes ± 0.005 V with the guarded rule: the station accepts 4.979 … 5.030 V');
    await user.click(within(dialog).getByRole('button', { name: 'Put into draft' }));
    expect(await screen.findByText('Limit put into the draft')).toBeInTheDocument();
    const sent = fetchMock.mock.calls.find(([u]) => String(u).endsWith('/accept'))!;
    expect(JSON.parse(String(sent[1]!.body))).toEqual({
      column: 'vout_1.5A_V',
      planVersionId: 11,
      stepKey: 'vout-load',
      limitKey: 'voutV@1.5',
      low: 4.974,
      high: 5.035,
      k: 3,
      uncertainty: 0.005,
      rule: 'guarded',
      reason: 'Pilot build P2 at 3 s',
    });
  });
});
