// The summary tables behind organisation-wide insights: refreshed per organisation (only the days
// and applicators the triggers marked, or everything on a full refresh) and read in place of the
// raw history once an organisation has been refreshed at least once.
import type { Knex } from 'knex';

type Binding = Knex.RawBinding;
import type { CausesQuery } from '../../../src/shared/schemas/insights';
import type { Period } from './insights.repository';

/** Advisory lock namespace: one refresh of an organisation at a time, across server processes. */
const LOCK_NS = 740_311;

export interface RefreshResult {
  organisationId: number;
  full: boolean;
  days: number;
  applicators: number;
  snapshots: boolean;
  tookMs: number;
  /** Milliseconds per step, to see where a slow refresh spends its time. */
  steps: Record<string, number>;
}

type Trx = Knex.Transaction;

const rows = <T>(r: { rows: T[] }) => r.rows;

/**
 * Finding causes (walks) and failure causes (services not already named by their walk's Finding)
 * of one organisation as SQL, optionally only on some days or some applicators.
 */
function causeEventsSql(filter: { days?: string[]; applicators?: number[] }): { sql: string; bindings: Binding[] } {
  const wb: Binding[] = [];
  const eb: Binding[] = [];
  let w = '';
  let e = '';
  if (filter.days) {
    const sorted = [...filter.days].sort();
    w += ` and w.ended_at >= ?::date::timestamp at time zone 'UTC' and w.ended_at < (?::date + 1)::timestamp at time zone 'UTC' and (w.ended_at at time zone 'UTC')::date = any(?::date[])`;
    wb.push(sorted[0], sorted[sorted.length - 1], sorted);
    e += ' and e.performed_on = any(?::date[])';
    eb.push(sorted);
  }
  if (filter.applicators) {
    w += ' and w.applicator_id = any(?::int[])';
    wb.push(filter.applicators);
    e += ' and e.applicator_id = any(?::int[])';
    eb.push(filter.applicators);
  }
  return {
    sql: `select w.applicator_id, w.cause_code as code, (w.ended_at at time zone 'UTC')::date as day, 'walk' as src
            from walks w
           where w.organisation_id = :org and w.end_kind = 'finding' and w.cause_code is not null and w.ended_at is not null${w}
          union all
          select e.applicator_id, e.cause_code as code, e.performed_on as day, 'service' as src
            from service_events e
           where e.organisation_id = :org and e.cause_code is not null${e}
             and not exists (select 1 from walks w2 where w2.id = e.walk_id and w2.end_kind = 'finding' and w2.cause_code is not null)`,
    bindings: [...wb, ...eb],
  };
}

/** Replaces `:org` (used twice) with positional bindings so knex.raw gets one style. */
function withOrg(sql: string, organisationId: number, bindings: Binding[], walkBindings: number): [string, Binding[]] {
  const parts = sql.split(':org');
  // First :org sits before the walk filters, the second before the service filters.
  return [parts.join('?'), [organisationId, ...bindings.slice(0, walkBindings), organisationId, ...bindings.slice(walkBindings)]];
}

async function refreshCauses(trx: Trx, organisationId: number, days: string[] | null, applicators: { applicatorId: number; from: string }[] | null) {
  // Day counts: every day named (or all of them).
  if (days === null || days.length) {
    const f = causeEventsSql(days ? { days } : {});
    const walkBindings = days ? 3 : 0;
    const [sql, b] = withOrg(f.sql, organisationId, f.bindings, walkBindings);
    if (days) await trx.raw('delete from insight_cause_days where organisation_id = ? and day = any(?::date[])', [organisationId, days]);
    else await trx('insight_cause_days').where({ organisation_id: organisationId }).delete();
    await trx.raw(`insert into insight_cause_days (organisation_id, day, code, src, n) select ?, day, code, src, count(*) from (${sql}) ev group by day, code, src`, [organisationId, ...b]);
  }
  if (applicators === null) {
    // Chains of every applicator from the start.
    const f = causeEventsSql({});
    const [sql, b] = withOrg(f.sql, organisationId, f.bindings, 0);
    await trx('insight_cause_chains').where({ organisation_id: organisationId }).delete();
    await trx.raw(
      `insert into insight_cause_chains (organisation_id, applicator_id, code, day, n, n_walk, prev_day)
       select ?, applicator_id, code, day, n, n_walk, lag(day) over (partition by applicator_id, code order by day)
         from (select applicator_id, code, day, count(*) as n, count(*) filter (where src = 'walk') as n_walk
                 from (${sql}) ev where applicator_id is not null group by applicator_id, code, day) g`,
      [organisationId, ...b],
    );
    await refreshRepeatDays(trx, organisationId, null);
  } else if (applicators.length) {
    await refreshChainsFrom(trx, organisationId, applicators);
    // Chain rows changed only on or after each applicator's earliest marked day.
    await refreshRepeatDays(trx, organisationId, applicators.map((a) => a.from).sort()[0]);
  }
}

/** Rebuilds the per-day repeat counts from the chains, from a day on (or all of them). */
async function refreshRepeatDays(trx: Trx, organisationId: number, from: string | null) {
  const since = from ? ' and day >= ?::date' : '';
  const b = from ? [from] : [];
  await trx.raw(`delete from insight_repeat_days where organisation_id = ?${since}`, [organisationId, ...b]);
  await trx.raw(
    `with c as (select day, n, day - prev_day as gap from insight_cause_chains where organisation_id = ?${since}),
     g as (select day, gap, count(*) as k from c where gap is not null group by day, gap),
     d as (select day, sum(n - 1) as same_day, max(gap) as mx from c group by day),
     s as (select d.day, x.s, coalesce(g.k, 0) as k
             from d cross join lateral generate_series(1, d.mx) as x(s)
             left join g on g.day = d.day and g.gap = x.s),
     r as (select day, array_agg(running order by s) as cum
             from (select day, s, sum(k) over (partition by day order by s) as running from s) y
            group by day)
     insert into insight_repeat_days (organisation_id, day, same_day, cum)
     select ?, d.day, d.same_day, coalesce(r.cum, '{}') from d left join r on r.day = d.day`,
    [organisationId, ...b, organisationId],
  );
}

/**
 * Chains of the applicators named, from the earliest day marked on each: rows before it keep
 * their values and give the first recomputed row its previous day.
 */
async function refreshChainsFrom(trx: Trx, organisationId: number, starts: { applicatorId: number; from: string }[]) {
  const apps = starts.map((s) => s.applicatorId);
  const froms = starts.map((s) => s.from);
  const earliest = [...froms].sort()[0];
  await trx.raw(
    `delete from insight_cause_chains c using unnest(?::int[], ?::date[]) as d(applicator_id, d0)
      where c.organisation_id = ? and c.applicator_id = d.applicator_id and c.day >= d.d0`,
    [apps, froms, organisationId],
  );
  await trx.raw(
    `with d as (select * from unnest(?::int[], ?::date[]) as d(applicator_id, d0)),
     ev as (
       select w.applicator_id, w.cause_code as code, (w.ended_at at time zone 'UTC')::date as day, 'walk' as src
         from walks w join d on d.applicator_id = w.applicator_id
        where w.organisation_id = ? and w.end_kind = 'finding' and w.cause_code is not null
          and w.ended_at >= ?::date::timestamp at time zone 'UTC' and w.ended_at >= d.d0::timestamp at time zone 'UTC'
       union all
       select e.applicator_id, e.cause_code, e.performed_on, 'service'
         from service_events e join d on d.applicator_id = e.applicator_id
        where e.organisation_id = ? and e.cause_code is not null and e.performed_on >= ?::date and e.performed_on >= d.d0
          and not exists (select 1 from walks w2 where w2.id = e.walk_id and w2.end_kind = 'finding' and w2.cause_code is not null)
     ),
     g as (select applicator_id, code, day, count(*) as n, count(*) filter (where src = 'walk') as n_walk from ev group by applicator_id, code, day)
     insert into insight_cause_chains (organisation_id, applicator_id, code, day, n, n_walk, prev_day)
     select ?, g.applicator_id, g.code, g.day, g.n, g.n_walk,
            coalesce(lag(g.day) over (partition by g.applicator_id, g.code order by g.day),
                     (select max(c.day) from insight_cause_chains c where c.organisation_id = ? and c.applicator_id = g.applicator_id and c.code = g.code and c.day < g.day))
       from g`,
    [apps, froms, organisationId, earliest, organisationId, earliest, organisationId, organisationId],
  );
}

async function refreshGuides(trx: Trx, organisationId: number, days: string[] | null) {
  if (days !== null && !days.length) return;
  const sorted = days ? [...days].sort() : null;
  const dayFilter = sorted
    ? ` and w.started_at >= ?::date::timestamp at time zone 'UTC' and w.started_at < (?::date + 1)::timestamp at time zone 'UTC' and (w.started_at at time zone 'UTC')::date = any(?::date[])`
    : '';
  const db: Binding[] = sorted ? [sorted[0], sorted[sorted.length - 1], sorted] : [];
  for (const table of ['insight_guide_days', 'insight_guide_durations', 'insight_guide_abandons']) {
    if (sorted) await trx.raw(`delete from ${table} where organisation_id = ? and day = any(?::date[])`, [organisationId, sorted]);
    else await trx(table).where({ organisation_id: organisationId }).delete();
  }
  const day = `(w.started_at at time zone 'UTC')::date`;
  await trx.raw(
    `insert into insight_guide_days (organisation_id, guide_id, guide_version_id, day, started, finished, fixed, not_fixed, fixed_by_other, abandoned, open)
     select ?, w.guide_id, w.guide_version_id, ${day} as d,
            count(*),
            count(*) filter (where w.status = 'ended'),
            count(*) filter (where w.outcome = 'fixed'),
            count(*) filter (where w.outcome = 'not-fixed'),
            count(*) filter (where w.outcome = 'fixed-by-other'),
            count(*) filter (where w.status = 'abandoned' or w.end_kind = 'abandoned'),
            count(*) filter (where w.status = 'open')
       from walks w join guide_versions v on v.id = w.guide_version_id
      where w.organisation_id = ?${dayFilter}
      group by w.guide_id, w.guide_version_id, d`,
    [organisationId, organisationId, ...db],
  );
  await trx.raw(
    `insert into insight_guide_durations (organisation_id, guide_version_id, day, minutes, n)
     select ?, w.guide_version_id, ${day} as d, ${MINUTES_TO_FINDING}, count(*)
       from walks w join guide_versions v on v.id = w.guide_version_id
      where w.organisation_id = ? and w.end_kind = 'finding' and w.ended_at is not null${dayFilter}
      group by w.guide_version_id, d, 4`,
    [organisationId, organisationId, ...db],
  );
  await trx.raw(
    `insert into insight_guide_abandons (organisation_id, guide_version_id, day, step_id, n)
     select ?, w.guide_version_id, ${day} as d, coalesce(w.ended_at_step_id, w.current_step_id) as step, count(*)
       from walks w
      where w.organisation_id = ? and w.guide_version_id is not null and (w.status = 'abandoned' or w.end_kind = 'abandoned')
        and coalesce(w.ended_at_step_id, w.current_step_id) is not null${dayFilter}
      group by w.guide_version_id, d, step`,
    [organisationId, organisationId, ...db],
  );
}

/**
 * Minutes from start to Finding, to the whole second: fine enough for a median of walks that take
 * minutes, and coarse enough that a period's values can be counted rather than listed.
 */
export const MINUTES_TO_FINDING = `(round(extract(epoch from (w.ended_at - w.started_at))) / 60)::float8`;

/**
 * Brings one organisation's summaries up to date: the days and applicators marked since the last
 * refresh, or everything when `full` (or never refreshed). `snapshots` recomputes the stored
 * forecast and reliability answers when counters, services or applicators changed.
 */
export async function refreshSummaries(db: Knex, organisationId: number, opts: { full?: boolean; snapshots: (trx: Trx) => Promise<void> }): Promise<RefreshResult> {
  const t0 = performance.now();
  return db.transaction(async (trx) => {
    await trx.raw('select pg_advisory_xact_lock(?, ?)', [LOCK_NS, organisationId]);
    const state = await trx('insight_refreshes').where({ organisation_id: organisationId }).first('refreshed_at');
    const full = Boolean(opts.full) || !state;
    // What changed, folded in SQL: a bulk import can mark millions of rows.
    const taken = full
      ? { days: [] as string[], apps: [] as { a: number; d: string }[], assets: true }
      : rows<{ r: { days: string[]; apps: { a: number; d: string }[]; assets: boolean } }>(
          await trx.raw(
            `with d as (delete from insight_dirty where organisation_id = ? returning kind, day, applicator_id)
             select json_build_object(
               'days', (select coalesce(json_agg(distinct to_char(day, 'YYYY-MM-DD')), '[]'::json) from d where kind = 'events' and day is not null),
               'apps', (select coalesce(json_agg(json_build_object('a', applicator_id, 'd', to_char(d0, 'YYYY-MM-DD'))), '[]'::json)
                          from (select applicator_id, min(day) as d0 from d where kind = 'events' and applicator_id is not null and day is not null group by applicator_id) x),
               'assets', exists (select 1 from d where kind = 'assets')) as r`,
            [organisationId],
          ),
        )[0].r;
    if (full) await trx('insight_dirty').where({ organisation_id: organisationId }).delete();
    const days = full ? null : taken.days;
    const applicators = full ? null : taken.apps.map((x) => ({ applicatorId: x.a, from: x.d }));
    const assets = full || taken.assets;
    const steps: Record<string, number> = {};
    let t = performance.now();
    const lap = (name: string) => {
      const now = performance.now();
      steps[name] = Math.round(now - t);
      t = now;
    };
    await refreshCauses(trx, organisationId, days, applicators);
    lap('causes');
    await refreshGuides(trx, organisationId, days);
    lap('guides');
    if (assets) {
      await opts.snapshots(trx);
      lap('snapshots');
    }
    const tookMs = Math.round(performance.now() - t0);
    await trx.raw(
      `insert into insight_refreshes (organisation_id, refreshed_at, full_at, took_ms) values (?, now(), case when ? then now() end, ?)
       on conflict (organisation_id) do update set refreshed_at = now(), full_at = coalesce(excluded.full_at, insight_refreshes.full_at), took_ms = excluded.took_ms, requested_at = null`,
      [organisationId, full, tookMs],
    );
    return { organisationId, full, days: days?.length ?? -1, applicators: applicators?.length ?? -1, snapshots: assets, tookMs, steps };
  });
}

/** The filters the chains can answer: those on the applicator (a guide filter needs the walks). */
export function hasApplicatorFilter(q: CausesQuery): boolean {
  return Boolean(q.siteId || q.lineId || q.actuation || q.fluidFamily);
}

function applicatorFilter(b: Knex.QueryBuilder, q: CausesQuery) {
  if (q.siteId) b.where('a.site_id', q.siteId);
  if (q.lineId) b.where('a.line_id', q.lineId);
  if (q.actuation) b.where('a.actuation', q.actuation);
  if (q.fluidFamily) b.whereRaw('lower(a.fluid_family) = lower(?)', [q.fluidFamily]);
}

export const summaryReader = {
  /** When the organisation's summaries were last refreshed; null when they never were. */
  async state(db: Knex, organisationId: number) {
    const r = await db('insight_refreshes').where({ organisation_id: organisationId }).first('refreshed_at', 'full_at', 'took_ms', 'requested_at');
    const pending = await db('insight_dirty').where({ organisation_id: organisationId }).first(db.raw('1 as x'));
    return r
      ? {
          refreshedAt: (r.refreshed_at as Date).toISOString(),
          fullAt: r.full_at ? (r.full_at as Date).toISOString() : null,
          tookMs: r.took_ms as number,
          requestedAt: r.requested_at ? (r.requested_at as Date).toISOString() : null,
          changesWaiting: Boolean(pending),
        }
      : null;
  },

  async causeCounts(db: Knex, organisationId: number, q: CausesQuery, p: Period) {
    if (hasApplicatorFilter(q)) return summaryReader.causeCountsOfApplicators(db, organisationId, q, p);
    const r: { code: string; src: 'walk' | 'service'; period: string; n: string }[] = await db('insight_cause_days')
      .select('code', 'src', db.raw(`to_char(date_trunc(?, day), 'YYYY-MM-DD') as period`, [q.bucket]), db.raw('sum(n) as n'))
      .where('organisation_id', organisationId)
      .whereBetween('day', [p.from, p.to])
      .groupBy('code', 'src', 'period');
    return r.map((x) => ({ code: x.code, src: x.src, period: x.period, count: Number(x.n) }));
  },

  /**
   * Counts narrowed to applicators (site, line, actuation, fluid family), from the chains: every
   * event of an applicator is in or out together, so its chain is the same as in the whole.
   */
  async causeCountsOfApplicators(db: Knex, organisationId: number, q: CausesQuery, p: Period) {
    const r: { code: string; period: string; w: string; s: string }[] = await db('insight_cause_chains as c')
      .join('applicators as a', 'a.id', 'c.applicator_id')
      .select('c.code', db.raw(`to_char(date_trunc(?, c.day), 'YYYY-MM-DD') as period`, [q.bucket]), db.raw('sum(c.n_walk) as w'), db.raw('sum(c.n - c.n_walk) as s'))
      .where('c.organisation_id', organisationId)
      .whereBetween('c.day', [p.from, p.to])
      .modify((b) => applicatorFilter(b, q))
      .groupBy('c.code', 'period');
    return r.flatMap((x) => [
      ...(Number(x.w) ? [{ code: x.code, src: 'walk' as const, period: x.period, count: Number(x.w) }] : []),
      ...(Number(x.s) ? [{ code: x.code, src: 'service' as const, period: x.period, count: Number(x.s) }] : []),
    ]);
  },

  /** The repeat rule of the exact query, read from the chains: total and the latest `limit`. */
  async repeats(db: Knex, organisationId: number, q: CausesQuery, p: Period, limit: number) {
    const narrowed = hasApplicatorFilter(q);
    // A day's repeats: those on the day itself, and rows whose previous day is within the window
    // and not before the period (the exact query pairs events inside the period only).
    const [{ total }] = narrowed
      ? rows<{ total: string }>(
          await db
            .from('insight_cause_chains as c')
            .join('applicators as a', 'a.id', 'c.applicator_id')
            .select(db.raw('coalesce(sum((c.n - 1) + case when c.prev_day >= ?::date and c.day - c.prev_day <= ? then 1 else 0 end), 0) as total', [p.from, q.repeatDays]))
            .where('c.organisation_id', organisationId)
            .whereBetween('c.day', [p.from, p.to])
            .modify((b) => applicatorFilter(b, q))
            .then((r) => ({ rows: r as { total: string }[] })),
        )
      : rows<{ total: string }>(
          await db.raw(
            `select coalesce(sum(same_day + case when k >= 1 then cum[k] else 0 end), 0) as total
               from (select same_day, cum, least(?::int, day - ?::date, cardinality(cum)) as k
                       from insight_repeat_days where organisation_id = ? and day between ? and ?) x`,
            [q.repeatDays, p.from, organisationId, p.from, p.to],
          ),
        );
    const chain: { applicator_id: number; code: string; day: string; n: number; prev_day: string | null; tag: string }[] = await db('insight_cause_chains as c')
      .join('applicators as a', 'a.id', 'c.applicator_id')
      .select('c.applicator_id', 'c.code', db.raw(`to_char(c.day, 'YYYY-MM-DD') as day`), 'c.n', db.raw(`to_char(c.prev_day, 'YYYY-MM-DD') as prev_day`), 'a.tag')
      .where('c.organisation_id', organisationId)
      .whereBetween('c.day', [p.from, p.to])
      .whereRaw('(c.n > 1 or (c.prev_day >= ?::date and c.day - c.prev_day <= ?))', [p.from, q.repeatDays])
      .modify((b) => applicatorFilter(b, q))
      .orderBy([{ column: 'c.day', order: 'desc' }, { column: 'c.applicator_id' }, { column: 'c.code' }])
      .limit(limit);
    const out: { applicator_id: number; code: string; first_on: string; repeat_on: string; days_apart: number; tag: string }[] = [];
    const gap = (a: string, b: string) => Math.round((Date.parse(`${b}T00:00:00Z`) - Date.parse(`${a}T00:00:00Z`)) / 86_400_000);
    for (const c of chain) {
      // The same order as the exact query: the repeat of an earlier day first, then those of the day itself.
      if (c.prev_day && c.prev_day >= p.from && gap(c.prev_day, c.day) <= q.repeatDays)
        out.push({ applicator_id: c.applicator_id, code: c.code, first_on: c.prev_day, repeat_on: c.day, days_apart: gap(c.prev_day, c.day), tag: c.tag });
      for (let i = 1; i < c.n; i++) out.push({ applicator_id: c.applicator_id, code: c.code, first_on: c.day, repeat_on: c.day, days_apart: 0, tag: c.tag });
      if (out.length >= limit) break;
    }
    return { total: Number(total), rows: out.slice(0, limit) };
  },

  async guideEffectiveness(db: Knex, organisationId: number, p: Period) {
    const counts: Record<string, unknown>[] = await db('insight_guide_days as d')
      .join('guide_versions as v', 'v.id', 'd.guide_version_id')
      .select(
        'd.guide_id',
        'd.guide_version_id',
        'v.number',
        'v.title',
        db.raw('sum(d.started) as started'),
        db.raw('sum(d.finished) as finished'),
        db.raw('sum(d.fixed) as fixed'),
        db.raw('sum(d.not_fixed) as not_fixed'),
        db.raw('sum(d.fixed_by_other) as fixed_by_other'),
        db.raw('sum(d.abandoned) as abandoned'),
        db.raw('sum(d.open) as open'),
      )
      .where('d.organisation_id', organisationId)
      .whereBetween('d.day', [p.from, p.to])
      .groupBy('d.guide_id', 'd.guide_version_id', 'v.number', 'v.title')
      .orderBy([
        { column: 'started', order: 'desc' },
        { column: 'd.guide_version_id', order: 'asc' },
      ]);
    const durations: { guide_version_id: number; minutes: number; n: string }[] = await db('insight_guide_durations')
      .select('guide_version_id', 'minutes', db.raw('sum(n) as n'))
      .where('organisation_id', organisationId)
      .whereBetween('day', [p.from, p.to])
      .groupBy('guide_version_id', 'minutes')
      .orderBy(['guide_version_id', 'minutes']);
    const abandonedSteps: { guide_version_id: number; step_id: string; n: string }[] = await db('insight_guide_abandons')
      .select('guide_version_id', 'step_id', db.raw('sum(n) as n'))
      .where('organisation_id', organisationId)
      .whereBetween('day', [p.from, p.to])
      .groupBy('guide_version_id', 'step_id');
    const byVersion = new Map<number, { minutes: number; n: number }[]>();
    for (const d of durations) {
      const list = byVersion.get(d.guide_version_id) ?? [];
      list.push({ minutes: d.minutes, n: Number(d.n) });
      byVersion.set(d.guide_version_id, list);
    }
    const rowsOut: Record<string, unknown>[] = counts.map((r) => ({ ...r, median_minutes: medianOfCounted(byVersion.get(Number(r.guide_version_id)) ?? []) }));
    return { rows: rowsOut, abandonedSteps };
  },
};

/**
 * The median of values given with their counts, interpolated as PostgreSQL's percentile_cont(0.5)
 * does: the value at position (N − 1) / 2, between its neighbours when that falls between two.
 */
export function medianOfCounted(sorted: readonly { minutes: number; n: number }[]): number | null {
  const total = sorted.reduce((s, x) => s + x.n, 0);
  if (total === 0) return null;
  const pos = (total - 1) * 0.5;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  const at = (k: number) => {
    let seen = 0;
    for (const x of sorted) {
      seen += x.n;
      if (k < seen) return x.minutes;
    }
    return sorted[sorted.length - 1].minutes;
  };
  const a = at(lo);
  if (hi === lo) return a;
  return a + (at(hi) - a) * (pos - lo);
}
