// Cells of the CSV files we write. A spreadsheet runs a cell that starts with = + - @ (or a tab or
// carriage return before one of them) as a formula: a client name like =HYPERLINK("http://…") would
// become a live link, and older programs ran commands through DDE. Such a cell gets an apostrophe in
// front, which spreadsheets themselves use to mean "text" and do not show (OWASP's advice on CSV
// injection). Plain numbers, a negative amount of a credit note for one, stay numbers.

const FORMULA_START = /^[=+\-@\t\r]/;
const PLAIN_NUMBER = /^-?\d+(\.\d+)?$/;

/** The cell as written: text that a spreadsheet would run as a formula gets a leading apostrophe. */
export function csvCell(value: string | number | null | undefined): string {
  const v = value === null || value === undefined ? '' : String(value);
  return FORMULA_START.test(v) && !PLAIN_NUMBER.test(v) ? `'${v}` : v;
}

/** Takes off the apostrophe `csvCell` adds, so a file we wrote imports back to the same text. */
export function fromCsvCell(v: string): string {
  return v.startsWith("'") && FORMULA_START.test(v.slice(1)) ? v.slice(1) : v;
}
