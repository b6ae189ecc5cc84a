import { fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { renderApp } from '@/testing/render';
import { SAFETY_KEY_GUARD_MS, SafetyDialog } from './safety-dialog';

describe('SafetyDialog', () => {
  let now = 0;
  beforeEach(() => {
    now = 10_000;
    vi.spyOn(performance, 'now').mockImplementation(() => now);
  });
  afterEach(() => vi.restoreAllMocks());

  const open = () => {
    const onConfirm = vi.fn();
    const onCancel = vi.fn();
    const r = renderApp(<SafetyDialog opened serial="K5A-2648-00017" partNumber="OB-BK0503" onConfirm={onConfirm} onCancel={onCancel} />);
    now += SAFETY_KEY_GUARD_MS + 1;
    return { ...r, onConfirm, onCancel };
  };

  it('names the unit and warns about live and hot parts', () => {
    open();
    expect(screen.getByRole('dialog', { name: 'Before power is applied' })).toBeInTheDocument();
    expect(screen.getByText('K5A-2648-00017')).toBeInTheDocument();
    expect(screen.getByText(/fixture lid is closed/)).toBeInTheDocument();
    expect(screen.getByText(/may be hot/)).toBeInTheDocument();
  });

  it('puts the focus on "Apply power and test", so Enter confirms', async () => {
    const { onConfirm } = open();
    const confirm = screen.getByRole('button', { name: /Apply power and test/ });
    await waitFor(() => expect(confirm).toHaveFocus());
    fireEvent.keyDown(confirm, { key: 'Enter' });
    expect(onConfirm).toHaveBeenCalledTimes(1);
  });

  it('Space confirms too, and only once', () => {
    const { onConfirm } = open();
    const confirm = screen.getByRole('button', { name: /Apply power and test/ });
    fireEvent.keyDown(confirm, { key: ' ' });
    fireEvent.keyDown(confirm, { key: ' ' });
    fireEvent.keyDown(confirm, { key: 'Enter' });
    expect(onConfirm).toHaveBeenCalledTimes(1);
  });

  it('Esc cancels without starting', () => {
    const { onConfirm, onCancel } = open();
    fireEvent.keyDown(screen.getByRole('button', { name: /Apply power and test/ }), { key: 'Escape' });
    expect(onCancel).toHaveBeenCalledTimes(1);
    expect(onConfirm).not.toHaveBeenCalled();
  });

  it('ignores an Enter that arrives right after opening (the tail of a scan)', () => {
    const onConfirm = vi.fn();
    renderApp(<SafetyDialog opened serial="K5A-2648-00017" onConfirm={onConfirm} onCancel={() => {}} />);
    fireEvent.keyDown(screen.getByRole('button', { name: /Apply power and test/ }), { key: 'Enter' });
    expect(onConfirm).not.toHaveBeenCalled();
    now += SAFETY_KEY_GUARD_MS + 1;
    fireEvent.keyDown(screen.getByRole('button', { name: /Apply power and test/ }), { key: 'Enter' });
    expect(onConfirm).toHaveBeenCalledTimes(1);
  });

  it('Enter on the focused Cancel button cancels', () => {
    const { onConfirm, onCancel } = open();
    const cancel = screen.getByRole('button', { name: /Cancel/ });
    cancel.focus();
    fireEvent.keyDown(cancel, { key: 'Enter' });
    expect(onCancel).toHaveBeenCalledTimes(1);
    expect(onConfirm).not.toHaveBeenCalled();
  });
});
