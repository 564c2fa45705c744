/*
 * A small RFC 4180 writer for the exports: CRLF line ends, a field quoted when it holds a comma,
 * a quote or a line break (quotes doubled). Text cells that a spreadsheet would run as a formula
 * (starting with = + - @, a tab or a carriage return; OWASP "CSV injection") get a leading
 * apostrophe; number cells are written as numbers, so -1.5 stays -1.5.
 */

export type CsvValue = string | number | boolean | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;

export function csvCell(v: CsvValue): string {
  if (v === null || v === undefined) return '';
  let s: string;
  if (typeof v === 'number') s = Number.isFinite(v) ? String(v) : '';
  else if (typeof v === 'boolean') s = v ? 'true' : 'false';
  else s = FORMULA_START.test(v) ? `'${v}` : v;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** UTF-8 with a byte-order mark (decision 013: spreadsheets then read names in any script), a header row and one line per row. */
export function csvDocument(header: readonly string[], rows: readonly (readonly CsvValue[])[]): string {
  const lines = [header.map(csvCell).join(',')];
  for (const r of rows) lines.push(r.map(csvCell).join(','));
  return `\uFEFF${lines.join('\r\n')}\r\n`;
}
