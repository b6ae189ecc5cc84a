import { FLAG_UNIT, formatMeasured, type MeasuredFigures } from '@contract/value-format';
import { isApiError } from '@/lib/api-client';
import type { RepairAction } from './api/repair-unit';

/** Limits of the note, as the server checks them (station-api repair.dto.ts). */
export const NOTE_MIN = 3;
export const NOTE_MAX = 500;

/** Limits of the repair record's texts, as the server checks them (station-api repair.dto.ts). */
export const RECORD_TEXT_MIN = 3;
export const RECORD_TEXT_MAX = 500;

/** What each repair step is called in messages once done. */
export const ACTION_WORDS: Record<RepairAction, { title: string; done: string }> = {
  receive: { title: 'Received into repair', done: 'is now in repair' },
  return: { title: 'Returned for retest', done: 'may be tested again, with a fresh set of attempts' },
  scrap: { title: 'Scrapped', done: 'is scrapped' },
};

/** The two forms of the Repair page: receive a unit onto the bench, or write its repair record. */
export type RepairStep = 'receive' | 'record';

/** The buttons a unit in the queue shows (mirrors the server's rule; the server has the last word). */
export function stepsFor(state: 'failed' | 'in_repair'): RepairStep[] {
  return state === 'failed' ? ['receive', 'record'] : ['record'];
}

export const STEP_BUTTON: Record<RepairStep, string> = { receive: 'Receive', record: 'Record repair' };

/** The disposition a repair record ends with, and the server's action for it. */
export const DISPOSITIONS = [
  { value: 'return', label: 'Eligible for retest', hint: 'back to the line as untested, with a fresh set of attempts' },
  { value: 'scrap', label: 'Scrapped', hint: 'leaves production for good; cannot be undone' },
] as const satisfies readonly { value: RepairAction; label: string; hint: string }[];

/** A record text's problem in words (symptom or action taken), or null when it is fine. */
export function checkRecordText(what: string, text: string): string | null {
  const n = text.trim().length;
  if (n === 0) return `Say ${what}.`;
  if (n < RECORD_TEXT_MIN) return `Write at least ${RECORD_TEXT_MIN} characters.`;
  if (n > RECORD_TEXT_MAX) return `Keep it to ${RECORD_TEXT_MAX} characters (now ${n}).`;
  return null;
}

/** Why a unit is on the queue, in words for the row. */
export const REASON_WORDS: Record<'no_attempts_left' | 'sent_by_operator' | 'in_repair', string> = {
  no_attempts_left: 'no attempts left',
  sent_by_operator: 'sent by the operator',
  in_repair: 'on the bench',
};

/** The note's problem in words, or null when it is fine. */
export function checkNote(note: string): string | null {
  const n = note.trim().length;
  if (n === 0) return 'Write what you found or did; the note is the repair record.';
  if (n < NOTE_MIN) return `Write at least ${NOTE_MIN} characters.`;
  if (n > NOTE_MAX) return `Keep it to ${NOTE_MAX} characters (now ${n}).`;
  return null;
}

const FIELD_WORDS: Record<string, string> = { symptom: 'Symptom', causeId: 'Cause', actionTaken: 'Action taken', note: 'Note' };

/** A refused repair step in our words; the server's sentence where it already names the state. */
export function describeRepairError(error: unknown): string {
  if (!isApiError(error)) return 'The repair step could not be sent. Try again.';
  if (error.status === 0) return error.message;
  if (error.status === 403) return 'Only engineers, quality staff and administrators can take repair steps.';
  if (error.status === 404) return 'This serial is not registered any more. Reload the queue.';
  if (error.code === 'bad_repair_transition') return `${error.message} The queue has been reloaded.`;
  if (error.code === 'unit_under_test') return error.message;
  if (error.status === 400 && error.fieldProblems.length > 0) {
    return error.fieldProblems.map((p) => `${FIELD_WORDS[p.field] ?? p.field}: ${p.problems.join('; ')}`).join(' · ');
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
