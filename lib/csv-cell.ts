/**
 * Formula injection in CSV files (OWASP, "CSV Injection", common practice): a spreadsheet runs
 * a cell that starts with `=`, `+`, `-` or `@` (or a tab or carriage return that hides one) as a
 * formula. Every CSV the app writes passes its text through {@link csvSafeCell}, which prefixes
 * such a cell with an apostrophe so it shows as text; plain numbers (`-5`, `+2.5`) are left as
 * they are, since a spreadsheet reads them as numbers, not formulas. {@link csvCellFromFile}
 * undoes the prefix on import, so an exported file imports back to the same values.
 */
const FORMULA_START = /^[=+\-@\t\r]/;
const PLAIN_NUMBER = /^[+-]?\d+(\.\d+)?$/;

export function csvSafeCell(value: string): string {
  return FORMULA_START.test(value) && !PLAIN_NUMBER.test(value) ? `'${value}` : value;
}

/** A cell as read from a file: an apostrophe that neutralised a formula-looking value is removed. */
export function csvCellFromFile(value: string): string {
  return value.startsWith("'") && FORMULA_START.test(value.slice(1)) ? value.slice(1) : value;
}
