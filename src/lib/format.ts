// Dates and numbers in the reader's own locale (decimal comma or point, day or month first), the
// one place the pages format them. Every function takes an optional locale so tests and print
// views can pin one; without it the browser's languages decide.

type DateInput = string | number | Date;

export interface FormatOptions {
  /** A BCP 47 tag such as 'de-DE'; the browser's preferred languages when left out. */
  locale?: string | readonly string[];
}

/** The locales the browser prefers, best first; undefined lets Intl use its own default. */
export function userLocales(): readonly string[] | undefined {
  if (typeof navigator === 'undefined') return undefined;
  if (navigator.languages && navigator.languages.length > 0) return navigator.languages;
  return navigator.language ? [navigator.language] : undefined;
}

function localesOf(options?: FormatOptions): string[] | undefined {
  const l = options?.locale ?? userLocales();
  if (l === undefined) return undefined;
  return typeof l === 'string' ? [l] : [...l];
}

// Building an Intl formatter costs far more than using one; long lists format hundreds of values.
const numberFormats = new Map<string, Intl.NumberFormat>();
const dateFormats = new Map<string, Intl.DateTimeFormat>();
const relativeFormats = new Map<string, Intl.RelativeTimeFormat>();

function numberFormat(locales: string[] | undefined, opts: Intl.NumberFormatOptions): Intl.NumberFormat {
  const key = JSON.stringify([locales, opts]);
  let f = numberFormats.get(key);
  if (!f) {
    f = new Intl.NumberFormat(locales, opts);
    numberFormats.set(key, f);
  }
  return f;
}

function dateFormat(locales: string[] | undefined, opts: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  const key = JSON.stringify([locales, opts]);
  let f = dateFormats.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat(locales, opts);
    dateFormats.set(key, f);
  }
  return f;
}

export interface NumberOptions extends FormatOptions {
  /** Most digits after the decimal separator (default 3). */
  maximumFractionDigits?: number;
  minimumFractionDigits?: number;
  /** Significant digits instead of fraction digits, for results spanning many magnitudes. */
  maximumSignificantDigits?: number;
  /** Group thousands (default true). */
  grouping?: boolean;
}

/** A number with the locale's decimal and group separators; '—' for a missing or non-finite value. */
export function formatNumber(value: number | null | undefined, options: NumberOptions = {}): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const opts: Intl.NumberFormatOptions = { useGrouping: options.grouping ?? true };
  if (options.maximumSignificantDigits !== undefined) {
    opts.maximumSignificantDigits = options.maximumSignificantDigits;
  } else {
    const max = options.maximumFractionDigits ?? 3;
    opts.maximumFractionDigits = max;
    opts.minimumFractionDigits = Math.min(options.minimumFractionDigits ?? 0, max);
  }
  // -0 would print as "-0" after rounding a tiny negative value.
  const out = numberFormat(localesOf(options), opts).format(value);
  return /^-0([.,]0+)?$/.test(out) ? out.slice(1) : out;
}

/** A whole number (rounded) with group separators: 1,250,000 or 1.250.000. */
export function formatInteger(value: number | null | undefined, options: FormatOptions = {}): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return numberFormat(localesOf(options), { maximumFractionDigits: 0 }).format(Math.round(value));
}

/** A share as a percentage: 0.42 → "42%" (or "42 %" where the locale spaces it). */
export function formatPercent(share: number | null | undefined, options: FormatOptions & { maximumFractionDigits?: number } = {}): string {
  if (share === null || share === undefined || !Number.isFinite(share)) return '—';
  return numberFormat(localesOf(options), { style: 'percent', maximumFractionDigits: options.maximumFractionDigits ?? 0 }).format(share);
}

/** A size in bytes as kB or MB (1 kB = 1,024 bytes, as file dialogs show it). */
export function formatBytes(bytes: number | null | undefined, options: FormatOptions = {}): string {
  if (bytes === null || bytes === undefined || !Number.isFinite(bytes)) return '—';
  if (bytes < 1024) return `${formatInteger(bytes, options)} bytes`;
  if (bytes < 1024 * 1024) return `${formatNumber(bytes / 1024, { ...options, maximumFractionDigits: bytes < 10 * 1024 ? 1 : 0 })} kB`;
  return `${formatNumber(bytes / (1024 * 1024), { ...options, maximumFractionDigits: 1 })} MB`;
}

/**
 * A calendar date ('2026-12-02') names a day, not an instant: it is shown as that day wherever the
 * reader is. Anything else is an instant, shown in the reader's time zone.
 */
function toDate(input: DateInput): { date: Date; calendarDay: boolean } | null {
  if (input instanceof Date) return Number.isNaN(input.getTime()) ? null : { date: input, calendarDay: false };
  if (typeof input === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(input)) {
    const d = new Date(`${input}T12:00:00Z`);
    return Number.isNaN(d.getTime()) ? null : { date: d, calendarDay: true };
  }
  const d = new Date(input);
  return Number.isNaN(d.getTime()) ? null : { date: d, calendarDay: false };
}

export interface DateOptions extends FormatOptions {
  /** A time zone such as 'UTC' or 'Europe/Berlin'; the reader's own when left out. */
  timeZone?: string;
}

function zone(parsed: { calendarDay: boolean }, options: DateOptions): string | undefined {
  return parsed.calendarDay ? 'UTC' : options.timeZone;
}

/** A day: "Dec 2, 2026" (en-US), "02.12.2026" (de-DE), "2 Dec 2026" (en-GB). '—' when missing. */
export function formatDate(input: DateInput | null | undefined, options: DateOptions = {}): string {
  if (input === null || input === undefined || input === '') return '—';
  const p = toDate(input);
  if (!p) return '—';
  return dateFormat(localesOf(options), { dateStyle: 'medium', timeZone: zone(p, options) }).format(p.date);
}

/** A short day for chart axes and tight columns: month and two-digit year, "Dec 26". */
export function formatMonth(input: DateInput | null | undefined, options: DateOptions = {}): string {
  if (input === null || input === undefined || input === '') return '—';
  const p = toDate(input);
  if (!p) return '—';
  return dateFormat(localesOf(options), { month: 'short', year: '2-digit', timeZone: zone(p, options) }).format(p.date);
}

/** A day and time to the minute: "Dec 2, 2026, 3:05 PM" or "02.12.2026, 15:05". */
export function formatDateTime(input: DateInput | null | undefined, options: DateOptions = {}): string {
  if (input === null || input === undefined || input === '') return '—';
  const p = toDate(input);
  if (!p) return '—';
  return dateFormat(localesOf(options), { dateStyle: 'medium', timeStyle: 'short', timeZone: zone(p, options) }).format(p.date);
}

/** A time of day to the minute: "3:05 PM" or "15:05". */
export function formatTime(input: DateInput | null | undefined, options: DateOptions = {}): string {
  if (input === null || input === undefined || input === '') return '—';
  const p = toDate(input);
  if (!p) return '—';
  return dateFormat(localesOf(options), { timeStyle: 'short', timeZone: zone(p, options) }).format(p.date);
}

const RELATIVE_STEPS: [Intl.RelativeTimeFormatUnit, number][] = [
  ['second', 60],
  ['minute', 60],
  ['hour', 24],
  ['day', 7],
  ['week', 4.348],
  ['month', 12],
  ['year', Number.POSITIVE_INFINITY],
];

/** How long ago or ahead, in the largest fitting unit: "3 hours ago", "vor 3 Stunden", "in 2 days". */
export function formatRelative(input: DateInput | null | undefined, options: FormatOptions & { now?: DateInput } = {}): string {
  if (input === null || input === undefined || input === '') return '—';
  const p = toDate(input);
  const now = toDate(options.now ?? Date.now());
  if (!p || !now) return '—';
  let amount = (p.date.getTime() - now.date.getTime()) / 1000;
  const locales = localesOf(options);
  const key = JSON.stringify(locales);
  let f = relativeFormats.get(key);
  if (!f) {
    f = new Intl.RelativeTimeFormat(locales, { numeric: 'auto' });
    relativeFormats.set(key, f);
  }
  for (const [unit, size] of RELATIVE_STEPS) {
    if (Math.abs(amount) < size) return f.format(Math.round(amount), unit);
    amount /= size;
  }
  return f.format(Math.round(amount), 'year');
}
