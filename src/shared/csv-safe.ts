// Writing CSV cells that a spreadsheet opens as text, never as a formula: the one helper behind
// every CSV Beadpath produces (asset exports, the service forecast, chart figures in the browser).
// People's text can start with = + - @ tab or CR, which spreadsheets run as a formula (and, through
// DDE, as a command); such cells get a leading apostrophe, the usual defence (OWASP CSV Injection).

export type CsvCell = string | number | boolean | null | undefined;

/** Characters that make a spreadsheet read a cell as a formula. */
export const FORMULA_START = /^[=+\-@\t\r]/;

/** A plain number written as text (-3, 12.5, -1,234.5): a spreadsheet reads it as a number, not a formula. */
const PLAIN_NUMBER = /^-?\d{1,3}(,\d{3})*(\.\d+)?$|^-?\d+(\.\d+)?$/;

/** The text as a spreadsheet must show it: an apostrophe in front when it would start a formula. */
export function neutraliseFormula(text: string): string {
  return FORMULA_START.test(text) && !PLAIN_NUMBER.test(text) ? `'${text}` : text;
}

/** Undoes neutraliseFormula when a file Beadpath wrote comes back in (an import of an export). */
export function restoreFormulaText(cell: string): string {
  return cell.startsWith("'") && FORMULA_START.test(cell.slice(1)) ? cell.slice(1) : cell;
}

/** One cell: numbers as they are, yes/no for booleans, text neutralised, quoted when it holds a comma, quote or line break. */
export function csvCell(v: CsvCell): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  const safe = neutraliseFormula(v);
  return /[",\n\r]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** A whole file: header, rows, CRLF line ends (what spreadsheets expect), optionally a UTF-8 byte-order mark. */
export function toCsv(header: string[], rows: CsvCell[][], opts: { bom?: boolean } = {}): string {
  const body = [header, ...rows].map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
  return (opts.bom ? '\uFEFF' : '') + body;
}
