import Papa from 'papaparse';

/**
 * A cell a spreadsheet would run as a formula starts with one of these. Papa's own pattern
 * (`/^[=+\-@\t\r].*$/`) fails on a cell with a line break in it (`.` stops at the newline), so a
 * typed `=HYPERLINK(…)` followed by a new line went out as a live formula; this one looks at the
 * first character only.
 */
const FORMULA_START = /^[=+\-@\t\r\n]/;

/**
 * CSV text (RFC 4180: CRLF, quoted where needed) of a header and rows; every text cell that starts
 * like a formula gets a leading `'`, so a spreadsheet shows it as text. Numbers are left as they are.
 */
export function toCsv(fields: string[], rows: (string | number)[][]): string {
  return Papa.unparse({ fields, data: rows }, { newline: '\r\n', escapeFormulae: FORMULA_START });
}
