import { screen, waitFor } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import { RepairModal, type RepairTarget } from './repair-modal';

let fetchMock: ReturnType<typeof vi.fn>;
const posts = () => fetchMock.mock.calls.filter(([, init]) => (init as RequestInit | undefined)?.method === 'POST');

function renderModal(target: RepairTarget, onClose = vi.fn()) {
  return { onClose, ...renderApp(<RepairModal target={target} onClose={onClose} />, { signedInAs: makeUser(['engineer']) }) };
}

beforeEach(() => {
  fetchMock = vi.fn(async (input: RequestInfo | URL) => {
    const url = new URL(String(input), 'http://x');
    if (url.pathname.endsWith('/repair')) {
      return jsonResponse(200, { action: 'receive', fromState: 'failed', toState: 'in_repair', auditEventId: 7, unit: { id: 1, serial: 'K5A-2648-00017', state: 'in_repair', testCount: 3 } });
    }
    return jsonResponse(200, { items: [], total: 0 });
  });
  vi.stubGlobal('fetch', fetchMock);
});
afterEach(() => vi.unstubAllGlobals());

describe('RepairModal', () => {
  it('requires a note and sends nothing without one', async () => {
    const { user } = renderModal({ serial: 'K5A-2648-00017', action: 'receive' });
    await user.click(screen.getByRole('button', { name: 'Receive' }));
    expect(await screen.findByText('Write what you found or did; the note is the repair record.')).toBeInTheDocument();
    await user.type(screen.getByRole('textbox', { name: /Repair note/ }), 'ab');
    await user.click(screen.getByRole('button', { name: 'Receive' }));
    expect(await screen.findByText('Write at least 3 characters.')).toBeInTheDocument();
    expect(posts()).toHaveLength(0);
  });

  it('sends the step with the trimmed note to the unit and closes', async () => {
    const { user, onClose } = renderModal({ serial: 'K5A-2648-00017', action: 'receive' });
    await user.type(screen.getByRole('textbox', { name: /Repair note/ }), '  on bench 2, Vout high ');
    await user.click(screen.getByRole('button', { name: 'Receive' }));
    await waitFor(() => expect(onClose).toHaveBeenCalled());
    const [[url, init]] = posts();
    expect(new URL(String(url), 'http://x').pathname).toBe('/api/units/K5A-2648-00017/repair');
    expect(JSON.parse(String((init as RequestInit).body))).toEqual({ action: 'receive', note: 'on bench 2, Vout high' });
  });

  it('scraps only after the explicit confirmation is ticked', async () => {
    const { user, onClose } = renderModal({ serial: 'K5A-2648-00017', action: 'scrap' });
    expect(screen.getByText(/cannot be undone/)).toBeInTheDocument();
    await user.type(screen.getByRole('textbox', { name: /Repair note/ }), 'cracked inductor');
    await user.click(screen.getByRole('button', { name: 'Scrap for good' }));
    expect(await screen.findByText('Tick this to confirm the unit is scrapped for good.')).toBeInTheDocument();
    expect(posts()).toHaveLength(0);
    await user.click(screen.getByRole('checkbox', { name: 'Yes, scrap K5A-2648-00017 for good; it will never be tested again' }));
    await user.click(screen.getByRole('button', { name: 'Scrap for good' }));
    await waitFor(() => expect(onClose).toHaveBeenCalled());
    expect(JSON.parse(String((posts()[0][1] as RequestInit).body))).toEqual({ action: 'scrap', note: 'cracked inductor' });
  });

  it('shows a refused step in words and stays open', async () => {
    fetchMock.mockImplementation(async () =>
      jsonResponse(409, {
        statusCode: 409,
        error: 'Conflict',
        message: 'K5A-2648-00017 is in repair, so it cannot be received into repair. From in repair you can return it for retest or scrap it.',
        details: { code: 'bad_repair_transition', state: 'in_repair', allowed: ['return', 'scrap'] },
      }),
    );
    const { user, onClose } = renderModal({ serial: 'K5A-2648-00017', action: 'receive' });
    await user.type(screen.getByRole('textbox', { name: /Repair note/ }), 'bench 2');
    await user.click(screen.getByRole('button', { name: 'Receive' }));
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('is in repair, so it cannot be received into repair');
    expect(alert).toHaveTextContent('The queue has been reloaded.');
    expect(onClose).not.toHaveBeenCalled();
  });
});
