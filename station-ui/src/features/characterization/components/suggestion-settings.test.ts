import { describe, expect, it } from 'vitest';
import { guardClosesProblem, readSuggestionSettings } from './suggestion-settings';

describe('readSuggestionSettings', () => {
  it('reads k and U; an empty U is 0 (no guard band)', () => {
    expect(readSuggestionSettings({ kText: 4, uText: 0 })).toEqual({ ok: true, k: 4, uncertainty: 0 });
    expect(readSuggestionSettings({ kText: '3.5', uText: '' })).toEqual({ ok: true, k: 3.5, uncertainty: 0 });
    expect(readSuggestionSettings({ kText: 2, uText: '0.004' })).toEqual({ ok: true, k: 2, uncertainty: 0.004 });
  });

  it('gives each field the API\'s message (station-api characterization dto bounds 0.5 ≤ k ≤ 10, U ≥ 0)', () => {
    expect(readSuggestionSettings({ kText: 0.4, uText: 0 })).toEqual({ ok: false, kError: 'k must be at least 0.5', uError: null });
    expect(readSuggestionSettings({ kText: 11, uText: -1 })).toEqual({ ok: false, kError: 'k must be at most 10', uError: 'uncertainty must be 0 or more' });
    expect(readSuggestionSettings({ kText: '', uText: 0 })).toMatchObject({ ok: false, kError: expect.stringMatching(/k must be a number/) });
  });
});

describe('guardClosesProblem', () => {
  it('says so once U reaches k·s, where the guarded limits x̄ ± k·s ∓ U meet (ILAC-G8:09/2019 §4.2.2)', () => {
    // self-constructed example: k·s = 4 × 0.0102 = 0.0408 V
    expect(guardClosesProblem(4, 0.04, 0.0102, 'V', 3)).toBeNull();
    expect(guardClosesProblem(4, 0.0408, 0.0102, 'V', 3)).toBe('U closes the guarded zone: keep it below k·s = 0.0408 V, or widen k');
    expect(guardClosesProblem(4, 0, 0.0102, 'V', 3)).toBeNull();
    expect(guardClosesProblem(4, 1, null, 'V', 3)).toBeNull();
  });
});
