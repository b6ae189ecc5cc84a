import type { Lot, LotState, UnitState } from './api/types';

/** Lot states in the product's own words, with the colour of their badge. */
export const LOT_STATE_WORDS: Record<LotState, { label: string; color: string }> = {
  open: { label: 'Open for testing', color: 'copper' },
  on_hold: { label: 'On hold', color: 'signalAmber' },
  released: { label: 'Released', color: 'signalGreen' },
  closed: { label: 'Closed', color: 'slate' },
};

export const UNIT_STATE_WORDS: Record<UnitState, { label: string; color: string }> = {
  untested: { label: 'Not tested', color: 'gray' },
  passed: { label: 'Passed', color: 'signalGreen' },
  failed: { label: 'Failed', color: 'signalRed' },
  in_repair: { label: 'In repair', color: 'signalAmber' },
  scrapped: { label: 'Scrapped', color: 'slate' },
};

/** "On hold: FPY of the last 20 units below 90 %", or the state's words. */
export function lotStateText(lot: Pick<Lot, 'state' | 'holdReason'>): string {
  const words = LOT_STATE_WORDS[lot.state].label;
  return lot.state === 'on_hold' && lot.holdReason ? `${words}: ${lot.holdReason}` : words;
}

/** Units tested at least once. */
export const testedCount = (lot: Pick<Lot, 'unitCounts'>) => lot.unitCounts.total - lot.unitCounts.untested;

/** "2 Dec 2026, 14:07" in the browser's time zone. */
export function formatWhen(iso: string | null): string {
  if (!iso) return '—';
  return new Date(iso).toLocaleString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' });
}

export function formatDay(iso: string): string {
  return new Date(iso).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric' });
}
