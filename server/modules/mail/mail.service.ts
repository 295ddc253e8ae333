// Outgoing mail: every message is first written to the outbox (mail_messages) in the same
// transaction as whatever caused it, then sent by a pg-boss worker with retries, so a slow or
// failing mail server never holds up a request and no message is lost. Also the admin outbox.
import { randomBytes, randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import nodemailer from 'nodemailer';
import type SMTPTransport from 'nodemailer/lib/smtp-transport';
import PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import { MAIL_STATUSES, type MailKind, type MailStatus, type OutboxItem, type OutboxList, type OutboxListQuery, type OutboxMessage } from '../../../src/shared/schemas/cases';
import type { Config } from '../../config/env';
import { AppError } from '../../lib/app-error';
import { createFakeSmtp, type FakeSmtp } from './fake-smtp';
import type { MailContent } from './templates/layout';

export const MAIL_QUEUE = 'mail-send';

export interface OutgoingMail {
  organisationId: number | null;
  kind: MailKind;
  to: string;
  content: MailContent;
  caseId?: number | null;
  /** The message carries a one-time link the outbox must not show to admins. */
  sensitive?: boolean;
  /** Shown as the sender's name, e.g. the organisation. */
  fromName?: string;
  replyTo?: string | null;
}

interface MessageRow {
  id: number;
  organisation_id: number | null;
  kind: MailKind;
  to_address: string;
  from_address: string;
  reply_to: string | null;
  subject: string;
  text_body: string;
  html_body: string | null;
  case_id: number | null;
  sensitive: boolean;
  status: MailStatus;
  attempts: number;
  last_error: string | null;
  smtp_response: string | null;
  job_id: string;
  message_id: string;
  created_at: Date;
  updated_at: Date;
  sent_at: Date | null;
  captured_at?: Date | null;
}

function toItem(row: MessageRow): OutboxItem {
  return {
    id: row.id,
    kind: row.kind,
    to: row.to_address,
    subject: row.subject,
    status: row.status,
    attempts: row.attempts,
    lastError: row.last_error,
    caseId: row.case_id,
    createdAt: row.created_at.toISOString(),
    sentAt: row.sent_at?.toISOString() ?? null,
  };
}

/** `Name <address>` or a bare address, as MAIL_FROM may be written. */
export function parseAddress(value: string): { name: string | null; address: string } {
  const m = /^\s*"?([^"<]*?)"?\s*<([^>]+)>\s*$/.exec(value);
  return m ? { name: m[1].trim() || null, address: m[2].trim() } : { name: null, address: value.trim() };
}

function formatAddress(name: string | null, address: string): string {
  if (!name) return address;
  return `"${name.replace(/["\\\r\n]/g, '')}" <${address}>`;
}

// Long enough that nothing of a token survives; shorter runs (part numbers, ids) stay readable.
const SECRET = /[A-Za-z0-9_-]{32,}/g;

function hideSecrets(text: string): string {
  return text.replace(SECRET, '[withheld]');
}

/** Plain words for what went wrong, with the server's own text kept for whoever digs further. */
export function describeSendError(err: unknown): string {
  const e = err as { code?: string; responseCode?: number; response?: string; message?: string };
  const detail = e.response ?? e.message ?? String(err);
  if (e.responseCode) return `The mail server refused the message (${e.responseCode}): ${detail}`;
  if (e.code === 'ECONNREFUSED' || (e.code === 'ESOCKET' && /ECONNREFUSED/.test(detail))) return `Could not connect to the mail server: ${detail}`;
  if (e.code === 'ETIMEDOUT') return `The mail server did not answer in time: ${detail}`;
  if (e.code === 'ECONNECTION') return `The connection to the mail server broke off: ${detail}`;
  if (e.code === 'EAUTH') return `The mail server refused the user name or password: ${detail}`;
  if (e.code === 'EDNS') return `The mail server's name could not be found: ${detail}`;
  return detail;
}

export function usesFakeSmtp(config: Config): boolean {
  return config.FAKE_SMTP ?? !(config.SMTP_URL || config.SMTP_HOST);
}

export function createMailService(deps: { db: Knex; config: Config; logger: Logger; fake?: FakeSmtp | null }) {
  const { db, config, logger } = deps;
  const fake = deps.fake !== undefined ? deps.fake : usesFakeSmtp(config) ? createFakeSmtp({ db, logger, port: config.FAKE_SMTP_PORT }) : null;
  const from = parseAddress(config.MAIL_FROM);
  const domain = from.address.split('@')[1] ?? 'beadpath.local';

  let boss: PgBoss | null = null;
  let workerId: string | null = null;
  let starting: Promise<void> | null = null;
  let stopped = false;
  let sweepTimer: NodeJS.Timeout | null = null;
  const pending = new Set<Promise<void>>();

  const retry = { retryLimit: config.MAIL_RETRY_LIMIT, retryDelay: config.MAIL_RETRY_DELAY_S, retryBackoff: config.MAIL_RETRY_BACKOFF };

  function transportOptions(): SMTPTransport.Options | null {
    const timeouts = { connectionTimeout: config.MAIL_TIMEOUT_S * 1000, greetingTimeout: config.MAIL_TIMEOUT_S * 1000, socketTimeout: config.MAIL_TIMEOUT_S * 1000 };
    // Plain SMTP is only ever spoken to the fake, which listens on loopback.
    if (fake) return { host: fake.host, port: fake.port, secure: false, ignoreTLS: true, ...timeouts };
    if (config.SMTP_URL) return { url: config.SMTP_URL, ...timeouts } as SMTPTransport.Options;
    if (config.SMTP_HOST) {
      return {
        host: config.SMTP_HOST,
        port: config.SMTP_PORT,
        secure: config.SMTP_SECURE,
        auth: config.SMTP_USER ? { user: config.SMTP_USER, pass: config.SMTP_PASSWORD ?? '' } : undefined,
        ...timeouts,
      };
    }
    return null;
  }

  async function update(id: number, patch: Record<string, unknown>) {
    await db('mail_messages')
      .where({ id })
      .update({ ...patch, updated_at: db.fn.now() });
  }

  /** One attempt; throws only when pg-boss should try again later. */
  async function deliver(id: number, attempt: { retryCount: number; retryLimit: number }) {
    const row = (await db('mail_messages').where({ id }).first()) as MessageRow | undefined;
    if (!row || row.status === 'sent') return;
    await db('mail_messages')
      .where({ id })
      .update({ status: 'sending', attempts: db.raw('attempts + 1'), updated_at: db.fn.now() });
    const options = transportOptions();
    if (!options) {
      await update(id, { status: 'failed', last_error: 'No mail server is configured: set SMTP_URL or SMTP_HOST, or FAKE_SMTP=1 to keep messages locally' });
      return;
    }
    const transport = nodemailer.createTransport(options);
    try {
      const info = await transport.sendMail({
        from: row.from_address,
        to: row.to_address,
        replyTo: row.reply_to ?? undefined,
        subject: row.subject,
        text: row.text_body,
        html: row.html_body ?? undefined,
        messageId: row.message_id,
        headers: { 'X-Beadpath-Kind': row.kind },
      });
      await update(id, { status: 'sent', sent_at: db.fn.now(), last_error: null, smtp_response: String(info.response ?? '') });
    } catch (err) {
      const code = (err as { responseCode?: number }).responseCode;
      // A 5xx reply says the server will never take this message; trying again only delays the news.
      const permanent = typeof code === 'number' && code >= 500 && code < 600;
      const last = permanent || attempt.retryCount >= attempt.retryLimit;
      await update(id, { status: last ? 'failed' : 'retrying', last_error: describeSendError(err) });
      logger.warn({ err, mailId: id, attempt: attempt.retryCount + 1 }, last ? 'mail not sent, giving up' : 'mail not sent, will retry');
      if (!last) throw err;
    } finally {
      transport.close();
    }
  }

  async function enqueue(rows: { id: number; job_id: string }[]) {
    if (!boss) return;
    for (const row of rows) await boss.send(MAIL_QUEUE, { id: row.id }, { id: row.job_id, ...retry, expireInSeconds: Math.max(60, config.MAIL_TIMEOUT_S * 4) });
    if (workerId && rows.length) boss.notifyWorker(workerId);
  }

  /** Queues messages whose hand-over was cut short (a crash between commit and queue). */
  async function sweep() {
    const rows = await db('mail_messages').where({ status: 'queued' }).where('created_at', '<', db.raw(`now() - interval '1 minute'`)).orderBy('id').limit(500).select('id', 'job_id');
    await enqueue(rows);
  }

  async function start(): Promise<void> {
    if (stopped) throw new Error('the mail service has been stopped');
    starting ??= (async () => {
      if (fake) await fake.start();
      const b = new PgBoss({ connectionString: config.DATABASE_URL, max: 3, schedule: false, application_name: 'beadpath-mail' });
      b.on('error', (err) => logger.warn({ err }, 'mail queue error'));
      await b.start();
      await b.createQueue(MAIL_QUEUE);
      workerId = await b.work<{ id: number }>(MAIL_QUEUE, { includeMetadata: true, batchSize: 1, pollingIntervalSeconds: config.MAIL_POLL_S }, async ([job]) => {
        await deliver(job.data.id, { retryCount: job.retryCount, retryLimit: job.retryLimit });
      });
      boss = b;
      sweepTimer = setInterval(() => void sweep().catch((err) => logger.warn({ err }, 'mail sweep failed')), 60_000);
      sweepTimer.unref();
      await sweep();
    })();
    try {
      await starting;
    } catch (err) {
      // The next message tries to start again rather than failing forever.
      starting = null;
      throw err;
    }
  }

  function track(p: Promise<void>) {
    pending.add(p);
    void p.finally(() => pending.delete(p));
  }

  /** Hands committed messages to the queue without making the caller wait or fail. */
  function dispatch(ids: number[]): void {
    if (!ids.length || stopped) return;
    track(
      (async () => {
        await start();
        const rows = await db('mail_messages').whereIn('id', ids).where({ status: 'queued' }).select('id', 'job_id');
        await enqueue(rows);
      })().catch((err) => logger.warn({ err, ids }, 'mail not handed to the queue yet; the sweep will pick it up')),
    );
  }

  async function inOrg(organisationId: number, id: number): Promise<MessageRow> {
    const row = (await db('mail_messages as m')
      .leftJoin(db('mail_captures').select('message_id').min('received_at as captured_at').groupBy('message_id').as('c'), 'c.message_id', 'm.message_id')
      .where({ 'm.id': id, 'm.organisation_id': organisationId })
      .first('m.*', 'c.captured_at')) as MessageRow | undefined;
    if (!row) throw AppError.notFound('This message');
    return row;
  }

  async function message(organisationId: number, id: number): Promise<OutboxMessage> {
    const row = await inOrg(organisationId, id);
    // With a real server the outbox is not the recipient's mailbox: one-time links stay theirs.
    const hidden = row.sensitive && !fake;
    return {
      ...toItem(row),
      from: row.from_address,
      text: hidden ? hideSecrets(row.text_body) : row.text_body,
      html: row.html_body === null ? null : hidden ? hideSecrets(row.html_body) : row.html_body,
      smtpResponse: row.smtp_response,
      hidden,
      capturedAt: row.captured_at ? new Date(row.captured_at).toISOString() : null,
    };
  }

  return {
    fake,
    usesFake: fake !== null,

    /** Writes the message to the outbox inside the caller's transaction; hand it to dispatch() after commit. */
    async record(trx: Knex, mail: OutgoingMail): Promise<number> {
      const [row] = await trx('mail_messages')
        .insert({
          organisation_id: mail.organisationId,
          kind: mail.kind,
          to_address: mail.to,
          from_address: formatAddress(mail.fromName ?? from.name ?? 'Beadpath', from.address),
          reply_to: mail.replyTo ?? null,
          subject: mail.content.subject,
          text_body: mail.content.text,
          html_body: mail.content.html,
          case_id: mail.caseId ?? null,
          sensitive: mail.sensitive ?? false,
          job_id: randomUUID(),
          message_id: `<${randomBytes(12).toString('hex')}.${Date.now()}@${domain}>`,
        })
        .returning('id');
      return row.id as number;
    },

    dispatch,

    /** Resolves when every dispatch so far has reached the queue (tests wait on it). */
    async settled(): Promise<void> {
      while (pending.size) await Promise.allSettled([...pending]);
    },

    start,

    async stop(): Promise<void> {
      stopped = true;
      if (sweepTimer) clearInterval(sweepTimer);
      await Promise.allSettled([...pending]);
      if (starting) await starting.catch(() => undefined);
      if (boss) await boss.stop({ graceful: true, wait: true, timeout: 5000 }).catch((err) => logger.warn({ err }, 'mail queue did not stop cleanly'));
      boss = null;
      await fake?.stop();
    },

    async outbox(organisationId: number, query: OutboxListQuery): Promise<OutboxList> {
      const base = () => db('mail_messages').where({ organisation_id: organisationId });
      const filtered = () => (query.status === 'all' ? base() : base().where({ status: query.status }));
      const [{ count }] = await filtered().count<{ count: string }[]>('* as count');
      const rows = (await filtered()
        .orderBy([
          { column: 'created_at', order: 'desc' },
          { column: 'id', order: 'desc' },
        ])
        .limit(query.pageSize)
        .offset((query.page - 1) * query.pageSize)) as MessageRow[];
      const byStatus = await base().select('status').count<{ status: MailStatus; count: string }[]>('* as count').groupBy('status');
      const counts = Object.fromEntries(MAIL_STATUSES.map((s) => [s, 0])) as Record<MailStatus, number>;
      for (const r of byStatus) counts[r.status] = Number(r.count);
      return { messages: rows.map(toItem), total: Number(count), page: query.page, pageSize: query.pageSize, counts, fake: fake !== null };
    },

    message,

    /** Sends a failed message again, as a new job with a fresh round of retries. */
    async resend(organisationId: number, id: number): Promise<OutboxMessage> {
      const row = await inOrg(organisationId, id);
      if (row.status !== 'failed') throw AppError.conflict('Only a message that failed can be sent again');
      await update(id, { status: 'queued', job_id: randomUUID(), last_error: null });
      dispatch([id]);
      return message(organisationId, id);
    },
  };
}

export type MailService = ReturnType<typeof createMailService>;
