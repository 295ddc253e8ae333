// Turns the aggregated rows into what a manager reads: Pareto bars and repeat failures, the coming
// services with parts to order, guide effectiveness, and a Weibull fit per component with the
// reasons whenever something cannot be computed.
import type { Knex } from 'knex';
import { runCalculator, CalculatorInputError } from '../../../src/shared/calculators';
import { DEFAULT_THRESHOLDS } from '../../../src/shared/calculators/service-forecast';
import { benardMedianRank, johnsonAdjustedRanks, weibullMrr, weibullReliability } from '../../../src/shared/calculators/weibull';
import { replacementIntervals } from '../../../src/shared/insights/intervals';
import { pareto } from '../../../src/shared/insights/pareto';
import { localToday, WEAR_PART_ACTION, type WearPart } from '../../../src/shared/schemas/assets';
import type { SessionUser } from '../../../src/shared/schemas/auth';
import type {
  CausesAnswer,
  CausesQuery,
  ForecastAnswer,
  ForecastQuery,
  ForecastRow,
  GuidesAnswer,
  GuidesQuery,
  ReliabilityAnswer,
  ReliabilityPart,
  ReliabilityQuery,
} from '../../../src/shared/schemas/insights';
import { addDays, counterModel, forecasts } from '../assets/assets.counters';
import { insightsRepository as repo, type Period } from './insights.repository';

/** Without dates, a year back from today: long enough to see seasons, short enough to be current. */
function period(q: { from?: string; to?: string }): Period {
  const to = q.to ?? localToday();
  return { from: q.from ?? addDays(to, -365), to };
}

const TOP_TREND_CAUSES = 5;
const MAX_REPEATS = 200;

const PART_ACTION: Record<ReliabilityPart, string> = { ...WEAR_PART_ACTION, coil: 'coil-replaced' };
const PART_WORDS: Record<WearPart, RegExp> = { seat: /seat/i, needle: /needle/i, seals: /seal|o-ring/i };

export function createInsightsService(deps: { db: Knex }) {
  const { db } = deps;

  async function causes(user: SessionUser, q: CausesQuery): Promise<CausesAnswer> {
    const p = period(q);
    const [counts, repeated, labels] = await Promise.all([
      repo.causeCounts(db, user.organisationId, q, p),
      repo.repeats(db, user.organisationId, q, p, MAX_REPEATS),
      repo.causeLabels(db, user.organisationId),
    ]);
    const label = (code: string) => labels.get(code) ?? code;
    const byCode = new Map<string, number>();
    let fromWalks = 0;
    let fromService = 0;
    for (const c of counts) {
      byCode.set(c.code, (byCode.get(c.code) ?? 0) + c.count);
      if (c.src === 'walk') fromWalks += c.count;
      else fromService += c.count;
    }
    const bars = pareto([...byCode].map(([code, count]) => ({ code, count }))).map((b) => ({ ...b, label: label(b.code) }));
    const trendCodes = bars.slice(0, TOP_TREND_CAUSES).map((b) => b.code);
    const periods = new Map<string, Record<string, number>>();
    for (const c of counts) {
      if (!trendCodes.includes(c.code)) continue;
      const row = periods.get(c.period) ?? Object.fromEntries(trendCodes.map((t) => [t, 0]));
      row[c.code] += c.count;
      periods.set(c.period, row);
    }
    const repeats = repeated.rows.map((r) => ({ applicatorId: r.applicator_id, tag: r.tag, code: r.code, label: label(r.code), firstOn: r.first_on, repeatOn: r.repeat_on, daysApart: Number(r.days_apart) }));
    const total = fromWalks + fromService;
    return {
      ...p,
      total,
      fromWalks,
      fromService,
      pareto: bars,
      repeatDays: q.repeatDays,
      repeats,
      repeatTotal: repeated.total,
      bucket: q.bucket,
      trend: [...periods].sort(([a], [b]) => (a < b ? -1 : 1)).map(([periodStart, counts]) => ({ period: periodStart, counts })),
      trendCodes,
      empty:
        total === 0
          ? `No walk ended at a Finding with a cause and no service recorded a failure cause between ${p.from} and ${p.to} with these filters, so there is nothing to rank.`
          : null,
    };
  }

  async function forecast(user: SessionUser, q: ForecastQuery): Promise<ForecastAnswer> {
    const today = localToday();
    const horizon = addDays(today, q.days);
    const applicators = await repo.forecastApplicators(db, user.organisationId, q.siteId);
    const [readings, services] = await Promise.all([repo.readingsOf(db, user.organisationId, applicators.length < 500 ? applicators.map((a) => a.id) : undefined), repo.lastWearServices(db, user.organisationId)]);
    const lastByApplicator = new Map<number, typeof services>();
    for (const s of services) {
      const list = lastByApplicator.get(s.applicator_id) ?? [];
      list.push(s);
      lastByApplicator.set(s.applicator_id, list);
    }
    const rows: ForecastRow[] = [];
    const noForecast: ForecastAnswer['noForecast'] = [];
    for (const a of applicators) {
      const expected = { cyclesPerMinute: a.cycles_per_minute, hoursPerDay: a.hours_per_day, daysPerWeek: a.days_per_week };
      const model = counterModel(readings.get(a.id) ?? [], { installedOn: a.installed_on, expected, today });
      const last = lastByApplicator.get(a.id) ?? [];
      const events = last.map((s) => ({ id: s.id, performedOn: s.performed_on, actions: s.actions as never, readingId: s.reading_id }));
      const num = (v: string | null) => (v === null ? null : Number(v));
      const views = forecasts({ model, events, actuation: a.actuation, intervals: { seat: num(a.seat_interval_cycles), needle: num(a.needle_interval_cycles), seals: num(a.seals_interval_cycles) }, expected, today });
      const reasons = new Set<string>();
      for (const v of views) {
        if (v.status === 'no-forecast' || v.dueOn === null || v.cyclesSince === null) {
          reasons.add(v.warnings[0] ?? 'The counter does not move, so no date can be given.');
          continue;
        }
        if (v.dueOn > horizon) continue;
        const previous = last.find((s) => s.action === WEAR_PART_ACTION[v.part]);
        // A service that renewed several parts lists all their kits; keep the ones named for this part.
        const onlyThis = previous ? previous.actions.filter((x) => Object.values(WEAR_PART_ACTION).includes(x as never)).length === 1 : false;
        const parts = (previous?.parts ?? []).filter((p) => onlyThis || PART_WORDS[v.part].test(p.name)).map((p) => ({ name: p.name, partNumber: p.partNumber ?? null, quantity: p.quantity }));
        rows.push({
          applicatorId: a.id,
          tag: a.tag,
          site: a.site,
          line: a.line,
          part: v.part,
          dueOn: v.dueOn,
          daysRemaining: v.status === 'overdue' ? 0 : Math.max(0, Math.floor(v.daysRemaining ?? 0)),
          status: v.status === 'overdue' ? 'overdue' : 'ok',
          cyclesSince: v.cyclesSince,
          threshold: v.threshold,
          parts,
          partsKnown: parts.length > 0,
        });
      }
      if (reasons.size) noForecast.push({ applicatorId: a.id, tag: a.tag, reason: [...reasons].join(' ') });
    }
    rows.sort((x, y) => (x.dueOn < y.dueOn ? -1 : x.dueOn > y.dueOn ? 1 : x.tag < y.tag ? -1 : 1));
    const order = new Map<string, { partNumber: string | null; name: string; quantity: number; applicators: Set<number> }>();
    for (const r of rows) {
      for (const p of r.parts) {
        // Summed by part number; a part recorded without one can only be matched by its name.
        const key = p.partNumber ? `#${p.partNumber.toUpperCase()}` : `name:${p.name.toLowerCase()}`;
        const o = order.get(key) ?? { partNumber: p.partNumber, name: p.name, quantity: 0, applicators: new Set<number>() };
        o.quantity += p.quantity;
        o.applicators.add(r.applicatorId);
        order.set(key, o);
      }
    }
    return {
      today,
      days: q.days,
      rows,
      partsToOrder: [...order.values()]
        .map((o) => ({ partNumber: o.partNumber, name: o.name, quantity: o.quantity, applicators: o.applicators.size }))
        .sort((a, b) => b.quantity - a.quantity || a.name.localeCompare(b.name)),
      partsUnknown: rows.filter((r) => !r.partsKnown).length,
      noForecast,
    };
  }

  async function guides(user: SessionUser, q: GuidesQuery): Promise<GuidesAnswer> {
    const p = period(q);
    const { rows, abandonedSteps, flags } = await repo.guideEffectiveness(db, user.organisationId, q, p);
    const versionIds = rows.map((r) => Number(r.guide_version_id));
    const titles = await repo.stepTitles(db, [...new Set(abandonedSteps.map((s) => s.guide_version_id))]);
    const flagsBy = new Map(flags.map((f) => [f.guide_version_id, Number(f.n)]));
    return {
      ...p,
      versions: rows.map((r, i) => {
        const versionId = versionIds[i];
        const median = r.median_minutes === null ? null : Number(r.median_minutes);
        return {
          guideId: Number(r.guide_id),
          versionId,
          versionNumber: Number(r.number),
          title: String(r.title),
          started: Number(r.started),
          finished: Number(r.finished),
          fixed: Number(r.fixed),
          notFixed: Number(r.not_fixed),
          fixedByOther: Number(r.fixed_by_other),
          abandoned: Number(r.abandoned),
          open: Number(r.open),
          abandonedAt: abandonedSteps
            .filter((s) => s.guide_version_id === versionId)
            .map((s) => ({ stepId: s.step_id, title: titles.get(versionId)?.get(s.step_id) ?? s.step_id, count: Number(s.n) }))
            .sort((a, b) => b.count - a.count),
          medianMinutesToFinding: median !== null && Number.isFinite(median) ? median : null,
          openFlags: flagsBy.get(versionId) ?? 0,
        };
      }),
    };
  }

  async function reliability(user: SessionUser, q: ReliabilityQuery): Promise<ReliabilityAnswer> {
    const { applicators, events } = await repo.replacements(db, user.organisationId, PART_ACTION[q.part], { ...q, part: q.part });
    const readings = await repo.readingsOf(db, user.organisationId, applicators.length < 500 ? applicators.map((a) => a.id) : undefined);
    const intervals: ReliabilityAnswer['intervals'] = [];
    const skipped: string[] = [];
    const byApplicator = new Map<number, typeof events>();
    for (const e of events) {
      const list = byApplicator.get(e.applicator_id) ?? [];
      list.push(e);
      byApplicator.set(e.applicator_id, list);
    }
    for (const a of applicators) {
      const own = byApplicator.get(a.id) ?? [];
      const r = replacementIntervals({
        readings: readings.get(a.id) ?? [],
        replacements: own.map((e) => ({ id: e.id, performedOn: e.performed_on, readingId: e.reading_id, failed: e.cause_code !== null })),
        stillRunning: a.status === 'running',
      });
      intervals.push(...r.intervals.map((i) => ({ ...i, applicatorId: a.id, tag: a.tag })));
      skipped.push(...r.skipped.map((s) => `${a.tag}: ${s}`));
    }
    const failures = intervals.filter((i) => i.kind === 'failure').map((i) => i.cycles);
    const suspensions = intervals.filter((i) => i.kind === 'suspension').map((i) => i.cycles);
    const plannedCycles = q.part === 'coil' ? null : DEFAULT_THRESHOLDS[q.part];
    const base = { part: q.part, unit: 'cycles' as const, intervals, failures: failures.length, suspensions: suspensions.length, skipped: skipped.slice(0, 50) };
    const planned = plannedCycles === null ? null : { cycles: plannedCycles, source: 'common practice (seat 100 million, needle 500 million, seals half the seat interval)' };
    const cannot = (reason: string): ReliabilityAnswer => ({ ...base, fit: null, plot: null, planned: planned && { ...planned, unreliabilityAtPlanned: null }, cannotFit: reason });
    if (failures.length === 0) {
      return cannot(
        intervals.length === 0
          ? 'No replacement of this part has counter readings around it, so no interval in cycles is known yet.'
          : `All ${suspensions.length} intervals ended without a failure (planned changes or still running): a life model needs failures to estimate from.`,
      );
    }
    if (failures.length === 1) return cannot('Only one failure: one failure cannot show how spread out failures are; at least two are needed.');
    let fit: ReliabilityAnswer['fit'];
    try {
      const mle = runCalculator('weibull', { inputs: { failures: { values: failures, unit: 'cycles' }, ...(suspensions.length ? { suspensions: { values: suspensions, unit: 'cycles' } } : {}), method: 'mle' } });
      const value = (k: string) => {
        const o = mle.outputs[k];
        return typeof o === 'object' ? o.value : Number.NaN;
      };
      fit = { method: 'maximum likelihood', shape: value('shape'), scale: value('scale'), b10: value('b10'), warnings: mle.warnings.map((w) => w.message) };
    } catch (err) {
      if (err instanceof CalculatorInputError) return cannot(Object.values(err.fields).join('; '));
      throw err;
    }
    if (![fit.shape, fit.scale, fit.b10].every(Number.isFinite)) return cannot('These intervals give no finite Weibull estimate.');
    let plot: ReliabilityAnswer['plot'] = null;
    try {
      const mrr = weibullMrr(failures, suspensions);
      const n = failures.length + suspensions.length;
      plot = {
        method: 'median-rank regression',
        shape: mrr.shape,
        scale: mrr.scale,
        rSquared: mrr.rSquared,
        points: johnsonAdjustedRanks(failures, suspensions).map(({ age, rank }) => {
          const F = benardMedianRank(rank, n);
          return { cycles: age, medianRank: F, x: Math.log(age), y: Math.log(-Math.log(1 - F)) };
        }),
      };
      if (![plot.shape, plot.scale].every(Number.isFinite)) plot = null;
    } catch {
      plot = null;
    }
    return {
      ...base,
      fit,
      plot,
      planned: planned && { ...planned, unreliabilityAtPlanned: 1 - weibullReliability(planned.cycles, fit.shape, fit.scale) },
      cannotFit: null,
    };
  }

  return { causes, forecast, guides, reliability };
}
