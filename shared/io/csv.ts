/**
 * The one CSV writer (issue 12 §6), used by the server's exports (activity,
 * programme snapshots) and by every CSV the browser writes (hardpoint export,
 * chart data on every results screen, compare): RFC 4180 quoting, CRLF line
 * ends, and no cell a spreadsheet would run as a formula.
 *
 * Spreadsheet formulas: a text cell starting with `=`, `+`, `-`, `@`, a tab
 * or a carriage return gets a leading apostrophe (the OWASP "CSV injection"
 * advice, common practice; the same rule as papaparse's `escapeFormulae`,
 * which the server used before). A number is never touched, nor is a text
 * that is exactly a plain decimal number (the browser's chart tables hold
 * formatted numbers such as "-1.25"): neither can be a formula.
 *
 * Line breaks inside a cell are kept inside its quotes (RFC 4180); comment
 * lines (`# …`, units and sign conventions above the header) are put on one
 * line, so a title holding a line break cannot start a row of its own.
 *
 * Written here rather than with papaparse so the chart screens do not carry
 * the whole parser for a few lines of quoting.
 */

export type CsvCell = string | number | boolean | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;
/** A text that is just a number ("-1.25", "3e-4"): a spreadsheet reads it as that number. */
const PLAIN_NUMBER = /^-?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;
const NEEDS_QUOTES = /[",\r\n]|^\s|\s$/;

/** One cell: numbers as written by String (non-finite ones empty), text escaped and quoted as needed. */
export function csvCell(value: CsvCell): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  let text = String(value);
  if (typeof value === 'string' && FORMULA_START.test(text) && !PLAIN_NUMBER.test(text)) text = `'${text}`;
  return NEEDS_QUOTES.test(text) || text.startsWith("'") ? `"${text.replace(/"/g, '""')}"` : text;
}

/** A comment line's text on one line (line breaks become spaces). */
const oneLine = (text: string) => text.replace(/[\r\n]+/g, ' ');

/** CSV text: `# ` comment lines, the header row, the rows; CRLF after every line. */
export function toCsv(header: readonly string[], rows: readonly (readonly CsvCell[])[], commentLines: readonly string[] = []): string {
  const lines = [...commentLines.map((c) => `# ${oneLine(c)}`), header.map(csvCell).join(','), ...rows.map((r) => r.map(csvCell).join(','))];
  return lines.join('\r\n') + '\r\n';
}
