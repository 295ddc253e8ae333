// Reading and writing the asset CSV files: papaparse for the format, our own checks for what
// people's spreadsheets do to it (byte-order marks, semicolons, renamed headers, decimal commas,
// formula-looking text), and cell parsers whose messages name what was found.
import Papa from 'papaparse';
import { ASSET_LIMITS, dateProblem, type CsvColumn, type ImportProblem } from '../../../src/shared/schemas/assets';
import { AppError } from '../../lib/app-error';
import { neutraliseFormula, restoreFormulaText } from '../../../src/shared/csv-safe';

/** Headers match ignoring case, spaces, punctuation and unit symbols' styling. */
export function headerKey(header: string): string {
  return header
    .normalize('NFKD')
    .toLowerCase()
    .replace(/[^a-z0-9]/g, '');
}

const DELIMITER_NAMES: Record<string, string> = { ',': 'comma', ';': 'semicolon', '\t': 'tab', '|': 'vertical bar' };

export interface CsvRow {
  /** Spreadsheet row number: the header is row 1. */
  row: number;
  /** Cell text by column key; columns the file lacks are empty. */
  cells: Record<string, string>;
  /** Problems found while reading the row itself (too many values). */
  problems: ImportProblem[];
}

export interface ParsedCsv {
  delimiter: string;
  /** Header text as written in the file, by column key. */
  headers: Record<string, string>;
  columns: string[];
  rows: CsvRow[];
  /** Semicolon or tab files come from spreadsheets that write 1,5 for 1.5. */
  decimalComma: boolean;
}

function fileError(message: string, field = 'file'): AppError {
  return new AppError('invalid_input', message, { [field]: message }, { problems: [{ row: null, column: null, message }] satisfies ImportProblem[] });
}

// Spreadsheets run text starting with = + - @ tab or CR as a formula; exports prefix an
// apostrophe (the shared helper) and imports take it off again.
export const unescapeCell = restoreFormulaText;
export const escapeText = neutraliseFormula;

/**
 * The separator the header row uses most, outside quotes. The header names the columns, so it is
 * the one line sure to have them all; papaparse's own guess falters on short files.
 */
export function guessDelimiter(text: string): string {
  const firstLine = text.split(/\r?\n/, 1)[0].replace(/"[^"]*"/g, '');
  let best = ',';
  let most = 0;
  for (const d of Object.keys(DELIMITER_NAMES)) {
    const n = firstLine.split(d).length - 1;
    if (n > most) [best, most] = [d, n];
  }
  return best;
}

/**
 * Parses a whole file and maps its header onto the expected columns. Throws one clear message
 * for problems with the file as a whole: empty, unreadable quotes, header not recognised, too long.
 */
export function parseCsv(text: string, columns: CsvColumn[], extra: { key: string; header: string; aliases?: string[] }[] = []): ParsedCsv {
  const body = text.replace(/^\uFEFF/, '');
  if (!body.trim()) throw fileError('The file is empty. Download the template, fill it in and import it again.');
  const parsed = Papa.parse<string[]>(body, { skipEmptyLines: false, delimiter: guessDelimiter(body) });
  const quote = parsed.errors.find((e) => e.type === 'Quotes');
  if (quote) {
    throw fileError(`Row ${(quote.row ?? 0) + 1}: a quoted value is not closed, so the rest of the file cannot be read. Check the quotation marks around that row.`);
  }
  const delimiter = parsed.meta.delimiter || ',';
  const data = parsed.data;
  const headerCells = (data[0] ?? []).map((h) => h.trim());

  const byKey = new Map<string, string>();
  for (const c of columns) {
    byKey.set(headerKey(c.header), c.key);
    byKey.set(headerKey(c.key), c.key);
  }
  for (const e of extra) {
    byKey.set(headerKey(e.header), e.key);
    for (const a of e.aliases ?? []) byKey.set(headerKey(a), e.key);
  }
  const expected = [...columns.map((c) => c.header), ...extra.map((e) => e.header)];
  const list = (items: string[]) => items.map((i) => `'${i}'`).join(', ');

  // One unrecognised header cell: the columns were not split, whatever the file used between them.
  if (headerCells.length === 1 && !byKey.has(headerKey(headerCells[0]))) {
    const other = Object.keys(DELIMITER_NAMES).find((d) => d !== delimiter && headerCells[0].includes(d));
    const seen = other ? ` The header seems to use a ${DELIMITER_NAMES[other]} between columns.` : '';
    throw fileError(
      `Only one column was found in the header row.${seen} Beadpath reads files with the columns separated by commas, semicolons or tabs: save the sheet as CSV and check the first row names the columns (${list(expected.slice(0, 4))}…).`,
      'header',
    );
  }

  const mapping: (string | null)[] = [];
  const unknown: string[] = [];
  const twice: string[] = [];
  const seenKeys = new Set<string>();
  const headers: Record<string, string> = {};
  for (const h of headerCells) {
    const key = h ? byKey.get(headerKey(h)) : undefined;
    if (!h) {
      mapping.push(null);
      continue;
    }
    if (!key) {
      unknown.push(h);
      mapping.push(null);
      continue;
    }
    if (seenKeys.has(key)) twice.push(h);
    seenKeys.add(key);
    headers[key] = h;
    mapping.push(key);
  }
  const missing = columns.filter((c) => c.required && !seenKeys.has(c.key)).map((c) => c.header);
  if (missing.length || unknown.length || twice.length) {
    const parts = [
      missing.length ? `missing column${missing.length > 1 ? 's' : ''} ${list(missing)}` : '',
      unknown.length ? `unknown column${unknown.length > 1 ? 's' : ''} ${list(unknown)}` : '',
      twice.length ? `column${twice.length > 1 ? 's' : ''} given twice: ${list(twice)}` : '',
    ].filter(Boolean);
    throw fileError(
      `The header row is not what Beadpath expects: ${parts.join('; ')}. The first row must name the columns, e.g. ${list(expected.slice(0, 6))}${expected.length > 6 ? '…' : ''}; download the template to see them all.`,
      'header',
    );
  }

  const rows: CsvRow[] = [];
  for (let i = 1; i < data.length; i++) {
    const raw = data[i];
    if (raw.every((c) => !c.trim())) continue;
    rows.push({ row: i + 1, cells: {}, problems: [] });
    if (rows.length > ASSET_LIMITS.importRows) break;
  }
  if (rows.length > ASSET_LIMITS.importRows) {
    const total = data.slice(1).filter((r) => r.some((c) => c.trim())).length;
    throw fileError(
      `This file has ${total.toLocaleString('en-GB')} rows; one import takes at most ${ASSET_LIMITS.importRows.toLocaleString('en-GB')}. Split it into smaller files and import them one after the other.`,
    );
  }
  for (const r of rows) {
    const raw = data[r.row - 1];
    for (const [j, key] of mapping.entries()) if (key) r.cells[key] = unescapeCell((raw[j] ?? '').trim());
    const overflow = raw.slice(mapping.length).filter((c) => c.trim());
    if (overflow.length) {
      r.problems.push({
        row: r.row,
        column: null,
        message: `This row has ${raw.length} values but the header has ${mapping.length} columns; a ${DELIMITER_NAMES[delimiter] ?? 'separator'} inside a value needs quotation marks around the value.`,
      });
    }
  }
  return { delimiter, headers, columns: headerCells.filter(Boolean), rows, decimalComma: delimiter !== ',' };
}

// ---- Cell parsers: { value } or { error } -----------------------------------------------------

export type Cell<T> = { value: T } | { error: string };

export function numberCell(text: string, opts: { decimalComma: boolean; unit?: string }): Cell<number | null> {
  const unit = opts.unit ? ` in ${opts.unit}` : '';
  if (!text) return { value: null };
  let t = text.replace(/[\s\u00a0\u202f]/g, '');
  if (opts.decimalComma && /^-?\d*,\d+$/.test(t)) t = t.replace(',', '.');
  if (!/^-?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)) {
    const hint = /^\d{1,3}(,\d{3})+$/.test(t) ? ' (write it without thousands separators)' : /,/.test(t) ? ' (use a point for decimals)' : '';
    return { error: `'${text}' is not a number${unit}${hint}` };
  }
  return { value: Number(t) };
}

export function integerCell(text: string, opts: { decimalComma: boolean; unit?: string }): Cell<number | null> {
  const n = numberCell(text, opts);
  if ('error' in n || n.value === null) return n;
  if (!Number.isInteger(n.value)) return { error: `'${text}' is not a whole number${opts.unit ? ` of ${opts.unit}` : ''}` };
  return n;
}

const YES = new Set(['yes', 'y', 'true', '1', 'x']);
const NO = new Set(['no', 'n', 'false', '0', '']);

export function booleanCell(text: string): Cell<boolean> {
  const t = text.trim().toLowerCase();
  if (YES.has(t)) return { value: true };
  if (NO.has(t)) return { value: false };
  return { error: `'${text}' is not yes or no` };
}

export function choiceCell<T extends string>(text: string, choices: readonly T[], labels: Record<T, string>, extra: Record<string, T> = {}): Cell<T | null> {
  if (!text) return { value: null };
  const k = headerKey(text);
  for (const c of choices) if (headerKey(c) === k || headerKey(labels[c]) === k) return { value: c };
  if (extra[k]) return { value: extra[k] };
  return { error: `'${text}' is not one of ${choices.join(', ')}` };
}

export function dateCell(text: string, label: string): Cell<string | null> {
  if (!text) return { value: null };
  const problem = dateProblem(text, label);
  return problem ? { error: `'${text}': ${problem}` } : { value: text };
}

// ---- Writing --------------------------------------------------------------------------------

export type CsvValue = string | number | boolean | null | undefined;

/** One CSV file as sent to spreadsheets: a byte-order mark so accents and units open right. */
export function toCsv(headers: string[], rows: CsvValue[][]): string {
  const cell = (v: CsvValue) => (v === null || v === undefined ? '' : typeof v === 'boolean' ? (v ? 'yes' : 'no') : typeof v === 'number' ? String(v) : escapeText(v));
  // Headers too: an organisation's own field names become column headers.
  return '\uFEFF' + Papa.unparse({ fields: headers.map(escapeText), data: rows.map((r) => r.map(cell)) }, { newline: '\r\n' }) + '\r\n';
}
