import { BOARD_DISPLAY_PARAM } from '@/config/paths';

/*
 * The wall screen's board-only token (interfaces §13): an administrator issues a link `/board?display=<token>`;
 * the screen keeps the token and uses it for the board alone, so the wall never drops to the sign-in page when
 * a person's 12 h session would have ended.
 */

export const BOARD_DISPLAY_TOKEN_KEY = 'railwright.boardDisplayToken';

function storage(): Storage | null {
  try {
    return window.localStorage;
  } catch {
    return null;
  }
}

export const boardDisplayToken = {
  get(): string | null {
    return storage()?.getItem(BOARD_DISPLAY_TOKEN_KEY) || null;
  },
  set(token: string): void {
    storage()?.setItem(BOARD_DISPLAY_TOKEN_KEY, token);
  },
  clear(): void {
    storage()?.removeItem(BOARD_DISPLAY_TOKEN_KEY);
  },
};

/**
 * The display token the board at this address should use, or null for the signed-in person's board.
 * A `?display=` in the address is kept (it replaces an older one); without it, a stored display token is
 * used only when nobody is signed in on this screen.
 */
export function displayTokenFor(search: string, personSignedIn: boolean): string | null {
  const fromUrl = new URLSearchParams(search).get(BOARD_DISPLAY_PARAM)?.trim();
  if (fromUrl) {
    boardDisplayToken.set(fromUrl);
    return fromUrl;
  }
  return personSignedIn ? null : boardDisplayToken.get();
}

/** Finished runs of this shift only, newest first; without a shift (or a time) nothing can be placed in it. */
export function runsThisShift<R extends { finishedAt?: string }>(runs: readonly R[], shift: { shiftStart: string; shiftEnd: string } | null): R[] {
  if (!shift) return [...runs];
  const from = Date.parse(shift.shiftStart);
  const to = Date.parse(shift.shiftEnd);
  return runs.filter((r) => {
    const at = r.finishedAt ? Date.parse(r.finishedAt) : Number.NaN;
    return Number.isFinite(at) && at >= from && (!Number.isFinite(to) || at < to);
  });
}
