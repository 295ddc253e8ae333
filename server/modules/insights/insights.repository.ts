// The insights queries: aggregated in PostgreSQL so a year of a large organisation's walks and
// service events comes back as a few hundred rows, never as raw history.
import type { Knex } from 'knex';
import type { CausesQuery, GuidesQuery } from '../../../src/shared/schemas/insights';
import { MINUTES_TO_FINDING } from './insights.summaries';

export interface Period {
  from: string;
  to: string;
}

/** Finding causes from walks and failure causes from service events, as one filtered set of rows. */
function causeEvents(db: Knex, organisationId: number, q: CausesQuery, p: Period) {
  const assetFilter = (b: Knex.QueryBuilder) => {
    if (q.siteId) b.where('a.site_id', q.siteId);
    if (q.lineId) b.where('a.line_id', q.lineId);
    if (q.actuation) b.where('a.actuation', q.actuation);
    if (q.fluidFamily) b.whereRaw('lower(a.fluid_family) = lower(?)', [q.fluidFamily]);
  };
  const anyAssetFilter = Boolean(q.siteId || q.lineId || q.actuation || q.fluidFamily);
  const walks = db('walks as w')
    .select('w.applicator_id', db.raw('w.cause_code as code'), db.raw(`(w.ended_at at time zone 'UTC')::date as on_day`), db.raw(`'walk' as src`))
    .where('w.organisation_id', organisationId)
    .where('w.end_kind', 'finding')
    .whereNotNull('w.cause_code')
    // Days are UTC days, as the summary tables count them, whatever the session's time zone.
    .whereRaw(`w.ended_at >= ?::date::timestamp at time zone 'UTC'`, [p.from])
    .whereRaw(`w.ended_at < (?::date + 1)::timestamp at time zone 'UTC'`, [p.to]);
  if (q.guideId) walks.where('w.guide_id', q.guideId);
  if (anyAssetFilter) walks.join('applicators as a', 'a.id', 'w.applicator_id').modify(assetFilter);

  const service = db('service_events as e')
    .select('e.applicator_id', db.raw('e.cause_code as code'), db.raw('e.performed_on as on_day'), db.raw(`'service' as src`))
    .where('e.organisation_id', organisationId)
    .whereNotNull('e.cause_code')
    .whereBetween('e.performed_on', [p.from, p.to])
    // A service recorded from a walk that already named its cause is the same failure: count it once.
    .whereNotExists(db('walks as w2').select(db.raw('1')).whereRaw('w2.id = e.walk_id').where('w2.end_kind', 'finding').whereNotNull('w2.cause_code'));
  if (q.guideId) service.whereIn('e.walk_id', db('walks').select('id').where('guide_id', q.guideId));
  if (anyAssetFilter) service.join('applicators as a', 'a.id', 'e.applicator_id').modify(assetFilter);
  return walks.unionAll(service);
}

export const insightsRepository = {
  async causeCounts(db: Knex, organisationId: number, q: CausesQuery, p: Period) {
    const rows: { code: string; src: 'walk' | 'service'; period: string; n: string }[] = await db
      .with('ev', causeEvents(db, organisationId, q, p))
      .from('ev')
      .select('code', 'src', db.raw(`to_char(date_trunc(?, on_day), 'YYYY-MM-DD') as period`, [q.bucket]), db.raw('count(*) as n'))
      .groupBy('code', 'src', 'period');
    return rows.map((r) => ({ code: r.code, src: r.src, period: r.period, count: Number(r.n) }));
  },

  /**
   * Each event that follows one of the same cause on the same applicator within the window (the
   * rule of src/shared/insights/repeats.ts), latest first. Paired in SQL: a year of a large
   * organisation has hundreds of thousands of repeats, and only the latest are shown.
   */
  async repeats(db: Knex, organisationId: number, q: CausesQuery, p: Period, limit: number) {
    const rows: { applicator_id: number; code: string; first_on: string; repeat_on: string; days_apart: number; tag: string; total: string }[] = await db
      .with('ev', causeEvents(db, organisationId, q, p))
      .with(
        'x',
        db.raw(
          `select applicator_id, code, on_day, lag(on_day) over (partition by applicator_id, code order by on_day) as prev
             from ev where applicator_id is not null`,
        ),
      )
      .from('x')
      .join('applicators as a', 'a.id', 'x.applicator_id')
      .select(
        'x.applicator_id',
        'x.code',
        db.raw(`to_char(x.prev, 'YYYY-MM-DD') as first_on`),
        db.raw(`to_char(x.on_day, 'YYYY-MM-DD') as repeat_on`),
        db.raw('(x.on_day - x.prev) as days_apart'),
        'a.tag',
        db.raw('count(*) over () as total'),
      )
      .whereRaw('x.on_day - x.prev <= ?', [q.repeatDays])
      .orderBy([
        { column: 'x.on_day', order: 'desc' },
        { column: 'x.applicator_id', order: 'asc' },
        { column: 'x.code', order: 'asc' },
        { column: 'x.prev', order: 'asc' },
      ])
      .limit(limit);
    return { total: rows.length ? Number(rows[0].total) : 0, rows };
  },

  async causeLabels(db: Knex, organisationId: number): Promise<Map<string, string>> {
    const rows: { code: string; label: string }[] = await db('causes').select('code', 'label').where('organisation_id', organisationId);
    return new Map(rows.map((r) => [r.code, r.label]));
  },

  async forecastApplicators(db: Knex, organisationId: number, siteId?: number) {
    const q = db('applicators as a')
      .join('sites as s', 's.id', 'a.site_id')
      .join('lines as l', 'l.id', 'a.line_id')
      .select(
        'a.id',
        'a.tag',
        'a.actuation',
        db.raw(`to_char(a.installed_on, 'YYYY-MM-DD') as installed_on`),
        'a.cycles_per_minute',
        'a.hours_per_day',
        'a.days_per_week',
        'a.seat_interval_cycles',
        'a.needle_interval_cycles',
        'a.seals_interval_cycles',
        'a.site_id',
        's.name as site',
        'l.name as line',
      )
      .where('a.organisation_id', organisationId)
      .where('a.status', 'running')
      .orderBy('a.tag');
    if (siteId) q.where('a.site_id', siteId);
    return q as Promise<
      {
        id: number;
        tag: string;
        actuation: 'electric' | 'air-operated';
        installed_on: string | null;
        cycles_per_minute: number | null;
        hours_per_day: number | null;
        days_per_week: number | null;
        seat_interval_cycles: string | null;
        needle_interval_cycles: string | null;
        seals_interval_cycles: string | null;
        site_id: number;
        site: string;
        line: string;
      }[]
    >;
  },

  async readingsOf(db: Knex, organisationId: number, applicatorIds?: number[]) {
    const q = db('counter_readings')
      .select('id', 'applicator_id', db.raw(`to_char(read_on, 'YYYY-MM-DD') as read_on`), 'count', 'counter_reset')
      .where('organisation_id', organisationId)
      .orderBy(['applicator_id', 'read_on', 'id']);
    if (applicatorIds) q.whereIn('applicator_id', applicatorIds);
    const rows: { id: number; applicator_id: number; read_on: string; count: string; counter_reset: boolean }[] = await q;
    const out = new Map<number, { id: number; readOn: string; count: number; counterReset: boolean }[]>();
    for (const r of rows) {
      const list = out.get(r.applicator_id) ?? [];
      list.push({ id: r.id, readOn: r.read_on, count: Number(r.count), counterReset: r.counter_reset });
      out.set(r.applicator_id, list);
    }
    return out;
  },

  /** The latest seat, needle and seal replacement of each applicator, with the parts it used. */
  async lastWearServices(db: Knex, organisationId: number) {
    const rows: {
      applicator_id: number;
      action: string;
      id: number;
      performed_on: string;
      actions: string[];
      reading_id: number | null;
      parts: { name: string; partNumber?: string | null; quantity: number }[];
    }[] = await db
      .raw(
        // Per applicator and part, the newest matching event by the (applicator_id, performed_on)
        // index: thousands of short backward scans beat sorting every service ever recorded.
        `select a.id as applicator_id, x.action, e.id, to_char(e.performed_on, 'YYYY-MM-DD') as performed_on, e.actions, e.reading_id, e.parts
           from applicators a
           cross join unnest(array['seat-replaced','needle-replaced','seals-replaced']) as x(action)
           cross join lateral (
             select e.id, e.performed_on, e.actions, e.reading_id, e.parts from service_events e
              where e.applicator_id = a.id and x.action = any(e.actions)
              order by e.performed_on desc, e.id desc limit 1) e
          where a.organisation_id = ? and a.status = 'running'`,
        [organisationId],
      )
      .then((r: { rows: never[] }) => r.rows);
    return rows;
  },

  /**
   * Applicators with their seat, needle, seal and coil replacements, in id order so a fit over a
   * subset filtered here or in the caller sums the same numbers in the same order.
   */
  async replacementData(db: Knex, organisationId: number, filter: { actuation?: string; fluidFamily?: string }) {
    const apps = db('applicators as a').select('a.id', 'a.tag', 'a.status', 'a.actuation').where('a.organisation_id', organisationId).orderBy('a.id');
    if (filter.actuation) apps.where('a.actuation', filter.actuation);
    if (filter.fluidFamily) apps.whereRaw('lower(a.fluid_family) = lower(?)', [filter.fluidFamily]);
    const applicators: { id: number; tag: string; status: string; actuation: string }[] = await apps;
    const events: { id: number; applicator_id: number; performed_on: string; reading_id: number | null; cause_code: string | null; actions: string[] }[] = await db('service_events as e')
      .select('e.id', 'e.applicator_id', db.raw(`to_char(e.performed_on, 'YYYY-MM-DD') as performed_on`), 'e.reading_id', 'e.cause_code', 'e.actions')
      .where('e.organisation_id', organisationId)
      .whereRaw(`e.actions && array['seat-replaced','needle-replaced','seals-replaced','coil-replaced']::text[]`)
      .modify((b) => {
        if (filter.actuation || filter.fluidFamily)
          b.whereIn(
            'e.applicator_id',
            applicators.map((a) => a.id),
          );
      })
      .orderBy('e.id');
    return { applicators, events };
  },

  async guideEffectiveness(db: Knex, organisationId: number, _q: GuidesQuery, p: Period) {
    const rows: Record<string, unknown>[] = await db('walks as w')
      .join('guide_versions as v', 'v.id', 'w.guide_version_id')
      .select(
        'w.guide_id',
        'w.guide_version_id',
        'v.number',
        'v.title',
        db.raw('count(*) as started'),
        db.raw(`count(*) filter (where w.status = 'ended') as finished`),
        db.raw(`count(*) filter (where w.outcome = 'fixed') as fixed`),
        db.raw(`count(*) filter (where w.outcome = 'not-fixed') as not_fixed`),
        db.raw(`count(*) filter (where w.outcome = 'fixed-by-other') as fixed_by_other`),
        db.raw(`count(*) filter (where w.status = 'abandoned' or w.end_kind = 'abandoned') as abandoned`),
        db.raw(`count(*) filter (where w.status = 'open') as open`),
        db.raw(`percentile_cont(0.5) within group (order by ${MINUTES_TO_FINDING}) filter (where w.end_kind = 'finding' and w.ended_at is not null) as median_minutes`),
      )
      .where('w.organisation_id', organisationId)
      .whereRaw(`w.started_at >= ?::date::timestamp at time zone 'UTC'`, [p.from])
      .whereRaw(`w.started_at < (?::date + 1)::timestamp at time zone 'UTC'`, [p.to])
      .groupBy('w.guide_id', 'w.guide_version_id', 'v.number', 'v.title')
      .orderBy([
        { column: 'started', order: 'desc' },
        { column: 'w.guide_version_id', order: 'asc' },
      ]);
    const abandonedSteps: { guide_version_id: number; step_id: string; n: string }[] = await db('walks as w')
      .select('w.guide_version_id', db.raw('coalesce(w.ended_at_step_id, w.current_step_id) as step_id'), db.raw('count(*) as n'))
      .where('w.organisation_id', organisationId)
      .where((b) => b.where('w.status', 'abandoned').orWhere('w.end_kind', 'abandoned'))
      .whereRaw(`w.started_at >= ?::date::timestamp at time zone 'UTC'`, [p.from])
      .whereRaw(`w.started_at < (?::date + 1)::timestamp at time zone 'UTC'`, [p.to])
      .whereRaw('coalesce(w.ended_at_step_id, w.current_step_id) is not null')
      .groupBy('w.guide_version_id', db.raw('coalesce(w.ended_at_step_id, w.current_step_id)'));
    return { rows, abandonedSteps };
  },

  async openFlags(db: Knex, organisationId: number) {
    const flags: { guide_version_id: number; n: string }[] = await db('step_flags')
      .select('guide_version_id', db.raw('count(*) as n'))
      .where('organisation_id', organisationId)
      .whereNull('resolved_at')
      .groupBy('guide_version_id');
    return flags;
  },

  /** Step titles of the versions named, from their content. */
  async stepTitles(db: Knex, versionIds: number[]): Promise<Map<number, Map<string, string>>> {
    const out = new Map<number, Map<string, string>>();
    if (!versionIds.length) return out;
    const rows: { id: number; step_id: string; title: string | null }[] = await db
      .raw(
        `select v.id, s->>'id' as step_id, s->>'title' as title
         from guide_versions v cross join lateral jsonb_array_elements(coalesce(v.content->'steps', '[]'::jsonb)) s
        where v.id = any(?)`,
        [versionIds],
      )
      .then((r: { rows: { id: number; step_id: string; title: string | null }[] }) => r.rows);
    for (const r of rows) {
      const m = out.get(r.id) ?? new Map<string, string>();
      if (r.title) m.set(r.step_id, r.title);
      out.set(r.id, m);
    }
    return out;
  },
};
