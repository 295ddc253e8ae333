// Words and numbers for the asset pages: counts in cycles, values with their units (imperial
// alongside for people who work in it), and the service work a confirmed cause usually means.
// Numbers and dates follow the reader's locale through @/lib/format.
import { convert } from '@/shared/units';
import { formatDate, formatInteger, formatNumber } from '@/lib/format';
import type { ServiceAction } from '@/shared/schemas/assets';

export function cycles(n: number | null | undefined): string {
  if (n === null || n === undefined) return '—';
  if (n >= 1e6) return `${formatNumber(n / 1e6, { maximumFractionDigits: n >= 1e8 ? 0 : 1 })} million cycles`;
  return `${formatInteger(n)} cycles`;
}

export function exactCycles(n: number): string {
  return `${formatInteger(n)} cycles`;
}

export function days(n: number): string {
  const d = Math.round(n);
  return `${formatInteger(d)} day${d === 1 ? '' : 's'}`;
}

/** Value with its unit; for imperial users the converted value follows in brackets. */
export function withUnit(value: number | null, unit: 'bar' | 'mm' | 'degC' | 'mPa.s' | 'g/cm3', imperial: boolean): string {
  if (value === null) return '—';
  const label = { bar: 'bar', mm: 'mm', degC: '°C', 'mPa.s': 'mPa·s', 'g/cm3': 'g/cm³' }[unit];
  const sig = (v: number) => formatNumber(v, { maximumSignificantDigits: 6 });
  const main = `${sig(value)} ${label}`;
  if (!imperial) return main;
  if (unit === 'bar') return `${main} (${sig(convert(value, 'bar', 'psi', 'pressure'))} psi)`;
  if (unit === 'mm') return `${main} (${sig(convert(value, 'mm', 'in', 'length'))} in)`;
  if (unit === 'degC') return `${main} (${sig(convert(value, 'degC', 'degF', 'temperature'))} °F)`;
  return main;
}

export function longDate(iso: string | null): string {
  if (!iso) return '—';
  return formatDate(iso);
}

/** What is usually done when a finding's cause is confirmed; the technician ticks what really was. */
export const ACTIONS_FOR_CAUSE: Record<string, ServiceAction[]> = {
  'seat-debris': ['cleaned'],
  'seat-worn': ['seat-replaced'],
  'needle-chipped': ['needle-replaced'],
  'needle-shaft-scored': ['needle-replaced'],
  'coil-open': ['coil-replaced'],
  'coil-shorted': ['coil-replaced'],
  'dynamic-seal-worn': ['seals-replaced'],
  'seal-incompatible': ['seals-replaced'],
  'nozzle-blocked': ['cleaned'],
  'filter-blocked': ['cleaned'],
};
