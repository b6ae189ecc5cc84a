/** Words for the codes a unit history carries (the engine's end reasons, lot states). */

const END_REASON_WORDS: Record<string, string> = {
  operator_stop: 'stopped by the operator',
  server_shutdown: 'the station server shut down',
  interrupted: 'interrupted: the server stopped during the run',
  fixture_fault: 'fixture fault',
  software_fault: 'software fault',
  implausible_reading: 'implausible reading',
  store_failed: 'results could not be stored',
};

const LOT_STATE_WORDS: Record<string, string> = {
  open: 'Open for testing',
  on_hold: 'On hold',
  released: 'Released',
  closed: 'Closed',
};

export function endReasonWords(code: string | null): string | null {
  if (!code) return null;
  return END_REASON_WORDS[code] ?? code.replace(/_/g, ' ');
}

export function lotStateWords(code: string): string {
  return LOT_STATE_WORDS[code] ?? code.replace(/_/g, ' ');
}

/** Local time as yyyy-mm-dd hh:mm:ss. */
export function formatStamp(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())} ${p(d.getHours())}:${p(d.getMinutes())}:${p(d.getSeconds())}`;
}

export function formatDay(iso: string | null | undefined): string {
  return iso ? formatStamp(iso).slice(0, 10) : '—';
}
