// Tables as CSV files built in the browser, so every chart's figures can go into a spreadsheet.
import { toCsv, type CsvCell } from '@/shared/csv-safe';

// Cells go through the shared helper, so text that starts like a formula opens as text.
export type Cell = CsvCell;
export { toCsv };

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
