import { act, renderHook } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { useVerdictSound, verdictTones } from './use-verdict-sound';

class FakeAudioContext {
  static made: FakeAudioContext[] = [];
  state = 'running';
  currentTime = 0;
  destination = {};
  oscillators: { type: string; hz: number }[] = [];
  constructor() {
    FakeAudioContext.made.push(this);
  }
  resume() {
    return Promise.resolve();
  }
  createOscillator() {
    const osc = {
      type: '',
      frequency: { value: 0 },
      connect: (g: unknown) => g,
      start: () => this.oscillators.push({ type: osc.type, hz: osc.frequency.value }),
      stop: () => {},
    };
    return osc;
  }
  createGain() {
    const gain = {
      gain: { setValueAtTime: () => {}, linearRampToValueAtTime: () => {} },
      connect: (d: unknown) => d,
    };
    return gain;
  }
}

describe('useVerdictSound', () => {
  it('pass and fail sound different', () => {
    const pass = verdictTones.pass.map((t) => `${t.wave}@${t.hz}`).join(',');
    const fail = verdictTones.fail.map((t) => `${t.wave}@${t.hz}`).join(',');
    expect(pass).not.toBe(fail);
    // pass rises, fail stays low
    expect(verdictTones.pass[1]!.hz).toBeGreaterThan(verdictTones.pass[0]!.hz);
    expect(Math.max(...verdictTones.fail.map((t) => t.hz))).toBeLessThan(Math.min(...verdictTones.pass.map((t) => t.hz)));
  });

  it('plays after the first key press, stays silent when muted, and remembers the mute', () => {
    vi.stubGlobal('AudioContext', FakeAudioContext);
    FakeAudioContext.made = [];
    const { result, unmount } = renderHook(() => useVerdictSound());
    act(() => result.current.play('pass'));
    expect(FakeAudioContext.made).toHaveLength(0);
    act(() => result.current.unlock());
    act(() => result.current.play('fail'));
    expect(FakeAudioContext.made[0]!.oscillators.map((o) => o.hz)).toEqual([220, 220, 220]);
    act(() => result.current.toggleMuted());
    expect(window.localStorage.getItem('railwright.station.muted')).toBe('1');
    act(() => result.current.play('pass'));
    expect(FakeAudioContext.made[0]!.oscillators).toHaveLength(3);
    unmount();
    const again = renderHook(() => useVerdictSound());
    expect(again.result.current.muted).toBe(true);
    vi.unstubAllGlobals();
  });
});
