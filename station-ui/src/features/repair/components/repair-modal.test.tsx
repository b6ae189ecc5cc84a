import { screen, waitFor } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import { RepairModal, type RepairTarget } from './repair-modal';

let fetchMock: ReturnType<typeof vi.fn>;
const posts = () => fetchMock.mock.calls.filter(([, init]) => (init as RequestInit | undefined)?.method === 'POST');
const sentBody = (i = 0) => JSON.parse(String((posts()[i][1] as RequestInit).body));

const CAUSES = [
  { id: 3, name: 'Cold joint', active: true, recordCount: 0 },
  { id: 5, name: 'Solder bridge', active: true, recordCount: 2 },
];

function renderModal(target: RepairTarget, onClose = vi.fn()) {
  return { onClose, ...renderApp(<RepairModal target={target} onClose={onClose} />, { signedInAs: makeUser(['engineer']) }) };
}

beforeEach(() => {
  fetchMock = vi.fn(async (input: RequestInfo | URL) => {
    const url = new URL(String(input), 'http://x');
    if (url.pathname.endsWith('/repair-causes')) return jsonResponse(200, CAUSES);
    if (url.pathname.endsWith('/repair')) {
      return jsonResponse(200, { action: 'receive', fromState: 'failed', toState: 'in_repair', auditEventId: 7, unit: { id: 1, serial: 'K5A-2648-00017', state: 'in_repair', testCount: 3 }, record: null });
    }
    return jsonResponse(200, { items: [], total: 0, steps: [] });
  });
  vi.stubGlobal('fetch', fetchMock);
});
afterEach(() => vi.unstubAllGlobals());

describe('RepairModal: receive', { timeout: 20_000 }, () => {
  it('requires a note and sends nothing without one', async () => {
    const { user } = renderModal({ serial: 'K5A-2648-00017', state: 'failed', step: 'receive' });
    await user.click(screen.getByRole('button', { name: 'Receive' }));
    expect(await screen.findByText('Write what you found or did; the note is the repair record.')).toBeInTheDocument();
    await user.type(screen.getByRole('textbox', { name: /Repair note/ }), 'ab');
    await user.click(screen.getByRole('button', { name: 'Receive' }));
    expect(await screen.findByText('Write at least 3 characters.')).toBeInTheDocument();
    expect(posts()).toHaveLength(0);
  });

  it('sends the step with the trimmed note to the unit and closes', async () => {
    const { user, onClose } = renderModal({ serial: 'K5A-2648-00017', state: 'failed', step: 'receive' });
    await user.type(screen.getByRole('textbox', { name: /Repair note/ }), '  on bench 2, Vout high ');
    await user.click(screen.getByRole('button', { name: 'Receive' }));
    await waitFor(() => expect(onClose).toHaveBeenCalled());
    const [[url]] = posts();
    expect(new URL(String(url), 'http://x').pathname).toBe('/api/units/K5A-2648-00017/repair');
    expect(sentBody()).toEqual({ action: 'receive', note: 'on bench 2, Vout high' });
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
    const { user, onClose } = renderModal({ serial: 'K5A-2648-00017', state: 'failed', step: 'receive' });
    await user.type(screen.getByRole('textbox', { name: /Repair note/ }), 'bench 2');
    await user.click(screen.getByRole('button', { name: 'Receive' }));
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('is in repair, so it cannot be received into repair');
    expect(alert).toHaveTextContent('The queue has been reloaded.');
    expect(onClose).not.toHaveBeenCalled();
  });
});

// typing three fields and picking from a list takes several seconds of jsdom work on a loaded 2-core machine
describe('RepairModal: record repair (issue 12)', { timeout: 20_000 }, () => {
  it('asks for symptom, cause (from the list), action and disposition, and sends nothing until each is given', async () => {
    const { user } = renderModal({ serial: 'K5A-2648-00018', state: 'in_repair', step: 'record' });
    expect(screen.getByRole('textbox', { name: /Symptom/ })).toBeInTheDocument();
    expect(screen.getByLabelText('Cause', { exact: false, selector: 'input' })).toBeInTheDocument();
    expect(screen.getByRole('textbox', { name: /Action taken/ })).toBeInTheDocument();
    expect(screen.getByRole('radio', { name: /Eligible for retest/ })).toBeChecked();
    expect(screen.getByRole('radio', { name: /Scrapped/ })).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Record and return for retest' }));
    expect(await screen.findByText('Say what was wrong with the unit.')).toBeInTheDocument();
    expect(screen.getByText('Choose the cause from the list.')).toBeInTheDocument();
    expect(screen.getByText('Say what was done to the unit.')).toBeInTheDocument();
    expect(posts()).toHaveLength(0);
  });

  it('returns the unit for retest with the record', async () => {
    const { user, onClose } = renderModal({ serial: 'K5A-2648-00018', state: 'in_repair', step: 'record' });
    await user.type(screen.getByRole('textbox', { name: /Symptom/ }), ' Output 5.6 V at full load ');
    await user.click(screen.getByLabelText('Cause', { exact: false, selector: 'input' }));
    await user.click(await screen.findByRole('option', { name: 'Solder bridge' }));
    await user.type(screen.getByRole('textbox', { name: /Action taken/ }), 'Removed bridge on U1');
    await user.click(screen.getByRole('button', { name: 'Record and return for retest' }));
    await waitFor(() => expect(onClose).toHaveBeenCalled());
    expect(sentBody()).toEqual({ action: 'return', symptom: 'Output 5.6 V at full load', causeId: 5, actionTaken: 'Removed bridge on U1' });
  });

  it('scraps only after the explicit confirmation; a unit still waiting can only be scrapped', async () => {
    const { user, onClose } = renderModal({ serial: 'K5A-2648-00017', state: 'failed', step: 'record' });
    expect(screen.getByRole('radio', { name: /Eligible for retest/ })).toBeDisabled();
    expect(screen.getByText('Receive the unit onto the bench first')).toBeInTheDocument();
    expect(screen.getByRole('radio', { name: /Scrapped/ })).toBeChecked();
    await user.type(screen.getByRole('textbox', { name: /Symptom/ }), 'No output');
    await user.click(screen.getByLabelText('Cause', { exact: false, selector: 'input' }));
    await user.click(await screen.findByRole('option', { name: 'Cold joint' }));
    await user.type(screen.getByRole('textbox', { name: /Action taken/ }), 'None: scrapped');
    await user.click(screen.getByRole('button', { name: 'Record and scrap' }));
    expect(await screen.findByText('Tick this to confirm the unit is scrapped for good.')).toBeInTheDocument();
    expect(posts()).toHaveLength(0);
    await user.click(screen.getByRole('checkbox', { name: 'Yes, scrap K5A-2648-00017 for good; it will never be tested again' }));
    await user.click(screen.getByRole('button', { name: 'Record and scrap' }));
    await waitFor(() => expect(onClose).toHaveBeenCalled());
    expect(sentBody()).toEqual({ action: 'scrap', symptom: 'No output', causeId: 3, actionTaken: 'None: scrapped' });
  });

  it('names the refused field in our words', async () => {
    fetchMock.mockImplementation(async (input: RequestInfo | URL) => {
      if (String(input).includes('/repair-causes')) return jsonResponse(200, CAUSES);
      return jsonResponse(400, {
        statusCode: 400,
        error: 'Bad Request',
        message: 'causeId: the cause "Solder bridge" is switched off',
        details: [{ field: 'causeId', problems: ['the cause "Solder bridge" is switched off'] }],
      });
    });
    const { user } = renderModal({ serial: 'K5A-2648-00018', state: 'in_repair', step: 'record' });
    await user.type(screen.getByRole('textbox', { name: /Symptom/ }), 'Output high');
    await user.click(screen.getByLabelText('Cause', { exact: false, selector: 'input' }));
    await user.click(await screen.findByRole('option', { name: 'Solder bridge' }));
    await user.type(screen.getByRole('textbox', { name: /Action taken/ }), 'Reflowed');
    await user.click(screen.getByRole('button', { name: 'Record and return for retest' }));
    expect(await screen.findByRole('alert')).toHaveTextContent('Cause: the cause "Solder bridge" is switched off');
  });
});
