// The local fake SMTP server: listens on loopback, accepts every message and keeps it in
// mail_captures, so development and tests see exactly what a real server would have received
// while no mail ever leaves the machine.
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import { SMTPServer, type SMTPServerOptions } from 'smtp-server';
import { parseMail } from './mime';

export interface CapturedMail {
  id: number;
  messageId: string | null;
  from: string | null;
  to: string[];
  subject: string | null;
  text: string | null;
  html: string | null;
  raw: string;
  receivedAt: string;
}

interface CaptureRow {
  id: number;
  message_id: string | null;
  envelope_from: string | null;
  envelope_to: string[];
  subject: string | null;
  text_body: string | null;
  html_body: string | null;
  raw: string;
  received_at: Date;
}

export function toCaptured(row: CaptureRow): CapturedMail {
  return {
    id: row.id,
    messageId: row.message_id,
    from: row.envelope_from,
    to: row.envelope_to,
    subject: row.subject,
    text: row.text_body,
    html: row.html_body,
    raw: row.raw,
    receivedAt: row.received_at.toISOString(),
  };
}

export interface FakeSmtp {
  readonly host: string;
  /** The port it listens on; kept across stop and start so the transport needs no change. */
  readonly port: number;
  readonly running: boolean;
  start(): Promise<void>;
  stop(): Promise<void>;
  /** Makes the server refuse recipients with this reply (e.g. 550), or accept again with null. */
  refuse(reply: { code: number; message: string } | null): void;
  captured(): Promise<CapturedMail[]>;
}

const MAX_BYTES = 10 * 1024 * 1024;

export function createFakeSmtp(deps: { db: Knex; logger: Logger; port?: number; host?: string }): FakeSmtp {
  const host = deps.host ?? '127.0.0.1';
  let port = deps.port ?? 0;
  let server: SMTPServer | null = null;
  let refusal: { code: number; message: string } | null = null;

  const options: SMTPServerOptions = {
    // smtp-server's built-in certificate has expired, so the fake speaks plain SMTP on loopback only.
    disabledCommands: ['STARTTLS', 'AUTH'],
    authOptional: true,
    logger: false,
    size: MAX_BYTES,
    banner: 'Beadpath local mail catcher: nothing leaves this machine',
    closeTimeout: 1000,
    onRcptTo(_address, _session, callback) {
      if (!refusal) return callback();
      const err = new Error(refusal.message) as Error & { responseCode: number };
      err.responseCode = refusal.code;
      callback(err);
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const raw = Buffer.concat(chunks).toString('utf8');
        const parsed = parseMail(raw);
        const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : null;
        deps
          .db('mail_captures')
          .insert({
            message_id: parsed.messageId,
            envelope_from: from,
            envelope_to: session.envelope.rcptTo.map((r) => r.address),
            subject: parsed.subject,
            text_body: parsed.text,
            html_body: parsed.html,
            raw,
          })
          .then(() => callback())
          .catch((err: Error) => {
            // A capture that could not be stored is refused, so the sender retries it.
            deps.logger.warn({ err }, 'fake SMTP server could not store a message');
            const e = new Error('Temporary failure storing the message') as Error & { responseCode: number };
            e.responseCode = 451;
            callback(e);
          });
      });
    },
  };

  return {
    host,
    get port() {
      return port;
    },
    get running() {
      return server !== null;
    },
    async start() {
      if (server) return;
      const s = new SMTPServer(options);
      s.on('error', (err) => deps.logger.warn({ err }, 'fake SMTP server error'));
      await new Promise<void>((resolve, reject) => {
        s.server.once('error', reject);
        s.listen(port, host, () => {
          s.server.off('error', reject);
          resolve();
        });
      });
      const address = s.server.address();
      if (address && typeof address === 'object') port = address.port;
      server = s;
      deps.logger.info({ host, port }, 'local fake SMTP server listening');
    },
    async stop() {
      const s = server;
      if (!s) return;
      server = null;
      await new Promise<void>((resolve) => s.close(() => resolve()));
    },
    refuse(reply) {
      refusal = reply;
    },
    async captured() {
      const rows = (await deps.db('mail_captures').orderBy('id')) as CaptureRow[];
      return rows.map(toCaptured);
    },
  };
}
