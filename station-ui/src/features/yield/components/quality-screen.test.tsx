import { screen, waitFor, within } from '@testing-library/react';
import { Route, Routes } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import { QualityScreen } from './quality-screen';
import { capabilityView, controlChart, figures, pareto, paretoUnits } from './test-data';

// the live link is exercised in the real-browser test; here it must not try to open a socket
vi.mock('@/lib/socket', () => ({
  connectLive: () => ({ on: () => undefined, emit: () => undefined, removeAllListeners: () => undefined, disconnect: () => undefined }),
}));

let fetchMock: ReturnType<typeof vi.fn>;
const requested = (path: string) => fetchMock.mock.calls.map(([u]) => new URL(String(u), 'http://x')).filter((u) => u.pathname === path);

beforeEach(() => {
  fetchMock = vi.fn(async (input: RequestInfo | URL) => {
    const url = new URL(String(input), 'http://x');
    switch (url.pathname) {
      case '/api/yield/figures':
        return jsonResponse(200, { ...figures, by: url.searchParams.get('by') ?? 'lot' });
      case '/api/yield/pareto':
        return jsonResponse(200, pareto);
      case '/api/yield/pareto/units':
        return jsonResponse(200, paretoUnits);
      case '/api/yield/quantities':
        return jsonResponse(200, [{ step: 'vout-no-load', stepName: 'Output voltage at no load', quantity: 'voutV', name: 'Output voltage, no load', unit: 'V' }]);
      case '/api/yield/capability':
        return jsonResponse(200, capabilityView);
      case '/api/yield/control-chart':
        return jsonResponse(200, controlChart);
      case '/api/lots':
        return jsonResponse(200, [{ id: 1, code: 'LB-2644-01', state: 'released', product: { id: 1, partNumber: 'OB-BK0503', name: 'Buck' } }]);
      case '/api/products':
        return jsonResponse(200, [{ id: 1, partNumber: 'OB-BK0503', name: 'Buck module 12 V to 5 V' }]);
      case '/api/repair-records/pareto':
        return jsonResponse(200, { records: 0, bars: [] });
      case '/api/stations':
        return jsonResponse(200, [{ id: 1, code: 'EOL-1', name: 'End-of-line 1' }]);
      default:
        return jsonResponse(404, { message: 'not here' });
    }
  });
  vi.stubGlobal('fetch', fetchMock);
});
afterEach(() => vi.unstubAllGlobals());

function renderScreen(route = '/quality') {
  return renderApp(
    <Routes>
      <Route path="/quality" element={<QualityScreen />} />
      <Route path="/runs/:id" element={<p>run detail page</p>} />
    </Routes>,
    { route, signedInAs: makeUser(['quality']) },
  );
}

// the whole screen with its charts renders in jsdom: slower than a single component on a shared machine
describe('QualityScreen', { timeout: 30_000 }, () => {
  it('shows FPY, final yield and RTY with the interval method named', async () => {
    renderScreen();
    const fpy = await screen.findByRole('region', { name: 'First-pass yield (FPY)' });
    expect(within(fpy).getByText('92.0')).toBeInTheDocument();
    expect(within(fpy).getByText('87.2 – 95.1 %')).toBeInTheDocument();
    expect(within(fpy).getByText(/95 % Wilson score interval/)).toBeInTheDocument();
    expect(screen.getByRole('region', { name: 'Final yield' })).toHaveTextContent('98.0');
    expect(screen.getByRole('region', { name: 'Rolled throughput yield (RTY)' })).toHaveTextContent('90.0');
  });

  it('sorts the breakdown table by a column and asks the server for another dimension', async () => {
    const { user } = renderScreen();
    const table = await screen.findByRole('table', { name: 'Yield by lot' });
    const firstCell = () => within(table).getAllByRole('row')[1].querySelector('td')!.textContent;
    expect(firstCell()).toBe('LB-2644-01');
    await user.click(within(table).getByRole('button', { name: /FPY/ }));
    // FPY sorts highest first: LB-2644-01 (94 %) above LB-2645-01 (90 %); a second click reverses
    expect(firstCell()).toBe('LB-2644-01');
    await user.click(within(table).getByRole('button', { name: /FPY/ }));
    expect(firstCell()).toBe('LB-2645-01');
    await user.click(screen.getAllByLabelText('Break down by')[0]);
    await user.click(await screen.findByRole('option', { name: 'Station' }));
    await waitFor(() => expect(requested('/api/yield/figures').some((u) => u.searchParams.get('by') === 'station')).toBe(true));
  });

  it('lists the units behind a Pareto bar and links each serial to its run', async () => {
    const { user } = renderScreen();
    const table = await screen.findByRole('table', { name: 'Failure Pareto' });
    expect(within(table).getByRole('row', { name: /Output ripple/ })).toHaveTextContent('866.7 %66.7 %');
    await user.click(within(table).getByRole('button', { name: 'Output ripple' }));
    const units = await screen.findByRole('table', { name: 'Units behind the bar' });
    expect(requested('/api/yield/pareto/units')[0].searchParams.get('key')).toBe('ripple');
    const link = within(units).getByRole('link', { name: 'K5A-2644-00017' });
    expect(link).toHaveAttribute('href', '/runs/321');
    expect(within(units).getByText('41.2 mV')).toBeInTheDocument();
    await user.click(link);
    expect(await screen.findByText('run detail page')).toBeInTheDocument();
  });

  it('asks for a product or lot before capability, then shows indices with intervals, ppm and run-rule findings', async () => {
    renderScreen('/quality?productId=1');
    const indices = await screen.findByRole('table', { name: 'Capability indices' }, { timeout: 8_000 });
    const cpk = within(indices).getByRole('row', { name: /Cpk/ });
    expect(cpk).toHaveTextContent('2.07');
    expect(cpk).toHaveTextContent('1.63 – 2.50');
    expect(screen.getByRole('table', { name: 'Expected parts per million outside the limits' })).toBeInTheDocument();
    const findings = await screen.findByRole('region', { name: 'Run-rule findings' }, { timeout: 8_000 });
    expect(findings).toHaveTextContent('WE1 point 3 is more than 3 σ above the centre line (K5A-3)');
    expect(requested('/api/yield/capability')[0].searchParams.get('step')).toBe('vout-no-load');
  });

  it('without a product or lot explains why there is no capability view', async () => {
    renderScreen();
    expect(await screen.findAllByText('Choose a product or a lot in the filters first')).not.toHaveLength(0);
    expect(requested('/api/yield/capability')).toHaveLength(0);
  });

  it('sends the filters from the address with every request', async () => {
    renderScreen('/quality?lotId=1&from=2026-10-01&to=2026-10-31&stationId=1');
    await screen.findByRole('region', { name: 'First-pass yield (FPY)' });
    const q = requested('/api/yield/figures')[0].searchParams;
    expect([q.get('lotId'), q.get('from'), q.get('to'), q.get('stationId')]).toEqual(['1', '2026-10-01', '2026-10-31', '1']);
    expect(screen.getByLabelText('From')).toHaveValue('2026-10-01');
  });
});
