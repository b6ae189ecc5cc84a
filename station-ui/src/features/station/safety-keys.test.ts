import { describe, expect, it } from 'vitest';
import { BURST_PAUSE_MS, CONFIRM_KEY, CONFIRM_QUIET_MS, SafetyKeyGuard, type GuardAction } from './safety-keys';

/** Types `text` at `gapMs` per key from `t0`, as a keyboard-wedge scanner does; returns the actions and the end time. */
function typeBurst(guard: SafetyKeyGuard, text: string, t0: number, gapMs = 5): { actions: GuardAction[]; t: number } {
  const actions: GuardAction[] = [];
  let t = t0;
  for (const ch of text) {
    actions.push(guard.key({ key: ch }, t));
    t += gapMs;
  }
  actions.push(guard.key({ key: 'Enter' }, t));
  return { actions, t };
}

describe('SafetyKeyGuard (the safety prompt key rules)', () => {
  const opened = (at = 1_000) => {
    const g = new SafetyKeyGuard();
    g.open(at);
    return g;
  };

  it('never confirms on Enter or Space, however long after opening', () => {
    const g = opened();
    expect(g.key({ key: 'Enter' }, 10_000)).toEqual({ kind: 'swallow', hint: 'not_enter' });
    expect(g.key({ key: ' ' }, 20_000)).toEqual({ kind: 'swallow', hint: 'not_enter' });
    expect(g.isOpen).toBe(true);
  });

  it(`confirms on ${CONFIRM_KEY} once the keyboard has been quiet for ${CONFIRM_QUIET_MS} ms`, () => {
    const g = opened(1_000);
    expect(g.key({ key: CONFIRM_KEY }, 1_000 + CONFIRM_QUIET_MS - 1)).toEqual({ kind: 'swallow', hint: 'too_soon' });
    expect(g.key({ key: CONFIRM_KEY }, 1_000 + CONFIRM_QUIET_MS)).toEqual({ kind: 'confirm' });
    // answered: a second press does nothing
    expect(g.key({ key: CONFIRM_KEY }, 5_000)).toEqual({ kind: 'pass' });
  });

  it(`${CONFIRM_KEY} right after another key (an Enter, a Shift) does not count; a held key's repeats never do`, () => {
    const g = opened(0);
    g.key({ key: 'Enter' }, 2_000);
    expect(g.key({ key: CONFIRM_KEY }, 2_100).kind).toBe('swallow');
    g.key({ key: 'Shift' }, 3_000);
    expect(g.key({ key: CONFIRM_KEY }, 3_200).kind).toBe('swallow');
    expect(g.key({ key: CONFIRM_KEY, repeat: true }, 9_000).kind).toBe('swallow');
    expect(g.key({ key: CONFIRM_KEY }, 9_000).kind).toBe('confirm');
  });

  it('Esc cancels', () => {
    expect(opened().key({ key: 'Escape' }, 5_000)).toEqual({ kind: 'cancel' });
  });

  it('a scanner burst (5 ms per key, then Enter) cancels the prompt and comes out whole as the next scan', () => {
    const g = opened(0);
    const { actions } = typeBurst(g, 'K5A-2648-00018', 2_000);
    expect(actions[0]).toEqual({ kind: 'burst_start' });
    expect(actions.slice(1, -1).every((a) => a.kind === 'swallow')).toBe(true);
    expect(actions.at(-1)).toEqual({ kind: 'burst_scan', serial: 'K5A-2648-00018' });
    expect(actions.some((a) => a.kind === 'confirm')).toBe(false);
    expect(g.isOpen).toBe(false);
    expect(g.collecting).toBe(false);
  });

  it('a scanner that ends its label with Tab, or sends Shift before capitals, gives the same scan', () => {
    const g = opened(0);
    const keys = ['Shift', 'K', '5', 'Shift', 'A', '-', '1', 'Tab'];
    const out = keys.map((key, i) => g.key({ key }, 1_000 + i * 5));
    expect(out.at(-1)).toEqual({ kind: 'burst_scan', serial: 'K5A-1' });
  });

  it(`a function key inside a burst does not confirm: it ends the burst as text for the scan field`, () => {
    const g = opened(0);
    g.key({ key: 'K' }, 1_000);
    g.key({ key: '5' }, 1_005);
    expect(g.key({ key: CONFIRM_KEY }, 5_000)).toEqual({ kind: 'burst_text', text: 'K5' });
    expect(g.isOpen).toBe(false);
  });

  it('a burst that pauses is a person typing: its text goes to the scan field', () => {
    const g = opened(0);
    g.key({ key: 'k' }, 1_000);
    g.key({ key: '5' }, 1_005);
    expect(g.pause(1_005 + BURST_PAUSE_MS - 1)).toBeNull();
    expect(g.pause(1_005 + BURST_PAUSE_MS)).toEqual({ kind: 'burst_text', text: 'k5' });
    expect(g.collecting).toBe(false);
  });

  it('a mouse press confirms only under the same quiet rule, and never while a scan is being collected', () => {
    const g = opened(0);
    expect(g.pointerMayConfirm(CONFIRM_QUIET_MS - 1)).toBe(false);
    expect(g.pointerMayConfirm(CONFIRM_QUIET_MS)).toBe(true);
    g.key({ key: 'K' }, 1_000);
    expect(g.pointerMayConfirm(9_000)).toBe(false);
  });

  it('lets every key through when the prompt is closed', () => {
    const g = new SafetyKeyGuard();
    expect(g.key({ key: 'Enter' }, 0)).toEqual({ kind: 'pass' });
    expect(g.key({ key: 'K' }, 0)).toEqual({ kind: 'pass' });
  });

  it('a label whose start reached the scan field before the prompt opened comes out whole', () => {
    const g = opened(0);
    expect(g.key({ key: '8' }, 1_000)).toEqual({ kind: 'burst_start' });
    g.prepend('K5A-264');
    const out = ['-', '0', '0', '0', '1', '8', 'Enter'].map((key, i) => g.key({ key }, 1_005 + i * 5));
    expect(out.at(-1)).toEqual({ kind: 'burst_scan', serial: 'K5A-2648-00018' });
  });
});
