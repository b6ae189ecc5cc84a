import { fireEvent, screen, waitFor } from '@testing-library/react';
import { Route, Routes, useLocation } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import { SerialSearch } from './serial-search';

let fetchMock: ReturnType<typeof vi.fn>;

function Probe() {
  const loc = useLocation();
  return <output data-testid="location">{loc.pathname}</output>;
}

function renderBox() {
  return renderApp(
    <>
      <SerialSearch />
      <Routes>
        <Route path="*" element={<Probe />} />
      </Routes>
    </>,
    { route: '/runs', signedInAs: makeUser(['quality']) },
  );
}

beforeEach(() => {
  fetchMock = vi.fn(async (input: RequestInfo | URL) => {
    const url = new URL(String(input), 'http://x');
    if (url.pathname === '/api/units/K5A-2649-00017') return jsonResponse(200, { serial: 'K5A-2649-00017' });
    return jsonResponse(404, { message: 'No unit', details: { code: 'unknown_serial' } });
  });
  vi.stubGlobal('fetch', fetchMock);
});

afterEach(() => vi.unstubAllGlobals());

describe('SerialSearch', { timeout: 20_000 }, () => {
  it('opens the unit history of a typed serial, whatever its case', async () => {
    renderBox();
    const box = screen.getByRole('textbox', { name: 'Serial' });
    fireEvent.change(box, { target: { value: '  k5a-2649-00017 ' } });
    fireEvent.submit(box.closest('form')!);
    await waitFor(() => expect(screen.getByTestId('location')).toHaveTextContent('/units/K5A-2649-00017'));
  });

  it('says in words that a serial is unknown and stays on the page', async () => {
    renderBox();
    const box = screen.getByRole('textbox', { name: 'Serial' });
    fireEvent.change(box, { target: { value: 'k5a-0000-00000' } });
    fireEvent.submit(box.closest('form')!);
    expect(await screen.findByRole('alert')).toHaveTextContent('No unit with serial K5A-0000-00000 is registered. Check the label.');
    expect(screen.getByTestId('location')).toHaveTextContent('/runs');
  });

  it('takes a scan typed fast outside any field (keystrokes ending in Enter)', async () => {
    renderBox();
    let t = 1_000_000;
    vi.spyOn(Date, 'now').mockImplementation(() => t);
    for (const key of 'K5A-2649-00017') {
      t += 10;
      fireEvent.keyDown(document.body, { key });
    }
    t += 10;
    fireEvent.keyDown(document.body, { key: 'Enter' });
    vi.restoreAllMocks();
    await waitFor(() => expect(screen.getByTestId('location')).toHaveTextContent('/units/K5A-2649-00017'));
  });

  it('ignores slow typing on the page: it is not a scan', async () => {
    renderBox();
    let t = 1_000_000;
    vi.spyOn(Date, 'now').mockImplementation(() => t);
    for (const key of 'K5A-2649-00017') {
      t += 300;
      fireEvent.keyDown(document.body, { key });
    }
    t += 300;
    fireEvent.keyDown(document.body, { key: 'Enter' });
    vi.restoreAllMocks();
    await new Promise((r) => setTimeout(r, 50));
    expect(fetchMock).not.toHaveBeenCalled();
    expect(screen.getByTestId('location')).toHaveTextContent('/runs');
  });
});
