// Words and numbers for the asset pages: counts in cycles, values with their units (imperial
// alongside for people who work in it), and the service work a confirmed cause usually means.
import { convert, formatNumber } from '@/shared/units';
import type { ServiceAction } from '@/shared/schemas/assets';

export function cycles(n: number | null | undefined): string {
  if (n === null || n === undefined) return '—';
  if (n >= 1e6) return `${(n / 1e6).toLocaleString('en-GB', { maximumFractionDigits: n >= 1e8 ? 0 : 1 })} million cycles`;
  return `${Math.round(n).toLocaleString('en-GB')} cycles`;
}

export function exactCycles(n: number): string {
  return `${n.toLocaleString('en-GB')} cycles`;
}

export function days(n: number): string {
  const d = Math.round(n);
  return `${d.toLocaleString('en-GB')} day${d === 1 ? '' : 's'}`;
}

/** Value with its unit; for imperial users the converted value follows in brackets. */
export function withUnit(value: number | null, unit: 'bar' | 'mm' | 'degC' | 'mPa.s' | 'g/cm3', imperial: boolean): string {
  if (value === null) return '—';
  const label = { bar: 'bar', mm: 'mm', degC: '°C', 'mPa.s': 'mPa·s', 'g/cm3': 'g/cm³' }[unit];
  const main = `${formatNumber(value)} ${label}`;
  if (!imperial) return main;
  if (unit === 'bar') return `${main} (${formatNumber(convert(value, 'bar', 'psi', 'pressure'))} psi)`;
  if (unit === 'mm') return `${main} (${formatNumber(convert(value, 'mm', 'in', 'length'))} in)`;
  if (unit === 'degC') return `${main} (${formatNumber(convert(value, 'degC', 'degF', 'temperature'))} °F)`;
  return main;
}

export function longDate(iso: string | null): string {
  if (!iso) return '—';
  const d = new Date(iso.length === 10 ? `${iso}T12:00:00Z` : iso);
  return d.toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric' });
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
