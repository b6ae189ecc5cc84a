/*
 * The keyboard rules of the "before power is applied" prompt, as a small state machine without React, so
 * they can be tested key by key with a fake clock.
 *
 * A keyboard-wedge barcode scanner types the characters of the label (letters, digits, punctuation, Space)
 * and ends with Enter or Tab; it never sends a function key. So:
 *  - Enter and Space never apply power;
 *  - power needs {@link CONFIRM_KEY}, pressed with no other key in the {@link CONFIRM_QUIET_MS} before it
 *    (the opening of the prompt counts as a key: the scan that opened it ended with Enter);
 *  - a character typed while the prompt is open cancels it and starts collecting a new scan; the scan
 *    goes to the normal scan flow at its Enter (or Tab), so nothing typed is lost;
 *  - a collected burst that pauses (a person typing, not a scanner) goes into the scan field as text.
 */

/** The key that applies power. A function key: no barcode scanner in keyboard mode sends one. */
export const CONFIRM_KEY = 'F9';

/**
 * Silence needed before {@link CONFIRM_KEY} counts. A scanner types a label at 5–30 ms per character, so a
 * burst has no 300 ms gap; a person reading the prompt takes longer than that. Common practice, no source.
 */
export const CONFIRM_QUIET_MS = 300;

/** A burst with no key for this long is a person typing, not a scanner (same reasoning as above). */
export const BURST_PAUSE_MS = 300;

export interface GuardKey {
  key: string;
  repeat?: boolean;
  ctrlKey?: boolean;
  altKey?: boolean;
  metaKey?: boolean;
}

/** Why a key was eaten without effect, for a hint on the prompt. */
export type GuardHint = 'not_enter' | 'too_soon';

export type GuardAction =
  /** not a key of the prompt: the browser may have it */
  | { kind: 'pass' }
  /** eaten; nothing happens (the hint says why, when there is one) */
  | { kind: 'swallow'; hint?: GuardHint }
  | { kind: 'confirm' }
  | { kind: 'cancel' }
  /** the first character of a new scan: the prompt is cancelled, the guard keeps collecting */
  | { kind: 'burst_start' }
  /** a collected burst ended with Enter/Tab: scan this serial */
  | { kind: 'burst_scan'; serial: string }
  /** a collected burst ended some other way: put this text in the scan field */
  | { kind: 'burst_text'; text: string };

const MODIFIERS = new Set(['Shift', 'Control', 'Alt', 'AltGraph', 'Meta', 'CapsLock', 'NumLock']);

const isCharacter = (e: GuardKey) => e.key.length === 1 && !e.ctrlKey && !e.altKey && !e.metaKey;

export class SafetyKeyGuard {
  #open = false;
  /** Last time anything happened that a confirmation must not follow too closely (ms, performance clock) */
  #lastActivityAt = Number.NEGATIVE_INFINITY;
  /** Characters of a scan that arrived while the prompt was open; null when not collecting */
  #buffer: string | null = null;

  get isOpen(): boolean {
    return this.#open;
  }

  /** True while the characters of a new scan are being collected (the prompt is already cancelled). */
  get collecting(): boolean {
    return this.#buffer !== null;
  }

  open(now: number): void {
    this.#open = true;
    this.#lastActivityAt = now;
  }

  close(): void {
    this.#open = false;
  }

  /** A mouse or touch press on the confirm button counts only under the same quiet rule as the key. */
  pointerMayConfirm(now: number): boolean {
    return this.#open && this.#buffer === null && now - this.#lastActivityAt >= CONFIRM_QUIET_MS;
  }

  key(e: GuardKey, now: number): GuardAction {
    if (this.#buffer !== null) return this.#collect(e, now);
    if (!this.#open) return { kind: 'pass' };
    if (e.key === CONFIRM_KEY) {
      if (e.repeat || now - this.#lastActivityAt < CONFIRM_QUIET_MS) return { kind: 'swallow', hint: 'too_soon' };
      this.#open = false;
      return { kind: 'confirm' };
    }
    if (e.key === 'Escape') {
      this.#open = false;
      return { kind: 'cancel' };
    }
    this.#lastActivityAt = now;
    if (MODIFIERS.has(e.key)) return { kind: 'swallow' };
    if (e.key === 'Enter' || e.key === ' ') return { kind: 'swallow', hint: 'not_enter' };
    if (isCharacter(e)) {
      this.#open = false;
      this.#buffer = e.key;
      return { kind: 'burst_start' };
    }
    // Tab moves between the two buttons for a person using the mouse's keyboard neighbour; harmless
    if (e.key === 'Tab') return { kind: 'pass' };
    return { kind: 'swallow' };
  }

  /**
   * Puts text before the collected characters: the start of a label that reached the scan field before
   * the prompt opened (a scanner already typing while the last scan was being checked).
   */
  prepend(text: string): void {
    if (this.#buffer !== null) this.#buffer = text + this.#buffer;
  }

  /** Called by a timer: a burst that has paused is a person typing; it ends as text for the scan field. */
  pause(now: number): GuardAction | null {
    if (this.#buffer === null || now - this.#lastActivityAt < BURST_PAUSE_MS) return null;
    const text = this.#buffer;
    this.#buffer = null;
    return { kind: 'burst_text', text };
  }

  #collect(e: GuardKey, now: number): GuardAction {
    this.#lastActivityAt = now;
    const buffer = this.#buffer ?? '';
    if (e.key === 'Enter' || e.key === 'Tab') {
      this.#buffer = null;
      const serial = buffer.trim();
      return serial ? { kind: 'burst_scan', serial } : { kind: 'swallow' };
    }
    if (MODIFIERS.has(e.key)) return { kind: 'swallow' };
    if (isCharacter(e)) {
      this.#buffer = buffer + e.key;
      return { kind: 'swallow' };
    }
    if (e.key === 'Backspace') {
      this.#buffer = buffer.slice(0, -1);
      return { kind: 'swallow' };
    }
    // anything else (Esc, arrows, a function key) ends the burst: the text goes to the scan field
    this.#buffer = null;
    return { kind: 'burst_text', text: buffer };
  }
}
