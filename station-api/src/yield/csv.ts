/**
 * CSV as RFC 4180 ("Common Format and MIME Type for Comma-Separated Values (CSV) Files", §2) writes it:
 * records end in CRLF; a field containing a comma, a double quote, CR or LF is enclosed in double quotes, and a
 * double quote inside it is written twice. Numbers are written in full precision (JavaScript's shortest
 * round-trip form), so a value read back is the value stored.
 */
export type CsvCell = string | number | null | undefined;

export function csvField(cell: CsvCell): string {
  if (cell === null || cell === undefined) return '';
  const text = typeof cell === 'number' ? (Number.isFinite(cell) ? String(cell) : '') : cell;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function csvRecord(cells: readonly CsvCell[]): string {
  return cells.map(csvField).join(',') + '\r\n';
}
