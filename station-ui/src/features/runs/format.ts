
const has = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);

/** Run length as "8.4 s" under a minute, "1:05" (min:s) above; a dash while still running. */
export function formatDuration(ms: number | null | undefined): string {
  if (!has(ms) || ms < 0) return '—';
  if (ms < 60_000) return `${(ms / 1000).toFixed(1)} s`;
  const s = Math.floor(ms / 1000);
  return `${Math.floor(s / 60)}:${String(s % 60).padStart(2, '0')}`;
}

const p2 = (n: number) => String(n).padStart(2, '0');

/** Local time as yyyy-mm-dd hh:mm:ss: sortable by eye, the same width on every row. */
export function formatStamp(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.getFullYear()}-${p2(d.getMonth() + 1)}-${p2(d.getDate())} ${p2(d.getHours())}:${p2(d.getMinutes())}:${p2(d.getSeconds())}`;
}

/** Local time of day as hh:mm:ss (the day is in the run's header). */
export function formatTime(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${p2(d.getHours())}:${p2(d.getMinutes())}:${p2(d.getSeconds())}`;
}

/** Local calendar day as yyyy-mm-dd. */
export function formatDay(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.getFullYear()}-${p2(d.getMonth() + 1)}-${p2(d.getDate())}`;
}

/** Local midnight at the start of a `yyyy-mm-dd` day as ISO 8601, or undefined for anything else. */
export function dayStartIso(day: string | null | undefined, addDays = 0): string | undefined {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(day ?? '');
  if (!m) return undefined;
  const d = new Date(Number(m[1]), Number(m[2]) - 1, Number(m[3]) + addDays);
  return Number.isNaN(d.getTime()) ? undefined : d.toISOString();
}
