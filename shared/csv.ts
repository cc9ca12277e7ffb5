// Every CSV the app writes goes through `toCsv`, so no cell can run as a spreadsheet formula.
import Papa from "papaparse";

/**
 * A text cell starting with one of these is read as a formula by common spreadsheet programs
 * (tab and carriage return because some programs skip them before one). papaparse's own
 * default pattern ends in `.*$`, which misses a value with a line break after its first line,
 * so the pattern is given here without it.
 */
export const FORMULA_START = /^[=+\-@\t\r]/;

/**
 * Rows → CSV text (papaparse: quoting as needed, CRLF line ends). Text cells that begin like a
 * formula get a leading single quote and are quoted, so a spreadsheet shows them as text;
 * numbers and booleans are written as they are (a negative number is not a formula).
 */
export function toCsv(rows: Record<string, unknown>[], options: { columns?: string[] } = {}): string {
  return Papa.unparse(rows, { escapeFormulae: FORMULA_START, columns: options.columns, newline: "\r\n" });
}
