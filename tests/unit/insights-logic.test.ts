// Pareto ordering, repeat failures and intervals between replacements on hand-made data whose
// answers were worked out by hand.
import { describe, expect, it } from 'vitest';
import { pareto } from '../../src/shared/insights/pareto';
import { repeatFailures } from '../../src/shared/insights/repeats';
import { lifetimes, replacementIntervals } from '../../src/shared/insights/intervals';

describe('pareto', () => {
  it('when causes are counted 5, 3, 2 (one cause given twice), then bars run 50 %, 80 %, 100 % cumulative', () => {
    const bars = pareto([
      { code: 'nozzle-blocked', count: 2 },
      { code: 'seat-worn', count: 4 },
      { code: 'coil-hot', count: 3 },
      { code: 'seat-worn', count: 1 },
    ]);
    expect(bars.map((b) => [b.code, b.count])).toEqual([
      ['seat-worn', 5],
      ['coil-hot', 3],
      ['nozzle-blocked', 2],
    ]);
    expect(bars.map((b) => b.percent)).toEqual([50, 30, 20]);
    expect(bars.map((b) => b.cumulativePercent)).toEqual([50, 80, 100]);
  });

  it('when two causes tie, then they are ordered by code, the same every time', () => {
    expect(
      pareto([
        { code: 'b', count: 1 },
        { code: 'a', count: 1 },
      ]).map((b) => b.code),
    ).toEqual(['a', 'b']);
  });

  it('when there are no causes (or only zero counts), then there are no bars rather than NaN shares', () => {
    expect(pareto([])).toEqual([]);
    expect(pareto([{ code: 'x', count: 0 }])).toEqual([]);
  });
});

describe('repeat failures', () => {
  const events = [
    { applicatorId: 1, code: 'seat-worn', on: '2026-01-01' },
    { applicatorId: 1, code: 'seat-worn', on: '2026-03-01' }, // 59 days after: a repeat within 90
    { applicatorId: 1, code: 'seat-worn', on: '2026-07-01' }, // 122 days after: not
    { applicatorId: 1, code: 'nozzle-blocked', on: '2026-01-10' }, // other cause: not
    { applicatorId: 2, code: 'seat-worn', on: '2026-01-20' }, // other applicator: not
    { applicatorId: 3, code: 'coil-hot', on: '2026-05-01' },
    { applicatorId: 3, code: 'coil-hot', on: '2026-05-31' }, // 30 days: repeat
  ];

  it('when the window is 90 days, then exactly the 59- and 30-day recurrences are repeats, latest first', () => {
    expect(repeatFailures(events, 90)).toEqual([
      { applicatorId: 3, code: 'coil-hot', firstOn: '2026-05-01', repeatOn: '2026-05-31', daysApart: 30 },
      { applicatorId: 1, code: 'seat-worn', firstOn: '2026-01-01', repeatOn: '2026-03-01', daysApart: 59 },
    ]);
  });

  it('when the window is 30 days, then the 30-day one counts (the boundary is inclusive) and the 59-day one does not', () => {
    expect(repeatFailures(events, 30).map((r) => r.daysApart)).toEqual([30]);
  });

  it('when events come unsorted with a chain of three close ones, then each is compared with the one before: two repeats', () => {
    const chain = [
      { applicatorId: 9, code: 'x', on: '2026-02-20' },
      { applicatorId: 9, code: 'x', on: '2026-02-01' },
      { applicatorId: 9, code: 'x', on: '2026-02-10' },
    ];
    expect(repeatFailures(chain, 15).map((r) => [r.firstOn, r.repeatOn])).toEqual([
      ['2026-02-10', '2026-02-20'],
      ['2026-02-01', '2026-02-10'],
    ]);
  });
});

describe('intervals between replacements', () => {
  const readings = [
    { id: 1, readOn: '2026-01-01', count: 0, counterReset: false },
    { id: 2, readOn: '2026-02-01', count: 40_000_000, counterReset: false },
    // The controller was replaced: the counter starts again, lifetime goes on from 60 M.
    { id: 3, readOn: '2026-03-01', count: 60_000_000, counterReset: false },
    { id: 4, readOn: '2026-03-02', count: 1_000_000, counterReset: true },
    { id: 5, readOn: '2026-05-01', count: 51_000_000, counterReset: false },
  ];

  it('when the counter was reset, then lifetime carries on across the reset', () => {
    expect(lifetimes(readings).map((p) => p.lifetime)).toEqual([0, 40e6, 60e6, 61e6, 111e6]);
  });

  it('when a failure, a planned change and a still-running part follow each other, then intervals are a failure, a suspension and a running suspension', () => {
    const r = replacementIntervals({
      readings,
      replacements: [
        { id: 10, performedOn: '2026-02-01', readingId: 2, failed: true },
        // No reading on the day: interpolated halfway between 61 M (2 Mar) and 111 M (1 May) → 30 days of 60 → 86 M.
        { id: 11, performedOn: '2026-04-01', readingId: null, failed: false },
      ],
      stillRunning: true,
    });
    expect(r.skipped).toEqual([]);
    expect(r.intervals.map((i) => [i.kind, i.reason, i.cycles])).toEqual([
      ['failure', 'failed', 40e6],
      ['suspension', 'planned', Math.round(61e6 + (50e6 * 30) / 60 - 40e6)],
      ['suspension', 'running', Math.round(111e6 - (61e6 + (50e6 * 30) / 60))],
    ]);
  });

  it('when a replacement lies outside the readings, then it is skipped with a reason and the next interval is not invented', () => {
    const r = replacementIntervals({ readings, replacements: [{ id: 12, performedOn: '2026-06-15', readingId: null, failed: true }], stillRunning: true });
    expect(r.intervals).toEqual([]);
    expect(r.skipped[0]).toMatch(/no counter reading around it/);
  });

  it('when the unit is retired, then no running suspension is added', () => {
    const r = replacementIntervals({ readings, replacements: [{ id: 10, performedOn: '2026-02-01', readingId: 2, failed: true }], stillRunning: false });
    expect(r.intervals.map((i) => i.reason)).toEqual(['failed']);
  });
});
