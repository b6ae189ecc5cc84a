import { screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import type { Lot, LotDetail, LotUnit, ReleaseCheck } from '../api/types';
import { LotsScreen } from './lots-screen';

const lot = (over: Partial<Lot>): Lot => ({
  id: 3,
  code: 'LB-2649-01',
  state: 'open',
  holdReason: null,
  plannedQuantity: 4,
  product: { id: 1, partNumber: 'OB-BK0503', name: 'Buck module 12 V to 5 V, 3 A' },
  createdAt: '2026-12-01T08:00:00.000Z',
  unitCounts: { untested: 1, passed: 2, failed: 1, in_repair: 0, scrapped: 0, total: 4 },
  releasedAt: null,
  releasedBy: null,
  closedAt: null,
  closedBy: null,
  closeReason: null,
  hasCertificate: false,
  ...over,
});

const LOTS: Lot[] = [
  lot({}),
  lot({ id: 4, code: 'LB-2649-02', state: 'on_hold', holdReason: 'FPY of the last 20 units below 90 %', unitCounts: { untested: 0, passed: 9, failed: 1, in_repair: 0, scrapped: 0, total: 10 }, plannedQuantity: 10, createdAt: '2026-12-02T08:00:00.000Z' }),
  lot({ id: 5, code: 'LB-2648-07', state: 'released', product: { id: 2, partNumber: 'OB-BK3305', name: 'Buck 24 V to 3.3 V' }, unitCounts: { untested: 0, passed: 20, failed: 0, in_repair: 0, scrapped: 0, total: 20 }, plannedQuantity: 20, createdAt: '2026-11-20T08:00:00.000Z', hasCertificate: true, releasedAt: '2026-11-25T10:00:00.000Z', releasedBy: 'Quality engineer' }),
];
const UNITS: LotUnit[] = [
  { serial: 'K5A-2649-00001', state: 'passed', testCount: 1, lastTestedAt: '2026-12-01T09:00:00.000Z' },
  { serial: 'K5A-2649-00002', state: 'passed', testCount: 1, lastTestedAt: '2026-12-01T09:05:00.000Z' },
  { serial: 'K5A-2649-00003', state: 'failed', testCount: 1, lastTestedAt: '2026-12-01T09:10:00.000Z' },
  { serial: 'K5A-2649-00004', state: 'untested', testCount: 0, lastTestedAt: null },
];

let releaseCheck: ReleaseCheck;
let calls: { method: string; path: string; body: unknown }[];
let answers: Record<string, () => Response>;

beforeEach(() => {
  calls = [];
  answers = {};
  releaseCheck = { releasable: false, blockers: [{ code: 'units_untested', message: '1 unit not yet tested', serials: ['K5A-2649-00004'] }, { code: 'units_failed', message: '1 unit failed and not scrapped or retested', serials: ['K5A-2649-00003'] }] };
  vi.stubGlobal(
    'fetch',
    vi.fn(async (input: string, init?: RequestInit) => {
      const url = new URL(input, 'http://localhost');
      const method = init?.method ?? 'GET';
      const body = typeof init?.body === 'string' ? JSON.parse(init.body) : init?.body;
      calls.push({ method, path: url.pathname, body });
      const key = `${method} ${url.pathname}`;
      if (answers[key]) return answers[key]();
      const detail = (l: Lot): LotDetail => ({ ...l, firstSerial: 'K5A-2649-00001', lastSerial: 'K5A-2649-00004' });
      if (key === 'GET /api/lots') return jsonResponse(200, LOTS);
      if (key === 'GET /api/products') return jsonResponse(200, [{ id: 1, partNumber: 'OB-BK0503', name: 'Buck module 12 V to 5 V, 3 A', serialPattern: String.raw`^K5A-\d{4}-\d{5}$`, active: true }]);
      const m = /^\/api\/lots\/(\d+)(\/.*)?$/.exec(url.pathname);
      if (m && method === 'GET') {
        const l = LOTS.find((x) => x.id === Number(m[1]))!;
        if (!m[2]) return jsonResponse(200, detail(l));
        if (m[2] === '/units') return jsonResponse(200, UNITS);
        if (m[2] === '/release-check') return jsonResponse(200, releaseCheck);
      }
      return jsonResponse(404, { statusCode: 404, error: 'Not Found', message: `no answer for ${key}` });
    }),
  );
});
afterEach(() => vi.unstubAllGlobals());

describe('LotsScreen', { timeout: 30_000 }, () => {
  it('lists lots with counts and the state in words, the hold with its reason, sortable and filterable', async () => {
    const { user } = renderApp(<LotsScreen />, { signedInAs: makeUser(['quality']), route: '/lots' });
    const table = await screen.findByRole('table', { name: 'Lots' });
    const rows = () => within(table).getAllByRole('row').slice(1);
    // newest first
    expect(rows().map((r) => within(r).getAllByRole('cell')[0].textContent)).toEqual(['LB-2649-02', 'LB-2649-01', 'LB-2648-07']);
    expect(rows()[0]).toHaveTextContent('On hold');
    expect(rows()[0]).toHaveTextContent('FPY of the last 20 units below 90 %');
    expect(rows()[1]).toHaveTextContent('Open for testing');
    // planned, registered, tested, passed
    expect(within(rows()[1]).getAllByRole('cell').slice(2, 6).map((c) => c.textContent)).toEqual(['4', '4', '3', '2']);
    expect(rows()[2]).toHaveTextContent('Released');

    await user.click(screen.getByRole('button', { name: 'Sort by passed' }));
    expect(rows().map((r) => within(r).getAllByRole('cell')[0].textContent)).toEqual(['LB-2649-01', 'LB-2649-02', 'LB-2648-07']);
    expect(within(table).getByRole('columnheader', { name: /Passed/ })).toHaveAttribute('aria-sort', 'ascending');

    await user.type(screen.getByRole('textbox', { name: 'Search lots' }), 'bk3305');
    expect(rows()).toHaveLength(1);
    expect(rows()[0]).toHaveTextContent('LB-2648-07');
  });

  it('shows a lot’s units linked to their history and lists plainly what blocks the release', async () => {
    const { user } = renderApp(<LotsScreen />, { signedInAs: makeUser(['engineer']), route: '/lots' });
    await user.click(await screen.findByRole('button', { name: 'Open lot LB-2649-01' }));
    const units = await screen.findByRole('table', { name: 'Units of lot LB-2649-01' });
    expect(within(units).getByRole('link', { name: 'K5A-2649-00003' })).toHaveAttribute('href', '/units/K5A-2649-00003');
    expect(within(units).getAllByRole('row')[3]).toHaveTextContent('Failed');
    const blockers = await screen.findByRole('status');
    expect(blockers).toHaveTextContent('Not ready to release');
    expect(blockers).toHaveTextContent('1 unit not yet tested');
    expect(blockers).toHaveTextContent('1 unit failed and not scrapped or retested');
    // engineers see the blockers but do not release
    expect(screen.queryByRole('button', { name: 'Release lot' })).toBeNull();
    expect(screen.getByText('Quality or an administrator releases a lot.')).toBeInTheDocument();
  });

  it('lets quality release a ready lot after a confirmation, then offers the certificate', async () => {
    releaseCheck = { releasable: true, blockers: [] };
    const released = { ...LOTS[0], state: 'released', hasCertificate: true, releasedAt: '2026-12-02T14:07:00.000Z', releasedBy: 'Test quality', firstSerial: null, lastSerial: null };
    answers['POST /api/lots/3/release'] = () => {
      // from now on the server has the lot released
      answers['GET /api/lots/3'] = () => jsonResponse(200, released);
      return jsonResponse(200, released);
    };
    const { user } = renderApp(<LotsScreen />, { signedInAs: makeUser(['quality']), route: '/lots?lot=3' });
    expect(await screen.findByText('Ready to release')).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Release lot' }));
    const dialog = await screen.findByRole('dialog', { name: 'Release lot LB-2649-01?' });
    await user.type(within(dialog).getByRole('textbox', { name: /Comment/ }), 'Order 4471');
    await user.click(within(dialog).getByRole('button', { name: 'Release and issue certificate' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'POST' && c.path === '/api/lots/3/release')).toBe(true));
    expect(calls.find((c) => c.path === '/api/lots/3/release')!.body).toEqual({ comment: 'Order 4471' });
    expect(await screen.findByRole('button', { name: 'Download certificate of conformance (PDF)' })).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Close lot' })).toBeInTheDocument();
  });

  it('shows a hold with its reason on the lot', async () => {
    releaseCheck = { releasable: false, blockers: [{ code: 'lot_on_hold', message: 'Lot is on hold: FPY of the last 20 units below 90 %. A quality user lifts the hold first.' }] };
    renderApp(<LotsScreen />, { signedInAs: makeUser(['quality']), route: '/lots?lot=4' });
    expect(await screen.findByText('On hold: testing is blocked')).toBeInTheDocument();
    expect(await screen.findByText(/Lot is on hold: FPY of the last 20 units below 90 %/)).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Release lot' })).toBeDisabled();
  });

  it('creates a lot from a serial range and shows a refusal next to the field', async () => {
    answers['POST /api/lots'] = () =>
      jsonResponse(400, { statusCode: 400, error: 'Bad Request', message: 'the planned quantity is 5 but K5A-2650-00001 to K5A-2650-00004 holds 4 serials; they must agree', details: [{ field: 'plannedQuantity', problems: ['the planned quantity is 5 but K5A-2650-00001 to K5A-2650-00004 holds 4 serials; they must agree'] }] });
    const { user } = renderApp(<LotsScreen />, { signedInAs: makeUser(['engineer']), route: '/lots' });
    await user.click(await screen.findByRole('button', { name: 'New lot' }));
    const dialog = await screen.findByRole('dialog', { name: 'New lot' });
    await user.type(within(dialog).getByRole('textbox', { name: /Lot code/ }), 'lb-2650-01');
    await user.type(within(dialog).getByRole('textbox', { name: /Planned quantity/ }), '5');
    await user.click(within(dialog).getByLabelText(/Product/, { selector: 'input' }));
    await user.click(await screen.findByRole('option', { name: /OB-BK0503/ }));
    await user.type(within(dialog).getByRole('textbox', { name: 'First serial' }), 'K5A-2650-00001');
    await user.type(within(dialog).getByRole('textbox', { name: 'Last serial' }), 'K5A-2650-00004');
    await user.click(within(dialog).getByRole('button', { name: 'Create lot' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'POST' && c.path === '/api/lots')).toBe(true));
    expect(calls.find((c) => c.method === 'POST')!.body).toEqual({ code: 'LB-2650-01', productId: 1, plannedQuantity: 5, firstSerial: 'K5A-2650-00001', lastSerial: 'K5A-2650-00004' });
    expect(await within(dialog).findByRole('alert')).toHaveTextContent('holds 4 serials');
  });

  it('lists every bad row of a refused lot file', async () => {
    answers['POST /api/lots/import'] = () =>
      jsonResponse(400, {
        statusCode: 400,
        error: 'Bad Request',
        message: 'lots.csv was refused: 2 problems in 2 rows. Nothing was imported; correct the file and upload it again.',
        details: { code: 'lot_file_refused', problems: [{ row: 3, column: 'product', message: 'there is no product OB-XX0000' }, { row: 5, column: 'lot_code', message: 'lot code LB-2649-01 is already used' }] },
      });
    const { user } = renderApp(<LotsScreen />, { signedInAs: makeUser(['quality']), route: '/lots' });
    await user.click(await screen.findByRole('button', { name: 'Import CSV' }));
    const dialog = await screen.findByRole('dialog', { name: 'Import lots from a CSV file' });
    const input = dialog.querySelector('input[type="file"]') as HTMLInputElement;
    await user.upload(input, new File(['lot_code,product\n'], 'lots.csv', { type: 'text/csv' }));
    await user.click(within(dialog).getByRole('button', { name: 'Import' }));
    const problems = await within(dialog).findByRole('table', { name: 'Problems in the file' });
    const rows = within(problems).getAllByRole('row').slice(1);
    expect(rows.map((r) => within(r).getAllByRole('cell').map((c) => c.textContent))).toEqual([
      ['3', 'product', 'there is no product OB-XX0000'],
      ['5', 'lot_code', 'lot code LB-2649-01 is already used'],
    ]);
    expect(within(dialog).getByRole('alert')).toHaveTextContent('Nothing was imported');
    expect(calls.find((c) => c.path === '/api/lots/import')!.body).toBeInstanceOf(FormData);
  });
});
