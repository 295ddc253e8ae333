// Turns the aggregated rows into what a manager reads: Pareto bars and repeat failures, the coming
// services with parts to order, guide effectiveness, and a Weibull fit per component with the
// reasons whenever something cannot be computed.
import type { Knex } from 'knex';
import { runCalculator, CalculatorInputError } from '../../../src/shared/calculators';
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
  InsightsStatus,
} from '../../../src/shared/schemas/insights';
import { addDays, counterModel, defaultIntervalsFrom, forecasts, type DefaultIntervals } from '../assets/assets.counters';
import { readOrgSettings } from '../admin/settings.routes';
import { insightsRepository as repo, type Period } from './insights.repository';
import { refreshSummaries, summaryReader, type RefreshResult } from './insights.summaries';

/** Without dates, a year back from today: long enough to see seasons, short enough to be current. */
function period(q: { from?: string; to?: string }): Period {
  const to = q.to ?? localToday();
  return { from: q.from ?? addDays(to, -365), to };
}

const TOP_TREND_CAUSES = 5;
const MAX_REPEATS = 200;
/** Intervals listed in a reliability answer; all of them go into the fit. */
const MAX_LISTED_INTERVALS = 500;
/** Points drawn on the probability plot; more are thinned evenly. */
const MAX_PLOT_POINTS = 1000;
const ACTUATION_KEYS = ['any', 'electric', 'air-operated'] as const;

const PART_ACTION: Record<ReliabilityPart, string> = { ...WEAR_PART_ACTION, coil: 'coil-replaced' };
const PART_WORDS: Record<WearPart, RegExp> = { seat: /seat/i, needle: /needle/i, seals: /seal|o-ring/i };

type Db = Knex | Knex.Transaction;
type Loaded = Awaited<ReturnType<typeof repo.replacementData>>;
interface PartIntervals {
  intervals: (ReliabilityAnswer['intervals'][number] & { actuation: string })[];
  skipped: { text: string; actuation: string }[];
}

/** The parts to order for a set of coming services, summed by part number. */
function partsSummary(rows: ForecastRow[]): Pick<ForecastAnswer, 'partsToOrder' | 'partsUnknown'> {
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
    partsToOrder: [...order.values()]
      .map((o) => ({ partNumber: o.partNumber, name: o.name, quantity: o.quantity, applicators: o.applicators.size }))
      .sort((a, b) => b.quantity - a.quantity || a.name.localeCompare(b.name)),
    partsUnknown: rows.filter((r) => !r.partsKnown).length,
  };
}

/** A narrower forecast (fewer days, one site) cut from a wider one: the same rows, parts re-summed. */
export function narrowForecast(wide: ForecastAnswer, q: ForecastQuery): ForecastAnswer {
  const horizon = addDays(wide.today, q.days);
  const rows = wide.rows.filter((r) => r.dueOn <= horizon && (!q.siteId || r.siteId === q.siteId));
  return { ...wide, days: q.days, rows, ...partsSummary(rows), noForecast: wide.noForecast.filter((n) => !q.siteId || n.siteId === q.siteId) };
}

function evenly<T>(list: T[], max: number): T[] {
  if (list.length <= max) return list;
  const step = (list.length - 1) / (max - 1);
  return Array.from({ length: max }, (_, i) => list[Math.round(i * step)]);
}

export function createInsightsService(deps: { db: Knex }) {
  const { db } = deps;

  async function orgDefaults(d: Db, organisationId: number): Promise<DefaultIntervals> {
    return defaultIntervalsFrom(await readOrgSettings(d, organisationId));
  }

  // ---- Exact answers, read from the raw history ------------------------------------------------

  async function causesExact(organisationId: number, q: CausesQuery, fromSummaries = false): Promise<CausesAnswer> {
    const p = period(q);
    const src = fromSummaries ? summaryReader : repo;
    const [counts, repeated, labels] = await Promise.all([src.causeCounts(db, organisationId, q, p), src.repeats(db, organisationId, q, p, MAX_REPEATS), repo.causeLabels(db, organisationId)]);
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
    const repeats = repeated.rows.map((r) => ({
      applicatorId: r.applicator_id,
      tag: r.tag,
      code: r.code,
      label: label(r.code),
      firstOn: r.first_on,
      repeatOn: r.repeat_on,
      daysApart: Number(r.days_apart),
    }));
    const total = fromWalks + fromService;
    return {
      asOf: null,
      ...p,
      total,
      fromWalks,
      fromService,
      pareto: bars,
      repeatDays: q.repeatDays,
      repeats,
      repeatTotal: repeated.total,
      bucket: q.bucket,
      trend: [...periods].sort(([a], [b]) => (a < b ? -1 : 1)).map(([periodStart, c]) => ({ period: periodStart, counts: c })),
      trendCodes,
      empty: total === 0 ? `No walk ended at a Finding with a cause and no service recorded a failure cause between ${p.from} and ${p.to} with these filters, so there is nothing to rank.` : null,
    };
  }

  async function forecastExact(d: Db, organisationId: number, q: ForecastQuery): Promise<ForecastAnswer> {
    const today = localToday();
    const horizon = addDays(today, q.days);
    const defaults = await orgDefaults(d, organisationId);
    const applicators = await repo.forecastApplicators(d as Knex, organisationId, q.siteId);
    const [readings, services] = await Promise.all([
      repo.readingsOf(d as Knex, organisationId, applicators.length < 500 ? applicators.map((a) => a.id) : undefined),
      repo.lastWearServices(d as Knex, organisationId),
    ]);
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
      const views = forecasts({
        model,
        events,
        actuation: a.actuation,
        intervals: { seat: num(a.seat_interval_cycles), needle: num(a.needle_interval_cycles), seals: num(a.seals_interval_cycles) },
        expected,
        today,
        defaults,
      });
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
          siteId: a.site_id,
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
      if (reasons.size) noForecast.push({ applicatorId: a.id, tag: a.tag, siteId: a.site_id, reason: [...reasons].join(' ') });
    }
    rows.sort((x, y) => (x.dueOn < y.dueOn ? -1 : x.dueOn > y.dueOn ? 1 : x.tag < y.tag ? -1 : x.tag > y.tag ? 1 : x.part < y.part ? -1 : 1));
    return {
      asOf: null,
      today,
      days: q.days,
      rows,
      ...partsSummary(rows),
      noForecast,
      defaultIntervals: { ...defaults.intervals, source: defaults.own ? 'organisation' : 'common-practice' },
    };
  }

  async function guidesExact(organisationId: number, q: GuidesQuery, fromSummaries = false): Promise<GuidesAnswer> {
    const p = period(q);
    const { rows, abandonedSteps } = fromSummaries ? await summaryReader.guideEffectiveness(db, organisationId, p) : await repo.guideEffectiveness(db, organisationId, q, p);
    const flags = await repo.openFlags(db, organisationId);
    const versionIds = rows.map((r) => Number(r.guide_version_id));
    const titles = await repo.stepTitles(db, [...new Set(abandonedSteps.map((s) => s.guide_version_id))]);
    const flagsBy = new Map(flags.map((f) => [f.guide_version_id, Number(f.n)]));
    return {
      asOf: null,
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
            .sort((a, b) => b.count - a.count || (a.stepId < b.stepId ? -1 : 1)),
          medianMinutesToFinding: median !== null && Number.isFinite(median) ? median : null,
          openFlags: flagsBy.get(versionId) ?? 0,
        };
      }),
    };
  }

  /** Intervals of one part on each loaded applicator, in applicator order, with what was left out. */
  function intervalsOf(data: Loaded, readings: Awaited<ReturnType<typeof repo.readingsOf>>, part: ReliabilityPart): PartIntervals {
    const action = PART_ACTION[part];
    // Electric valves have no sliding seals to wear.
    const applicators = part === 'seals' ? data.applicators.filter((a) => a.actuation === 'air-operated') : data.applicators;
    const wanted = new Set(applicators.map((a) => a.id));
    const intervals: PartIntervals['intervals'] = [];
    const skipped: PartIntervals['skipped'] = [];
    const byApplicator = new Map<number, Loaded['events']>();
    for (const e of data.events) {
      if (!wanted.has(e.applicator_id) || !e.actions.includes(action)) continue;
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
      intervals.push(...r.intervals.map((i) => ({ ...i, applicatorId: a.id, tag: a.tag, actuation: a.actuation })));
      skipped.push(...r.skipped.map((s) => ({ text: `${a.tag}: ${s}`, actuation: a.actuation })));
    }
    return { intervals, skipped };
  }

  /** The fit for one part from its intervals (already narrowed to the applicators asked about). */
  function reliabilityFrom(found: PartIntervals, part: ReliabilityPart, defaults: DefaultIntervals): ReliabilityAnswer {
    const intervals: ReliabilityAnswer['intervals'] = found.intervals.map(({ actuation: _a, ...i }) => i);
    const skipped = found.skipped.map((s) => s.text);
    const failures = intervals.filter((i) => i.kind === 'failure').map((i) => i.cycles);
    const suspensions = intervals.filter((i) => i.kind === 'suspension').map((i) => i.cycles);
    const base = {
      asOf: null,
      part,
      unit: 'cycles' as const,
      intervals: intervals.slice(0, MAX_LISTED_INTERVALS),
      intervalCount: intervals.length,
      failures: failures.length,
      suspensions: suspensions.length,
      skipped: skipped.slice(0, 50),
    };
    const planned =
      part === 'coil'
        ? null
        : defaults.own
          ? { cycles: defaults.intervals[part], source: 'your organisation’s default, set by an admin under Settings', sourceKind: 'organisation' as const }
          : { cycles: defaults.intervals[part], source: 'common practice (seat 100 million, needle 500 million, seals half the seat interval)', sourceKind: 'common-practice' as const };
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
      const mle = runCalculator('weibull', {
        inputs: { failures: { values: failures, unit: 'cycles' }, ...(suspensions.length ? { suspensions: { values: suspensions, unit: 'cycles' } } : {}), method: 'mle' },
      });
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
      const ranked = johnsonAdjustedRanks(failures, suspensions);
      plot = {
        method: 'median-rank regression',
        shape: mrr.shape,
        scale: mrr.scale,
        rSquared: mrr.rSquared,
        points: evenly(ranked, MAX_PLOT_POINTS).map(({ age, rank }) => {
          const F = benardMedianRank(rank, n);
          return { cycles: age, medianRank: F, x: Math.log(age), y: Math.log(-Math.log(1 - F)) };
        }),
        pointsTotal: ranked.length,
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

  async function reliabilityExact(d: Db, organisationId: number, q: ReliabilityQuery): Promise<ReliabilityAnswer> {
    const data = await repo.replacementData(d as Knex, organisationId, q);
    const readings = await repo.readingsOf(d as Knex, organisationId, data.applicators.length < 500 ? data.applicators.map((a) => a.id) : undefined);
    return reliabilityFrom(intervalsOf(data, readings, q.part), q.part, await orgDefaults(d, organisationId));
  }

  // ---- Stored answers ----------------------------------------------------------------------------

  const reliabilityKey = (part: ReliabilityPart, actuation: string | undefined) => `${part}|${actuation ?? 'any'}`;

  /** The organisation's forecast (widest horizon, all sites) and reliability per part and actuation. */
  async function computeSnapshots(trx: Knex.Transaction, organisationId: number) {
    const put = (kind: string, key: string, answer: unknown) =>
      trx.raw(
        `insert into insight_snapshots (organisation_id, kind, key, answer, computed_at) values (?, ?, ?, ?::jsonb, now())
         on conflict (organisation_id, kind, key) do update set answer = excluded.answer, computed_at = now()`,
        [organisationId, kind, key, JSON.stringify(answer)],
      );
    await put('forecast', 'all', await forecastExact(trx, organisationId, { days: 90 }));
    const defaults = await orgDefaults(trx, organisationId);
    const all = await repo.replacementData(trx as unknown as Knex, organisationId, {});
    const readings = await repo.readingsOf(trx as unknown as Knex, organisationId);
    for (const part of ['seat', 'needle', 'seals', 'coil'] as const) {
      // Intervals once per part; each actuation keeps its applicators' share, in the same order.
      const found = intervalsOf(all, readings, part);
      for (const actuation of ACTUATION_KEYS) {
        const mine = actuation === 'any' ? found : { intervals: found.intervals.filter((i) => i.actuation === actuation), skipped: found.skipped.filter((x) => x.actuation === actuation) };
        await put('reliability', reliabilityKey(part, actuation === 'any' ? undefined : actuation), reliabilityFrom(mine, part, defaults));
      }
    }
  }

  async function snapshot<T>(organisationId: number, kind: string, key: string): Promise<(T & { asOf: string | null }) | null> {
    const row = await db('insight_snapshots as s')
      .join('insight_refreshes as r', 'r.organisation_id', 's.organisation_id')
      .where({ 's.organisation_id': organisationId, 's.kind': kind, 's.key': key })
      .first('s.answer', 's.computed_at');
    return row ? { ...(row.answer as T), asOf: (row.computed_at as Date).toISOString() } : null;
  }

  /** Summaries are used once the organisation has been refreshed at least once. */
  async function refreshedAt(organisationId: number): Promise<string | null> {
    const r = await db('insight_refreshes').where({ organisation_id: organisationId }).first('refreshed_at');
    return r ? (r.refreshed_at as Date).toISOString() : null;
  }

  // ---- What the routes call ----------------------------------------------------------------------

  async function causes(user: SessionUser, q: CausesQuery): Promise<CausesAnswer> {
    // A guide narrows the raw history enough to read it directly (the summaries do not keep the
    // guide); the whole organisation and filters on the applicator read the summaries.
    const asOf = q.guideId ? null : await refreshedAt(user.organisationId);
    const answer = await causesExact(user.organisationId, q, asOf !== null);
    return { ...answer, asOf };
  }

  async function forecast(user: SessionUser, q: ForecastQuery): Promise<ForecastAnswer> {
    const wide = await snapshot<ForecastAnswer>(user.organisationId, 'forecast', 'all');
    // A forecast counted to another day is redone: days remaining are counted from today.
    if (wide && wide.today === localToday()) return narrowForecast(wide, q);
    return forecastExact(db, user.organisationId, q);
  }

  async function guides(user: SessionUser, q: GuidesQuery): Promise<GuidesAnswer> {
    const asOf = await refreshedAt(user.organisationId);
    return { ...(await guidesExact(user.organisationId, q, asOf !== null)), asOf };
  }

  async function reliability(user: SessionUser, q: ReliabilityQuery): Promise<ReliabilityAnswer> {
    if (!q.fluidFamily) {
      const stored = await snapshot<ReliabilityAnswer>(user.organisationId, 'reliability', reliabilityKey(q.part, q.actuation));
      if (stored) return stored;
    }
    return reliabilityExact(db, user.organisationId, q);
  }

  async function refresh(organisationId: number, opts: { full?: boolean } = {}): Promise<RefreshResult> {
    return refreshSummaries(db, organisationId, { full: opts.full, snapshots: (trx) => computeSnapshots(trx, organisationId) });
  }

  async function status(organisationId: number): Promise<InsightsStatus> {
    const s = await summaryReader.state(db, organisationId);
    return s ?? { refreshedAt: null, fullAt: null, tookMs: null, requestedAt: null, changesWaiting: false };
  }

  return {
    causes,
    forecast,
    guides,
    reliability,
    refresh,
    status,
    /** The answers straight from the raw history, for comparison with the summaries. */
    exact: {
      causes: (organisationId: number, q: CausesQuery) => causesExact(organisationId, q),
      forecast: (organisationId: number, q: ForecastQuery) => forecastExact(db, organisationId, q),
      guides: (organisationId: number, q: GuidesQuery) => guidesExact(organisationId, q),
      reliability: (organisationId: number, q: ReliabilityQuery) => reliabilityExact(db, organisationId, q),
    },
  };
}

export type InsightsService = ReturnType<typeof createInsightsService>;
