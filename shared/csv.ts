// A small CSV writer: RFC 4180 quoting (fields with a comma, a double quote or a line break are
// quoted, quotes doubled; CRLF between records), and a guard against spreadsheet formula injection
// (OWASP "CSV Injection"): text that a spreadsheet would read as a formula gets a leading apostrophe.
// Numbers are ours, not typed by anyone, so they are written as they are (a negative stays negative).

export type CsvCell = string | number | null | undefined;

/** Characters that make a spreadsheet treat a cell as a formula (OWASP): = + - @, tab and CR. */
const FORMULA_START = /^[=+\-@\t\r]/;

export function guardFormula(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

export function csvField(cell: CsvCell): string {
  if (cell === null || cell === undefined) return '';
  if (typeof cell === 'number') {
    if (!Number.isFinite(cell)) return '';
    return String(cell);
  }
  const text = guardFormula(cell);
  return /[",\r\n]/.test(text) || text !== text.trim() ? `"${text.replace(/"/g, '""')}"` : text;
}

/** The whole document: one record per row, CRLF after each (RFC 4180). */
export function toCsv(rows: readonly (readonly CsvCell[])[]): string {
  return rows.map((row) => row.map(csvField).join(',')).join('\r\n') + '\r\n';
}
