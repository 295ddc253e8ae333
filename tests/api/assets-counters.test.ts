// The cycle counter rules without a database: readings in order unless reset, lifetime across
// resets, which rate carries the counter forward, and the forecasts built on the
// service-forecast calculator with its common-practice intervals.
import { describe, expect, it } from 'vitest';
import { DEFAULT_THRESHOLDS } from '../../src/shared/calculators/service-forecast';
import { dateProblem, latestAllowedDate } from '../../src/shared/schemas/assets';
import { addDays, counterModel, forecasts, readingProblem, removalProblem, withLifetime, type ReadingPoint } from '../../server/modules/assets/assets.counters';

const r = (id: number, readOn: string, count: number, counterReset = false): ReadingPoint => ({ id, readOn, count, counterReset });
const noRate = { cyclesPerMinute: null, hoursPerDay: null, daysPerWeek: null };

describe('counter order', () => {
  const history = [r(1, '2025-01-01', 1000), r(2, '2025-02-01', 5000), r(3, '2025-03-01', 9000)];

  it('when a reading is lower than the one before it, then it is refused with both values named', () => {
    const problem = readingProblem(history, { readOn: '2025-03-10', count: 8000, counterReset: false });
    expect(problem).toMatch(/cannot go backwards: 8,000 cycles is below the 9,000 cycles read on 2025-03-01/);
  });

  it('when the same lower reading is marked as a counter reset, then it is accepted', () => {
    expect(readingProblem(history, { readOn: '2025-03-10', count: 12, counterReset: true })).toBeNull();
  });

  it('when a back-dated reading is higher than a later one, then it is refused', () => {
    expect(readingProblem(history, { readOn: '2025-01-15', count: 6000, counterReset: false })).toMatch(/higher than the 5,000 cycles read later, on 2025-02-01/);
    expect(readingProblem(history, { readOn: '2025-01-15', count: 3000, counterReset: false })).toBeNull();
  });

  it('when removing a reset reading would leave the counter going backwards, then removal is refused', () => {
    const withReset = [...history, r(4, '2025-04-01', 100, true), r(5, '2025-05-01', 4000)];
    expect(removalProblem(withReset, 4)).toMatch(/going backwards from 9,000/);
    expect(removalProblem(withReset, 5)).toBeNull();
  });
});

describe('lifetime and rate', () => {
  it('when the counter is reset, then lifetime cycles carry on from the total before the reset', () => {
    const points = withLifetime([r(1, '2025-01-01', 1000), r(2, '2025-02-01', 5000), r(3, '2025-03-01', 200, true), r(4, '2025-04-01', 1200)]);
    expect(points.map((p) => p.lifetime)).toEqual([1000, 5000, 5200, 6200]);
  });

  it('when recent readings exist, then their rate carries the counter forward to today', () => {
    const model = counterModel([r(1, '2025-03-01', 0), r(2, '2025-03-11', 1_000_000)], { installedOn: null, expected: { cyclesPerMinute: 1, hoursPerDay: 1, daysPerWeek: 1 }, today: '2025-03-21' });
    expect(model.rateSource).toBe('readings');
    expect(model.cyclesPerDay).toBe(100_000);
    expect(model.summary.estimatedLifetime).toBe(2_000_000);
    expect(model.summary).toMatchObject({ estimated: true, stale: false });
  });

  it('when no reading is recent, then the expected rate (cycles per minute, hours per day, days per week) is used', () => {
    const model = counterModel([r(1, '2024-01-01', 0), r(2, '2024-01-11', 1_000_000)], { installedOn: null, expected: { cyclesPerMinute: 60, hoursPerDay: 10, daysPerWeek: 7 }, today: '2024-03-11' });
    expect(model.rateSource).toBe('expected');
    expect(model.cyclesPerDay).toBe(36_000);
    expect(model.summary.stale).toBe(true);
    expect(model.summary.estimatedLifetime).toBe(1_000_000 + 36_000 * 60);
  });

  it('when there are no readings and no rate, then there is no estimate', () => {
    const model = counterModel([], { installedOn: '2024-01-01', expected: noRate, today: '2025-01-01' });
    expect(model.summary.estimatedLifetime).toBeNull();
    expect(model.rateSource).toBe('none');
  });
});

describe('forecasts', () => {
  it('when a seat was replaced at a counted reading, then the seat counts from there and the needle from installation, against the common-practice intervals', () => {
    const model = counterModel([r(1, '2025-01-01', 10_000_000), r(2, '2025-01-11', 20_000_000)], { installedOn: '2024-06-01', expected: noRate, today: '2025-01-11' });
    const [seat, needle] = forecasts({
      model,
      events: [{ id: 1, performedOn: '2025-01-01', actions: ['seat-replaced'], readingId: 1 }],
      actuation: 'electric',
      intervals: { seat: null, needle: null, seals: null },
      expected: noRate,
      today: '2025-01-11',
    });
    expect(seat).toMatchObject({ part: 'seat', since: '2025-01-01', cyclesSince: 10_000_000, threshold: DEFAULT_THRESHOLDS.seat, thresholdSource: 'common-practice', status: 'ok' });
    // 90 million cycles left at 1 million a day.
    expect(seat.daysRemaining).toBeCloseTo(90, 6);
    expect(seat.dueOn).toBe(addDays('2025-01-11', 90));
    expect(seat.warnings.join(' ')).toMatch(/rule of thumb/);
    expect(needle).toMatchObject({ part: 'needle', since: null, cyclesSince: 20_000_000, threshold: DEFAULT_THRESHOLDS.needle });
  });

  it('when the valve is air-operated with its own seal interval, then seals are forecast against that interval and overdue once past it', () => {
    const model = counterModel([r(1, '2025-01-01', 0), r(2, '2025-01-11', 3_000_000)], { installedOn: null, expected: noRate, today: '2025-01-11' });
    const list = forecasts({ model, events: [], actuation: 'air-operated', intervals: { seat: null, needle: null, seals: 2_000_000 }, expected: noRate, today: '2025-01-11' });
    expect(list.map((f) => f.part)).toEqual(['seat', 'needle', 'seals']);
    expect(list[2]).toMatchObject({ thresholdSource: 'applicator', threshold: 2_000_000, status: 'overdue', dueOn: '2025-01-11', warnings: [] });
  });

  it('when the valve is electric, then no seal forecast is made', () => {
    const model = counterModel([], { installedOn: null, expected: noRate, today: '2025-01-11' });
    const list = forecasts({ model, events: [], actuation: 'electric', intervals: { seat: null, needle: null, seals: null }, expected: noRate, today: '2025-01-11' });
    expect(list.map((f) => f.part)).toEqual(['seat', 'needle']);
    expect(list[0].status).toBe('no-forecast');
  });
});

describe('dates', () => {
  it('when a date has not begun anywhere on Earth, then it is refused as in the future; today is always accepted', () => {
    const now = new Date('2025-06-01T12:00:00Z');
    expect(latestAllowedDate(now)).toBe('2025-06-02');
    expect(dateProblem('2025-06-03', 'Reading date', now)).toMatch(/in the future/);
    expect(dateProblem('2025-06-01', 'Reading date', now)).toBeNull();
    expect(dateProblem('2025-02-30', 'Reading date', now)).toMatch(/YYYY-MM-DD/);
    expect(dateProblem('01/06/2025', 'Reading date', now)).toMatch(/YYYY-MM-DD/);
  });
});
