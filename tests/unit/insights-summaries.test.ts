// The pieces of the insights summaries that are pure: the median of counted values (as
// PostgreSQL's percentile_cont(0.5) interpolates) and the digest's week.
import { describe, expect, it } from 'vitest';
import { medianOfCounted } from '../../server/modules/insights/insights.summaries';
import { weekStart } from '../../server/modules/insights/insights.jobs';

/** The textbook median of a list: the middle value, or the mean of the two middle ones. */
function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

describe('median of counted values', () => {
  it('when values come with counts, then the median equals that of the list written out', () => {
    const counted = [
      { minutes: 10, n: 3 },
      { minutes: 12.5, n: 1 },
      { minutes: 20, n: 2 },
      { minutes: 31, n: 4 },
    ];
    const list = counted.flatMap((c) => Array(c.n).fill(c.minutes));
    expect(medianOfCounted(counted)).toBe(median(list));
    expect(medianOfCounted(counted)).toBe(20);
    expect(
      medianOfCounted([
        { minutes: 10, n: 1 },
        { minutes: 15, n: 1 },
      ]),
    ).toBe(12.5);
    expect(medianOfCounted([{ minutes: 7, n: 5 }])).toBe(7);
  });

  it('when random lists are counted, then the median always matches the written-out one', () => {
    for (let k = 0; k < 200; k++) {
      const values = Array.from({ length: 1 + Math.floor(Math.random() * 40) }, () => Math.round(Math.random() * 20) / 2);
      const counts = new Map<number, number>();
      for (const v of values) counts.set(v, (counts.get(v) ?? 0) + 1);
      const counted = [...counts].sort(([a], [b]) => a - b).map(([minutes, n]) => ({ minutes, n }));
      expect(medianOfCounted(counted)).toBeCloseTo(median(values), 12);
    }
  });

  it('when nothing was counted, then there is no median rather than NaN', () => {
    expect(medianOfCounted([])).toBeNull();
  });
});

describe('digest week', () => {
  it('when the day is a Sunday, then the week began six days before on Monday', () => {
    expect(weekStart('2026-12-06')).toBe('2026-11-30');
    expect(weekStart('2027-01-01')).toBe('2026-12-28');
  });
});
