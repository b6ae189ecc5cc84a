import { FLAG_UNIT, formatMeasured, type MeasuredFigures } from '@contract/value-format';
import { isApiError } from '@/lib/api-client';
import type { RepairAction } from './api/repair-unit';

/** Limits of the note, as the server checks them (station-api repair.dto.ts). */
export const NOTE_MIN = 3;
export const NOTE_MAX = 500;

/** What each repair step is called on the buttons and in the dialog. */
export const ACTION_WORDS: Record<RepairAction, { button: string; title: string; submit: string; done: string }> = {
  receive: { button: 'Receive', title: 'Receive into repair', submit: 'Receive', done: 'is now in repair' },
  return: { button: 'Return for retest', title: 'Return for retest', submit: 'Return for retest', done: 'may be tested again, with a fresh set of attempts' },
  scrap: { button: 'Scrap', title: 'Scrap this unit', submit: 'Scrap for good', done: 'is scrapped' },
};

/** The steps a unit in the queue can take (mirrors the server's rule; the server has the last word). */
export function actionsFor(state: 'failed' | 'in_repair'): RepairAction[] {
  return state === 'failed' ? ['receive', 'scrap'] : ['return', 'scrap'];
}

/** The note's problem in words, or null when it is fine. */
export function checkNote(note: string): string | null {
  const n = note.trim().length;
  if (n === 0) return 'Write what you found or did; the note is the repair record.';
  if (n < NOTE_MIN) return `Write at least ${NOTE_MIN} characters.`;
  if (n > NOTE_MAX) return `Keep it to ${NOTE_MAX} characters (now ${n}).`;
  return null;
}

/** A refused repair step in our words; the server's sentence where it already names the state. */
export function describeRepairError(error: unknown): string {
  if (!isApiError(error)) return 'The repair step could not be sent. Try again.';
  if (error.status === 0) return error.message;
  if (error.status === 403) return 'Only engineers, quality staff and administrators can take repair steps.';
  if (error.status === 404) return 'This serial is not registered any more. Reload the queue.';
  if (error.code === 'bad_repair_transition') return `${error.message} The queue has been reloaded.`;
  if (error.code === 'unit_under_test') return error.message;
  if (error.status === 400 && error.fieldProblems.length > 0) {
    return error.fieldProblems.map((p) => `${p.field}: ${p.problems.join('; ')}`).join(' · ');
  }
  return error.message;
}

/**
 * "5.412 V (≥ 5.400 V)": the value and the limits it was judged against, written by the one formatter
 * (`@contract/value-format`) with the same digits, so rounding never hides the outcome.
 */
export function describeFailure(f: MeasuredFigures): { value: string; limits: string } {
  const shown = formatMeasured(f);
  const value = f.unit === FLAG_UNIT || shown.value !== '—' ? `${shown.value}${shown.unit ? ` ${shown.unit}` : ''}` : 'no value';
  return { value, limits: shown.accept ? `${shown.spec}; accepted ${shown.accept}` : shown.spec };
}

const p2 = (n: number) => String(n).padStart(2, '0');

/** Local "yyyy-mm-dd hh:mm". */
export function formatWhen(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.getFullYear()}-${p2(d.getMonth() + 1)}-${p2(d.getDate())} ${p2(d.getHours())}:${p2(d.getMinutes())}`;
}
