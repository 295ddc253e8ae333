// Dates and numbers in the reader's locale: the same value in en-US and de-DE must differ in
// decimal separator, grouping and day/month order, and calendar days must not shift with time zones.
import { describe, expect, it } from 'vitest';
import { formatBytes, formatDate, formatDateTime, formatInteger, formatMonth, formatNumber, formatPercent, formatRelative, formatTime } from '@/lib/format';

// Intl separators: some locales use narrow no-break spaces; compare with plain spaces.
const plain = (s: string) => s.replace(/[\u00a0\u202f]/g, ' ');

describe('numbers', () => {
  it('when formatting a decimal in en-US and de-DE, then the point and comma swap roles', () => {
    expect(formatNumber(1234.5, { locale: 'en-US' })).toBe('1,234.5');
    expect(formatNumber(1234.5, { locale: 'de-DE' })).toBe('1.234,5');
  });

  it('when a value has more digits than asked for, then it is rounded, not cut', () => {
    expect(formatNumber(2.34567, { locale: 'en-US', maximumFractionDigits: 2 })).toBe('2.35');
    expect(formatNumber(2.34567, { locale: 'de-DE', maximumFractionDigits: 2 })).toBe('2,35');
    expect(formatNumber(0.5, { locale: 'en-US', minimumFractionDigits: 2 })).toBe('0.50');
    expect(formatNumber(123456, { locale: 'en-US', maximumSignificantDigits: 3 })).toBe('123,000');
  });

  it('when a tiny negative rounds to zero, then no minus sign is shown', () => {
    expect(formatNumber(-0.0001, { locale: 'en-US', maximumFractionDigits: 2 })).toBe('0');
    expect(formatNumber(-0.0001, { locale: 'de-DE', maximumFractionDigits: 2 })).toBe('0');
  });

  it('when a value is missing or not finite, then a dash stands in for it', () => {
    expect(formatNumber(null)).toBe('—');
    expect(formatNumber(undefined)).toBe('—');
    expect(formatNumber(Number.NaN)).toBe('—');
    expect(formatInteger(Number.POSITIVE_INFINITY)).toBe('—');
  });

  it('when formatting a cycle count, then it is whole and grouped by the locale', () => {
    expect(formatInteger(1_250_000.4, { locale: 'en-US' })).toBe('1,250,000');
    expect(formatInteger(1_250_000.4, { locale: 'de-DE' })).toBe('1.250.000');
    expect(formatInteger(999.5, { locale: 'en-US' })).toBe('1,000');
  });

  it('when formatting a share and a size, then percent and kB follow the locale', () => {
    expect(formatPercent(0.42, { locale: 'en-US' })).toBe('42%');
    expect(plain(formatPercent(0.42, { locale: 'de-DE' }))).toBe('42 %');
    expect(formatBytes(512, { locale: 'en-US' })).toBe('512 bytes');
    expect(formatBytes(1536, { locale: 'de-DE' })).toBe('1,5 kB');
    expect(formatBytes(5 * 1024 * 1024 + 100 * 1024, { locale: 'en-US' })).toBe('5.1 MB');
  });
});

describe('dates', () => {
  it('when formatting a day in en-US and de-DE, then the month comes first in one and the day in the other', () => {
    expect(formatDate('2026-03-04', { locale: 'en-US' })).toBe('Mar 4, 2026');
    expect(formatDate('2026-03-04', { locale: 'de-DE' })).toBe('04.03.2026');
  });

  it('when a calendar day is shown in a time zone far from UTC, then it is still the same day', () => {
    // A bare YYYY-MM-DD names a day; "2026-03-04" must not become March 3 in Honolulu.
    expect(formatDate('2026-03-04', { locale: 'en-US', timeZone: 'Pacific/Honolulu' })).toBe('Mar 4, 2026');
    expect(formatDate('2026-03-04', { locale: 'en-US', timeZone: 'Pacific/Kiritimati' })).toBe('Mar 4, 2026');
  });

  it('when formatting an instant with its time, then each locale uses its own clock', () => {
    const at = '2026-12-02T15:05:00Z';
    expect(plain(formatDateTime(at, { locale: 'en-US', timeZone: 'UTC' }))).toBe('Dec 2, 2026, 3:05 PM');
    expect(formatDateTime(at, { locale: 'de-DE', timeZone: 'UTC' })).toBe('02.12.2026, 15:05');
    expect(formatDateTime(at, { locale: 'de-DE', timeZone: 'Europe/Berlin' })).toBe('02.12.2026, 16:05');
    expect(plain(formatTime(at, { locale: 'en-US', timeZone: 'UTC' }))).toBe('3:05 PM');
    expect(formatTime(at, { locale: 'de-DE', timeZone: 'UTC' })).toBe('15:05');
  });

  it('when a date is missing or not a date, then a dash stands in for it', () => {
    expect(formatDate(null)).toBe('—');
    expect(formatDate('')).toBe('—');
    expect(formatDate('not a date')).toBe('—');
    expect(formatDateTime(undefined)).toBe('—');
  });

  it('when formatting a month for a chart axis, then it is short and in the locale', () => {
    expect(formatMonth('2026-03-04', { locale: 'en-US' })).toBe('Mar 26');
    expect(formatMonth('2026-03-04', { locale: 'de-DE' })).toBe('März 26');
  });

  it('when saying how long ago, then the largest fitting unit is used in the locale', () => {
    const now = '2026-12-02T12:00:00Z';
    expect(formatRelative('2026-12-02T09:00:00Z', { now, locale: 'en-US' })).toBe('3 hours ago');
    expect(formatRelative('2026-12-02T09:00:00Z', { now, locale: 'de-DE' })).toBe('vor 3 Stunden');
    expect(formatRelative('2026-12-04T12:00:00Z', { now, locale: 'en-US' })).toBe('in 2 days');
    expect(formatRelative('2026-12-01T12:00:00Z', { now, locale: 'en-US' })).toBe('yesterday');
    expect(formatRelative('2026-12-02T11:59:30Z', { now, locale: 'en-US' })).toBe('30 seconds ago');
  });
});
