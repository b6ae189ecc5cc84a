/**
 * CSV text for the audit export: RFC 4180 quoting (fields with a comma, quote, CR or LF are enclosed in double
 * quotes and inner quotes doubled; lines end in CRLF), and cells that a spreadsheet would run as a formula are
 * neutralised with a leading single quote (OWASP "CSV Injection": cells starting with = + - @, tab or CR).
 */

const FORMULA_START = /^[=+\-@\t\r]/;

/** One cell, safe to open in a spreadsheet and quoted per RFC 4180 §2 rules 5–7. */
export function csvCell(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return '';
  let text = String(value);
  // numbers are written by us and may be negative: only text from people can carry a formula
  if (typeof value === 'string' && FORMULA_START.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** The whole file: header row, then one row per record, CRLF line ends (RFC 4180 §2 rule 1). */
export function csvText(header: readonly string[], rows: readonly (readonly (string | number | null | undefined)[])[]): string {
  return [header, ...rows].map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}
