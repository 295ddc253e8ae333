// Cycles a part lasted between replacements on one applicator, read from the counter (carried
// across counter resets), with the part still in service counted as a suspension for the Weibull fit.

export interface CounterPoint {
  id: number;
  readOn: string;
  count: number;
  counterReset: boolean;
}

export interface Replacement {
  id: number;
  performedOn: string;
  readingId: number | null;
  /** A cause was recorded: the part failed. Without one it was a planned change. */
  failed: boolean;
}

export interface Interval {
  from: string | null;
  to: string | null;
  cycles: number;
  kind: 'failure' | 'suspension';
  /** Why it ended: failed, planned change, or still running. */
  reason: 'failed' | 'planned' | 'running';
}

export interface IntervalResult {
  intervals: Interval[];
  /** What had to be left out, in words. */
  skipped: string[];
}

/** Lifetime cycles at each reading: after a reset the new counter's value adds to the old total. */
export function lifetimes(readings: readonly CounterPoint[]): (CounterPoint & { lifetime: number })[] {
  const sorted = [...readings].sort((a, b) => (a.readOn < b.readOn ? -1 : a.readOn > b.readOn ? 1 : a.id - b.id));
  let lifetime = 0;
  let prev: CounterPoint | undefined;
  return sorted.map((r) => {
    lifetime += r.counterReset || !prev ? r.count : r.count - prev.count;
    prev = r;
    return { ...r, lifetime };
  });
}

const day = (d: string) => Date.parse(`${d}T00:00:00Z`);

/**
 * Intervals between replacements of one part. The counter starts at zero when the valve is
 * installed, so the first interval runs from installation. An event's lifetime is the reading it
 * recorded, else interpolated between the readings around its date; outside them it is unknown.
 */
export function replacementIntervals(opts: { readings: readonly CounterPoint[]; replacements: readonly Replacement[]; stillRunning: boolean }): IntervalResult {
  const points = lifetimes(opts.readings);
  const byId = new Map(points.map((p) => [p.id, p.lifetime]));
  const skipped: string[] = [];
  const at = (date: string): number | null => {
    if (!points.length || date < points[0].readOn || date > points[points.length - 1].readOn) return null;
    const before = points.filter((p) => p.readOn <= date);
    const a = before[before.length - 1];
    const b = points.find((p) => p.readOn > date);
    if (!b) return a.lifetime;
    return a.lifetime + ((b.lifetime - a.lifetime) * (day(date) - day(a.readOn))) / (day(b.readOn) - day(a.readOn));
  };
  const events = [...opts.replacements].sort((a, b) => (a.performedOn < b.performedOn ? -1 : a.performedOn > b.performedOn ? 1 : a.id - b.id));
  const intervals: Interval[] = [];
  let start: number | null = 0;
  let startOn: string | null = null;
  for (const e of events) {
    const end = (e.readingId !== null ? byId.get(e.readingId) : undefined) ?? at(e.performedOn);
    if (end === null) {
      skipped.push(`The replacement on ${e.performedOn} has no counter reading around it, so the cycles before and after it are unknown.`);
    } else if (start !== null) {
      const cycles = Math.round(end - start);
      if (cycles > 0) intervals.push({ from: startOn, to: e.performedOn, cycles, kind: e.failed ? 'failure' : 'suspension', reason: e.failed ? 'failed' : 'planned' });
      else skipped.push(`The replacement on ${e.performedOn} shows no cycles since the one before it.`);
    }
    start = end;
    startOn = e.performedOn;
  }
  const last = points[points.length - 1];
  if (opts.stillRunning && last && start !== null) {
    // Counted to the last reading, not carried forward: a suspension must not claim cycles not seen.
    const cycles = Math.round(last.lifetime - start);
    if (cycles > 0) intervals.push({ from: startOn, to: null, cycles, kind: 'suspension', reason: 'running' });
  }
  return { intervals, skipped };
}
