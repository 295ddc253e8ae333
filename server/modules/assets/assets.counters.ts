// Cycle counter arithmetic: the order rule for readings, lifetime cycles carried across counter
// resets, the rate the counter runs at, and the seat, needle and seal forecasts from the
// service-forecast calculator. Pure functions, so the rules can be tested without a database.
import { runCalculator } from '../../../src/shared/calculators';
import { DEFAULT_THRESHOLDS } from '../../../src/shared/calculators/service-forecast';
import { WEAR_PART_ACTION, type CounterSummary, type ForecastView, type RateSource, type ServiceAction, type WearPart } from '../../../src/shared/schemas/assets';

/** A reading older than this no longer tells how fast the counter runs today. */
export const RECENT_READING_DAYS = 30;
/** The observed rate is taken over the readings of this many days before the last one. */
export const RATE_WINDOW_DAYS = 90;

const DAY_MS = 86_400_000;

export interface ReadingPoint {
  id: number;
  readOn: string;
  count: number;
  counterReset: boolean;
}

export interface LifetimePoint extends ReadingPoint {
  lifetime: number;
}

export interface ExpectedRate {
  cyclesPerMinute: number | null;
  hoursPerDay: number | null;
  daysPerWeek: number | null;
}

export function daysBetween(from: string, to: string): number {
  return (Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / DAY_MS;
}

export function addDays(date: string, days: number): string {
  return new Date(Date.parse(`${date}T00:00:00Z`) + Math.round(days) * DAY_MS).toISOString().slice(0, 10);
}

/** Date order, then the order they were recorded in: readings on one day keep their sequence. */
export function byDate<T extends { readOn: string; id: number }>(a: T, b: T): number {
  return a.readOn < b.readOn ? -1 : a.readOn > b.readOn ? 1 : a.id - b.id;
}

const fmt = (n: number) => n.toLocaleString('en-GB');

/**
 * Where a new reading on `readOn` would sit among the existing ones, and why it cannot, if it
 * cannot: a counter only goes up, unless the valve or its controller was replaced.
 */
export function readingProblem(existing: ReadingPoint[], candidate: { readOn: string; count: number; counterReset: boolean }): string | null {
  const sorted = [...existing].sort(byDate);
  // A new reading goes after those already recorded on the same day.
  const before = sorted.filter((r) => r.readOn <= candidate.readOn);
  const after = sorted.filter((r) => r.readOn > candidate.readOn);
  const prev = before[before.length - 1];
  const next = after[0];
  if (prev && !candidate.counterReset && candidate.count < prev.count) {
    return `The counter cannot go backwards: ${fmt(candidate.count)} cycles is below the ${fmt(prev.count)} cycles read on ${prev.readOn}. If the valve or its controller was replaced, mark the reading as a counter reset.`;
  }
  if (next && !next.counterReset && next.count < candidate.count) {
    return `This reading is higher than the ${fmt(next.count)} cycles read later, on ${next.readOn}; check the date and the digits.`;
  }
  return null;
}

/** Whether removing one reading leaves the rest in order (a reset it carried would otherwise vanish). */
export function removalProblem(existing: ReadingPoint[], removeId: number): string | null {
  const sorted = [...existing].sort(byDate);
  const i = sorted.findIndex((r) => r.id === removeId);
  if (i < 0) return null;
  const prev = sorted[i - 1];
  const next = sorted[i + 1];
  if (prev && next && !next.counterReset && next.count < prev.count) {
    return `Removing it would leave the counter going backwards from ${fmt(prev.count)} (${prev.readOn}) to ${fmt(next.count)} (${next.readOn}).`;
  }
  return null;
}

/**
 * Cycles since installation at each reading. The counter is taken to start at zero when the valve
 * is installed; after a reset, the new counter's value adds to what had been counted before.
 */
export function withLifetime<T extends ReadingPoint>(readings: T[]): (T & { lifetime: number })[] {
  const sorted = [...readings].sort(byDate);
  let lifetime = 0;
  let prev: T | undefined;
  return sorted.map((r) => {
    lifetime += r.counterReset || !prev ? r.count : r.count - prev.count;
    prev = r;
    return { ...r, lifetime };
  });
}

export function expectedCyclesPerDay(rate: ExpectedRate): number | null {
  const { cyclesPerMinute: cpm, hoursPerDay: h, daysPerWeek: d } = rate;
  if (cpm === null || h === null || d === null) return null;
  return cpm * 60 * h * (d / 7);
}

/** Cycles per day from the readings of the last RATE_WINDOW_DAYS before the latest one. */
export function observedCyclesPerDay(points: LifetimePoint[]): number | null {
  if (points.length < 2) return null;
  const last = points[points.length - 1];
  const window = points.filter((p) => daysBetween(p.readOn, last.readOn) <= RATE_WINDOW_DAYS);
  const first = window[0];
  const days = daysBetween(first.readOn, last.readOn);
  if (days < 1) return null;
  return Math.max(0, (last.lifetime - first.lifetime) / days);
}

export interface CounterModel {
  points: LifetimePoint[];
  cyclesPerDay: number | null;
  rateSource: RateSource;
  /** Lifetime cycles on a date: read, interpolated between readings, or carried forward at the rate. */
  lifetimeAt: (date: string) => number | null;
  summary: CounterSummary;
}

export function counterModel(readings: ReadingPoint[], opts: { installedOn: string | null; expected: ExpectedRate; today: string }): CounterModel {
  const points = withLifetime(readings);
  const last = points[points.length - 1];
  const recent = last !== undefined && daysBetween(last.readOn, opts.today) <= RECENT_READING_DAYS;
  const observed = observedCyclesPerDay(points);
  const expected = expectedCyclesPerDay(opts.expected);
  // Fresh readings say what the line does now; without them the planned rate is the better guess.
  let rateSource: RateSource = 'none';
  let cyclesPerDay: number | null = null;
  if (recent && observed !== null) [rateSource, cyclesPerDay] = ['readings', observed];
  else if (expected !== null) [rateSource, cyclesPerDay] = ['expected', expected];
  else if (observed !== null) [rateSource, cyclesPerDay] = ['readings', observed];

  const lifetimeAt = (date: string): number | null => {
    if (!points.length) {
      if (opts.installedOn && cyclesPerDay !== null && date >= opts.installedOn) return cyclesPerDay * daysBetween(opts.installedOn, date);
      return opts.installedOn && date <= opts.installedOn ? 0 : null;
    }
    const first = points[0];
    if (date < first.readOn) {
      if (!opts.installedOn || opts.installedOn >= first.readOn) return null;
      if (date <= opts.installedOn) return 0;
      return (first.lifetime * daysBetween(opts.installedOn, date)) / daysBetween(opts.installedOn, first.readOn);
    }
    const onOrBefore = points.filter((p) => p.readOn <= date);
    const a = onOrBefore[onOrBefore.length - 1];
    const b = points.find((p) => p.readOn > date);
    if (!b) return a.lifetime + (cyclesPerDay ?? 0) * daysBetween(a.readOn, date);
    return a.lifetime + ((b.lifetime - a.lifetime) * daysBetween(a.readOn, date)) / daysBetween(a.readOn, b.readOn);
  };

  const estimatedLifetime = lifetimeAt(opts.today);
  return {
    points,
    cyclesPerDay,
    rateSource,
    lifetimeAt,
    summary: {
      lastReadingOn: last?.readOn ?? null,
      lastCount: last?.count ?? null,
      estimatedLifetime: estimatedLifetime === null ? null : Math.round(estimatedLifetime),
      estimated: estimatedLifetime !== null && (!last || last.readOn < opts.today),
      cyclesPerDay,
      rateSource,
      stale: !recent,
    },
  };
}

export interface ServicePoint {
  id: number;
  performedOn: string;
  actions: ServiceAction[];
  readingId: number | null;
}

/** The organisation's default intervals (from its settings) for applicators without their own. */
export interface DefaultIntervals {
  intervals: Record<WearPart, number>;
  /** False while the organisation keeps the common-practice figures. */
  own: boolean;
}

/** Organisation settings as the forecasts take them. */
export function defaultIntervalsFrom(s: { serviceIntervals: { seatCycles: number; needleCycles: number; sealsCycles: number }; serviceIntervalsAreDefault: boolean }): DefaultIntervals {
  return { intervals: { seat: s.serviceIntervals.seatCycles, needle: s.serviceIntervals.needleCycles, seals: s.serviceIntervals.sealsCycles }, own: !s.serviceIntervalsAreDefault };
}

/**
 * The seat, needle and (on air-operated valves) seal forecasts: cycles since the part was last
 * renewed, against the applicator's own interval, else the organisation's default, else the
 * calculator's common-practice default.
 */
export function forecasts(opts: {
  model: CounterModel;
  events: ServicePoint[];
  actuation: 'electric' | 'air-operated';
  intervals: Record<WearPart, number | null>;
  expected: ExpectedRate;
  today: string;
  defaults?: DefaultIntervals;
}): ForecastView[] {
  // Electric valves have no sliding seals on the plunger, so there is no seal service to plan.
  const parts: WearPart[] = opts.actuation === 'air-operated' ? ['seat', 'needle', 'seals'] : ['seat', 'needle'];
  const now = opts.model.summary.estimatedLifetime;
  const lifetimeOfReading = new Map(opts.model.points.map((p) => [p.id, p.lifetime]));
  return parts.map((part): ForecastView => {
    const applicatorOwn = opts.intervals[part];
    const orgOwn = opts.defaults?.own ? opts.defaults.intervals[part] : null;
    // The figure given to the calculator; null leaves it on its common-practice rule of thumb.
    const own = applicatorOwn ?? orgOwn;
    const threshold = own ?? DEFAULT_THRESHOLDS[part];
    const renewed = opts.events.filter((e) => e.actions.includes(WEAR_PART_ACTION[part])).sort((a, b) => (a.performedOn < b.performedOn ? 1 : a.performedOn > b.performedOn ? -1 : b.id - a.id))[0];
    const start = renewed ? ((renewed.readingId !== null ? lifetimeOfReading.get(renewed.readingId) : undefined) ?? opts.model.lifetimeAt(renewed.performedOn)) : 0;
    const base = {
      part,
      since: renewed?.performedOn ?? null,
      threshold,
      thresholdSource: applicatorOwn !== null ? ('applicator' as const) : orgOwn !== null ? ('organisation' as const) : ('common-practice' as const),
    };
    if (now === null || start === null) {
      return {
        ...base,
        cyclesSince: null,
        cyclesPerDay: opts.model.cyclesPerDay,
        daysRemaining: null,
        dueOn: null,
        status: 'no-forecast',
        warnings: ['There is no counter reading (or expected rate) to count cycles from yet.'],
      };
    }
    const cyclesSince = Math.max(0, Math.round(now - start));
    const perDay = opts.model.cyclesPerDay ?? 0;
    // The expected rate goes in as the planner gave it; an observed rate as cycles spread over the day.
    const rateInputs =
      opts.model.rateSource === 'expected'
        ? {
            cycleRate: { value: opts.expected.cyclesPerMinute!, unit: '1/min' },
            hoursPerDay: { value: opts.expected.hoursPerDay!, unit: 'h' },
            activeFraction: { value: opts.expected.daysPerWeek! / 7, unit: '1' },
          }
        : { cycleRate: { value: perDay / 1440, unit: '1/min' }, hoursPerDay: { value: 24, unit: 'h' }, activeFraction: { value: 1, unit: '1' } };
    const result = runCalculator('service-forecast', {
      inputs: { ...rateInputs, cyclesSoFar: { value: cyclesSince, unit: 'cycles' }, part, ...(own !== null ? { threshold: { value: own, unit: 'cycles' } } : {}) },
      outputUnits: { daysRemaining: 'd' },
    });
    const status = result.outputs.status as ForecastView['status'];
    const remaining = result.outputs.daysRemaining;
    const daysRemaining = typeof remaining === 'object' ? remaining.value : null;
    const dueOn = daysRemaining !== null && status === 'ok' ? addDays(opts.today, Math.floor(daysRemaining)) : status === 'overdue' ? opts.today : null;
    return {
      ...base,
      cyclesSince,
      cyclesPerDay: opts.model.cyclesPerDay,
      daysRemaining,
      dueOn,
      status,
      warnings: result.warnings.map((w) => w.message),
    };
  });
}
