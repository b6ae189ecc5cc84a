import { afterEach, describe, expect, it } from 'vitest';
import { BOARD_DISPLAY_TOKEN_KEY, displayTokenFor, runsThisShift } from './board-display';

afterEach(() => window.localStorage.removeItem(BOARD_DISPLAY_TOKEN_KEY));

describe('board display token', () => {
  it('keeps the token from the address and uses it even when a person is signed in', () => {
    expect(displayTokenFor('?display=abc.def', true)).toBe('abc.def');
    expect(window.localStorage.getItem(BOARD_DISPLAY_TOKEN_KEY)).toBe('abc.def');
  });

  it('uses a kept token only when nobody is signed in on the screen', () => {
    window.localStorage.setItem(BOARD_DISPLAY_TOKEN_KEY, 'kept');
    expect(displayTokenFor('', false)).toBe('kept');
    expect(displayTokenFor('', true)).toBeNull();
    expect(displayTokenFor('?display=', false)).toBe('kept');
  });
});

describe('runsThisShift', () => {
  const shift = { shiftStart: '2026-11-26T06:00:00.000Z', shiftEnd: '2026-11-26T14:00:00.000Z' };
  it('keeps runs finished inside the shift (start inclusive, end exclusive) and drops the rest', () => {
    // self-constructed example
    const runs = [
      { id: 1, finishedAt: '2026-11-26T06:00:00.000Z' },
      { id: 2, finishedAt: '2026-11-26T13:59:59.000Z' },
      { id: 3, finishedAt: '2026-11-26T14:00:00.000Z' },
      { id: 4, finishedAt: '2026-11-19T08:00:00.000Z' },
      { id: 5 },
    ];
    expect(runsThisShift(runs, shift).map((r) => r.id)).toEqual([1, 2]);
    expect(runsThisShift(runs, null).map((r) => r.id)).toEqual([1, 2, 3, 4, 5]);
  });
});
