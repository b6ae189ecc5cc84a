import { fireEvent, screen } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { renderApp } from '@/testing/render';
import { SafetyDialog } from './safety-dialog';

describe('SafetyDialog', () => {
  const open = (props: Partial<Parameters<typeof SafetyDialog>[0]> = {}) => {
    const onPointerConfirm = vi.fn();
    const onCancel = vi.fn();
    const r = renderApp(
      <SafetyDialog opened serial="K5A-2648-00017" partNumber="OB-BK0503" attempt={2} maxAttempts={3} onPointerConfirm={onPointerConfirm} onCancel={onCancel} {...props} />,
    );
    return { ...r, onPointerConfirm, onCancel };
  };

  it('names the unit, the attempt, and warns about live and hot parts', () => {
    open();
    expect(screen.getByRole('dialog', { name: 'Before power is applied' })).toBeInTheDocument();
    expect(screen.getByText('K5A-2648-00017')).toBeInTheDocument();
    expect(screen.getByText('Attempt 2 of 3')).toBeInTheDocument();
    expect(screen.getByText(/fixture lid is closed/)).toBeInTheDocument();
    expect(screen.getByText(/may be hot/)).toBeInTheDocument();
  });

  it('says on screen which key applies power, and that Enter does not', () => {
    open();
    const help = screen.getByTestId('safety-key-help');
    expect(help).toHaveTextContent('Press F9 to apply power');
    expect(help).toHaveTextContent('Enter does not start the test');
    expect(screen.getByRole('button', { name: /Apply power and test\s*F9/ })).toBeInTheDocument();
  });

  it('a mouse press on the button confirms', async () => {
    const { user, onPointerConfirm } = open();
    await user.click(screen.getByRole('button', { name: /Apply power and test/ }));
    expect(onPointerConfirm).toHaveBeenCalledTimes(1);
  });

  it('a keyboard "click" on the button (Enter or Space on a focused button) does not confirm', () => {
    const { onPointerConfirm } = open();
    // what the browser fires when Enter/Space activates a focused button: a click with detail 0
    fireEvent.click(screen.getByRole('button', { name: /Apply power and test/ }), { detail: 0 });
    expect(onPointerConfirm).not.toHaveBeenCalled();
  });

  it('the focus rests on the prompt text, not on a button', async () => {
    open();
    await vi.waitFor(() => expect(screen.getByTestId('safety-dialog')).toHaveFocus());
  });

  it('shows why a key did nothing', () => {
    open({ hint: 'not_enter' });
    expect(screen.getByRole('status')).toHaveTextContent('Enter does not apply power. Press F9 to start the test.');
  });
});
