// Background work for insights on pg-boss, safe with several server processes on one database:
// every minute a sweep queues a refresh of each organisation with changes waiting (one queued and
// one running per organisation at most: a "stately" queue keyed by organisation, so bursts of
// writes collapse into one refresh), a full refresh every night at 00:05 UTC, and the managers'
// digest every Monday at 06:00 UTC. Schedules are kept by pg-boss in the database, so each fires
// once however many processes run.
import type { Knex } from 'knex';
import PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import type { SessionUser } from '../../../src/shared/schemas/auth';
import { localToday } from '../../../src/shared/schemas/assets';
import { CausesQuery, type DigestPreference } from '../../../src/shared/schemas/insights';
import type { Config } from '../../config/env';
import { AppError } from '../../lib/app-error';
import type { MailService } from '../mail/mail.service';
import { linkOrigin } from '../mail/origin';
import { insightsDigestMail, type DigestService } from '../mail/templates/insights-digest';
import { addDays } from '../assets/assets.counters';
import type { InsightsService } from './insights.service';

export const REFRESH_QUEUE = 'insights-refresh';
export const SWEEP_QUEUE = 'insights-sweep';
export const NIGHTLY_QUEUE = 'insights-nightly';
export const DIGEST_QUEUE = 'insights-digest';

/** Mondays 06:00 UTC: the digest's schedule, in cron. */
export const DIGEST_CRON = '0 6 * * 1';
const MAX_LISTED = 25;
const TOP_REPEATS = 5;

/** The Monday (UTC) of the week a date falls in. */
export function weekStart(date: string): string {
  const d = new Date(`${date}T00:00:00Z`);
  const back = (d.getUTCDay() + 6) % 7;
  return addDays(date, -back);
}

export function createInsightsDigest(deps: { db: Knex; config: Config; mail: MailService; insights: InsightsService }) {
  const { db, config, mail, insights } = deps;

  async function managersOf(organisationId: number, trx: Knex = db) {
    return trx('users as u')
      .leftJoin('insight_digest_optouts as o', 'o.user_id', 'u.id')
      .where({ 'u.organisation_id': organisationId, 'u.active': true })
      .whereNotNull('u.password_hash')
      .whereRaw(`'manager' = any(u.roles)`)
      .whereNull('o.user_id')
      .orderBy('u.id')
      .select('u.id', 'u.email', 'u.name') as Promise<{ id: number; email: string; name: string }[]>;
  }

  /** The digest's figures for one organisation, the same for every manager in it. */
  async function figures(organisationId: number) {
    const as = { id: 0, organisationId, roles: ['manager'] } as unknown as SessionUser;
    const today = localToday();
    const origin = linkOrigin(config);
    const [forecast, causes] = await Promise.all([insights.forecast(as, { days: 30 }), insights.causes(as, CausesQuery.parse({ from: addDays(today, -30), to: today, repeatDays: 30 }))]);
    const week = addDays(forecast.today, 7);
    const service = (r: (typeof forecast.rows)[number]): DigestService => ({
      tag: r.tag,
      site: r.site,
      line: r.line,
      part: r.part,
      dueOn: r.dueOn,
      overdue: r.status === 'overdue',
      link: `${origin}/applicators/${r.applicatorId}`,
    });
    const dueIn7 = forecast.rows.filter((r) => r.dueOn <= week).map(service);
    const dueIn30 = forecast.rows.filter((r) => r.dueOn > week).map(service);
    // Repeats grouped per applicator and cause: the ones that keep coming back first.
    const grouped = new Map<string, { tag: string; cause: string; times: number; lastOn: string; link: string }>();
    for (const r of causes.repeats) {
      const key = `${r.applicatorId}\u0000${r.code}`;
      const g = grouped.get(key) ?? { tag: r.tag, cause: r.label, times: 0, lastOn: r.repeatOn, link: `${origin}/applicators/${r.applicatorId}` };
      g.times += 1;
      if (r.repeatOn > g.lastOn) g.lastOn = r.repeatOn;
      grouped.set(key, g);
    }
    const repeats = [...grouped.values()].sort((a, b) => b.times - a.times || (a.lastOn < b.lastOn ? 1 : a.lastOn > b.lastOn ? -1 : a.tag.localeCompare(b.tag))).slice(0, TOP_REPEATS);
    const shown7 = dueIn7.slice(0, MAX_LISTED);
    const shown30 = dueIn30.slice(0, Math.max(0, MAX_LISTED - shown7.length));
    return {
      today,
      dueIn7: shown7,
      dueIn30: shown30,
      moreServices: dueIn7.length + dueIn30.length - shown7.length - shown30.length,
      repeats,
      forecastLink: `${origin}/insights/forecast?days=30`,
      causesLink: `${origin}/insights?from=${addDays(today, -30)}&repeatDays=30`,
      settingsLink: `${origin}/insights/forecast#digest`,
    };
  }

  /**
   * The week's digest for one organisation: recorded with its week in the same transaction as the
   * messages, so a second run in the same week (another process, a retry) sends nothing.
   */
  async function sendWeekly(organisationId: number, today = localToday()): Promise<{ sent: number; skipped: boolean }> {
    const week = weekStart(today);
    const f = await figures(organisationId);
    const ids: number[] = [];
    const result = await db.transaction(async (trx) => {
      const claimed = await trx.raw(`insert into insight_digest_runs (organisation_id, week_start, recipients) values (?, ?, 0) on conflict do nothing returning week_start`, [organisationId, week]);
      if (!claimed.rows.length) return { sent: 0, skipped: true };
      const org = await trx('organisations').where({ id: organisationId }).first('name');
      const managers = await managersOf(organisationId, trx);
      for (const m of managers) {
        const content = insightsDigestMail({ organisationName: org.name, recipientName: m.name, weekOf: week, ...f, preview: false });
        ids.push(await mail.record(trx, { organisationId, kind: 'insights-digest', to: m.email, content, fromName: org.name }));
      }
      await trx('insight_digest_runs').where({ organisation_id: organisationId, week_start: week }).update({ recipients: managers.length });
      return { sent: managers.length, skipped: false };
    });
    mail.dispatch(ids);
    return result;
  }

  async function sendAll(today = localToday()) {
    const orgs: { id: number }[] = await db('organisations').select('id').orderBy('id');
    let sent = 0;
    for (const o of orgs) sent += (await sendWeekly(o.id, today)).sent;
    return sent;
  }

  return {
    sendWeekly,
    sendAll,

    /** A copy for the asking manager now, marked as a preview; it does not count as the week's digest. */
    async preview(user: SessionUser): Promise<{ to: string }> {
      const me = await db('users').where({ id: user.id, organisation_id: user.organisationId }).first('email', 'name');
      if (!me) throw AppError.notFound('Your account');
      const org = await db('organisations').where({ id: user.organisationId }).first('name');
      const f = await figures(user.organisationId);
      const content = insightsDigestMail({ organisationName: org.name, recipientName: me.name, weekOf: weekStart(f.today), ...f, preview: true });
      const id = await db.transaction((trx) => mail.record(trx, { organisationId: user.organisationId, kind: 'insights-digest', to: me.email, content, fromName: org.name }));
      mail.dispatch([id]);
      return { to: me.email };
    },

    async preference(user: SessionUser): Promise<DigestPreference> {
      const [out, last] = await Promise.all([
        db('insight_digest_optouts').where({ user_id: user.id }).first('user_id'),
        db('insight_digest_runs').where({ organisation_id: user.organisationId }).max('sent_at as at').first(),
      ]);
      return { enabled: !out, eligible: user.roles.includes('manager'), lastSentAt: last?.at ? new Date(last.at).toISOString() : null };
    },

    async setPreference(user: SessionUser, enabled: boolean): Promise<DigestPreference> {
      if (enabled) await db('insight_digest_optouts').where({ user_id: user.id }).delete();
      else await db('insight_digest_optouts').insert({ user_id: user.id, organisation_id: user.organisationId }).onConflict('user_id').ignore();
      return this.preference(user);
    },
  };
}

export type InsightsDigest = ReturnType<typeof createInsightsDigest>;

export function createInsightsJobs(deps: { db: Knex; config: Config; logger: Logger; insights: InsightsService; digest: InsightsDigest }) {
  const { db, config, logger, insights, digest } = deps;
  let boss: PgBoss | null = null;
  let starting: Promise<void> | null = null;
  let stopped = false;

  async function queueRefresh(organisationId: number, full = false): Promise<void> {
    if (!boss) await start();
    // Keyed by organisation on a stately queue: while one waits, asking again adds nothing.
    await boss!.send(REFRESH_QUEUE, { organisationId, full }, { singletonKey: `org:${organisationId}${full ? ':full' : ''}`, retryLimit: 2, retryDelay: 30, expireInSeconds: 30 * 60 });
  }

  /** Organisations with changes waiting, or never refreshed. */
  async function sweep(): Promise<number> {
    const orgs: { id: number }[] = (
      await db.raw(
        `select distinct organisation_id as id from insight_dirty
         union
         select o.id from organisations o where not exists (select 1 from insight_refreshes r where r.organisation_id = o.id)`,
      )
    ).rows;
    for (const o of orgs) await queueRefresh(o.id);
    return orgs.length;
  }

  async function start(): Promise<void> {
    if (stopped) throw new Error('the insights jobs have been stopped');
    starting ??= (async () => {
      const b = new PgBoss({ connectionString: config.DATABASE_URL, max: 3, application_name: 'beadpath-insights' });
      b.on('error', (err) => logger.warn({ err }, 'insights queue error'));
      await b.start();
      await b.createQueue(REFRESH_QUEUE, { name: REFRESH_QUEUE, policy: 'stately' });
      for (const q of [SWEEP_QUEUE, NIGHTLY_QUEUE, DIGEST_QUEUE]) await b.createQueue(q, { name: q, policy: 'singleton' });
      await b.schedule(SWEEP_QUEUE, '* * * * *', {}, { tz: 'UTC' });
      await b.schedule(NIGHTLY_QUEUE, '5 0 * * *', {}, { tz: 'UTC' });
      await b.schedule(DIGEST_QUEUE, DIGEST_CRON, {}, { tz: 'UTC' });
      await b.work<{ organisationId: number; full?: boolean }>(REFRESH_QUEUE, { batchSize: 1, pollingIntervalSeconds: 1 }, async ([job]) => {
        try {
          const r = await insights.refresh(job.data.organisationId, { full: job.data.full });
          logger.info(r, 'insights refreshed');
        } catch (err) {
          logger.error({ err, organisationId: job.data.organisationId }, 'insights refresh failed; the queue tries again');
          throw err;
        }
      });
      boss = b;
      await b.work(SWEEP_QUEUE, async () => {
        await sweep();
      });
      await b.work(NIGHTLY_QUEUE, async () => {
        const orgs: { id: number }[] = await db('organisations').select('id');
        for (const o of orgs) await queueRefresh(o.id, true);
      });
      await b.work(DIGEST_QUEUE, async () => {
        const sent = await digest.sendAll();
        logger.info({ sent }, 'weekly insights digest');
      });
      // Organisations never refreshed, and changes made while no process was running.
      await sweep();
    })();
    try {
      await starting;
    } catch (err) {
      starting = null;
      throw err;
    }
  }

  return {
    start,
    sweep,
    queueRefresh,

    /** A manager's "refresh now": noted for the status line and queued at once. */
    async requestRefresh(organisationId: number): Promise<void> {
      await db('insight_refreshes').where({ organisation_id: organisationId }).update({ requested_at: db.fn.now() });
      await queueRefresh(organisationId);
    },

    async stop(): Promise<void> {
      stopped = true;
      if (starting) await starting.catch(() => undefined);
      if (boss) await boss.stop({ graceful: true, wait: true, timeout: 10_000 }).catch((err) => logger.warn({ err }, 'insights queue did not stop cleanly'));
      boss = null;
    },
  };
}

export type InsightsJobs = ReturnType<typeof createInsightsJobs>;
