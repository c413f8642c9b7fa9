/**
 * Formula injection in CSV/TSV: a spreadsheet treats a cell starting with `=`, `+`, `-`, `@`, tab or
 * carriage return as a formula. OWASP's "CSV Injection" page (owasp.org/www-community/attacks/CSV_Injection)
 * lists exactly these six characters and advises prefixing such cells with a single quote, which
 * spreadsheets take as "this is text" and do not show.
 *
 * Our escape: a cell matching /^'*[=+\-@\t\r]/ gets one more leading `'`. Cells that already start
 * with quotes before a trigger get one too, so the escape is a bijection and our reader can undo it
 * exactly: `=1+1` → `'=1+1`, `'=1` → `''=1`, while `'plain` and `it's` are left alone.
 */
const NEEDS_ESCAPE = /^'*[=+\-@\t\r]/;
const ESCAPED = /^'+[=+\-@\t\r]/;

/** The cell as written to a CSV/TSV file: inert in a spreadsheet. */
export function cellFormulaEscape(value: string): string {
  return NEEDS_ESCAPE.test(value) ? `'${value}` : value;
}

/** The inverse of `cellFormulaEscape`: drops the one quote it adds, touches nothing else. */
export function cellFormulaUnescape(value: string): string {
  return ESCAPED.test(value) ? value.slice(1) : value;
}
