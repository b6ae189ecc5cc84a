import type { HoldRuleKind, OutboxMessage } from './api/types';

export const KIND_LABELS: Record<HoldRuleKind, string> = {
  fpy: 'First-pass yield below X %',
  cpk: 'Cpk of a quantity below Y',
  run_rule: 'Control-chart signal on a quantity',
  consecutive_failures: 'K failed tests in a row at one station',
};

export const OUTBOX_STATUS: Record<OutboxMessage['status'], { label: string; color: string }> = {
  queued: { label: 'Sending…', color: 'slate' },
  sent: { label: 'Sent', color: 'signalGreen' },
  failed: { label: 'Not sent', color: 'signalRed' },
};

/** Shortest lift reason the server takes, and the longest. */
export const REASON_MIN = 5;
export const REASON_MAX = 500;

export function checkLiftReason(value: string): string | null {
  const v = value.trim();
  if (v.length < REASON_MIN) return `Say in a few words why testing may go on (at least ${REASON_MIN} characters).`;
  if (v.length > REASON_MAX) return `Keep the reason to ${REASON_MAX} characters.`;
  return null;
}

const dateTime = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit' });

/** "2 Dec, 16:05" in the viewer's time zone. */
export function whenText(iso: string | null): string {
  return iso ? dateTime.format(new Date(iso)) : '—';
}

/** The main figures of a hold in a short line ("9 of 10 units passed first time" …), empty when none apply. */
export function figuresText(f: Record<string, unknown>): string {
  const n = (k: string) => (typeof f[k] === 'number' ? (f[k] as number) : null);
  if (n('units') !== null && n('passedFirstTime') !== null) return `${n('passedFirstTime')} of ${n('units')} units passed first time`;
  if (n('cpk') !== null) {
    const unit = typeof f.unit === 'string' ? ` ${f.unit}` : '';
    return `Cpk ${n('cpk')!.toFixed(2)} over ${n('tests')} tests; mean ${n('mean')?.toPrecision(5)}${unit}`;
  }
  if (typeof f.rule === 'string') return `${f.rule} on ${n('tests')} tests; ${n('violations')} finding(s)`;
  if (n('failuresInRow') !== null) return `${n('failuresInRow')} failures in a row at ${String(f.stationCode)}`;
  return '';
}
