// Tables as CSV files built in the browser, so every chart's figures can go into a spreadsheet.

export type Cell = string | number | null | undefined;

function cell(v: Cell): string {
  const s = v === null || v === undefined ? '' : String(v);
  // A leading = + - @ would run as a formula when the file is opened; a quote mark keeps it text.
  const safe = /^[=+\-@\t\r]/.test(s) && !/^-?\d/.test(s) ? `'${s}` : s;
  return /[",\n\r]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

export function toCsv(header: string[], rows: Cell[][]): string {
  return [header, ...rows].map((r) => r.map(cell).join(',')).join('\r\n') + '\r\n';
}

export function downloadCsv(name: string, header: string[], rows: Cell[][]) {
  const url = URL.createObjectURL(new Blob([toCsv(header, rows)], { type: 'text/csv;charset=utf-8' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

export const num = (n: number, digits = 0) => n.toLocaleString('en-GB', { maximumFractionDigits: digits, minimumFractionDigits: 0 });

export function millions(n: number): string {
  if (n >= 1e6) return `${num(n / 1e6, n >= 1e8 ? 0 : 1)} M`;
  return num(n);
}
