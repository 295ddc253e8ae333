// Sessions in PostgreSQL, read together with their signed-in user in one round trip.
//
// Every signed-in request needs the session row and then the user (roles, organisation, active),
// which the stock store and passport fetch with two statements. Here the store's read joins the
// user, and passport's deserializeUser takes the row read by this same request instead of asking
// again. The user is still read fresh on every request, so a role change, a deactivation or a
// sign-out on another server takes effect at once; nothing is cached across requests.
import type { Request } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import type pg from 'pg';
import type { Logger } from 'pino';
import type { SessionUser } from '../../../src/shared/schemas/auth';
import { toUser, type UserRow } from './auth.repository';
import { toSessionUser } from './auth.service';

const TABLE = 'user_sessions';

// The same columns as the users repository's base query.
const READ_SQL = `
  select s.sess, u.*, o.name as organisation_name, o.settings->>'defaultUnitSystem' as organisation_unit_system
    from ${TABLE} s
    left join users u on u.id = (case when json_typeof(s.sess #> '{passport,user}') = 'number' then (s.sess #>> '{passport,user}')::int end)
    left join organisations o on o.id = u.organisation_id
   where s.sid = $1 and s.expire >= now()`;

/** A user read with a session, waiting for this request's deserializeUser; null = none or inactive. */
interface Pending {
  userId: number | null;
  user: SessionUser | null;
}

export function createSessionStore(pool: pg.Pool, logger: Logger) {
  const PgStore = connectPgSimple(session);
  const pending = new Map<string, Pending>();

  class JoinedStore extends PgStore {
    override get(sid: string, fn: (err: unknown, sess?: session.SessionData | null) => void): void {
      pool
        .query({ name: 'beadpath-session-read', text: READ_SQL, values: [sid] })
        .then((res) => {
          const row = res.rows[0];
          if (!row) return fn(null, null);
          const sess = typeof row.sess === 'string' ? JSON.parse(row.sess) : row.sess;
          if (row.id != null) {
            const user = row.active ? toSessionUser(toUser(row as UserRow)) : null;
            // Bounded: an entry is taken by the same request a moment later.
            if (pending.size > 10_000) pending.clear();
            pending.set(sid, { userId: row.id, user });
          }
          fn(null, sess);
        })
        .catch((err) => fn(err));
    }
  }

  const store = new JoinedStore({
    pool,
    tableName: TABLE,
    createTableIfMissing: false,
    pruneSessionInterval: 15 * 60,
    errorLog: (...args: unknown[]) => logger.warn({ detail: args.map(String).join(' ') }, 'session store error'),
  });

  return {
    store,
    /**
     * The user read with this request's session, if it is the one passport asks for; undefined
     * means "not read here, ask the database".
     */
    takeUser(req: Request, id: number): SessionUser | null | undefined {
      const p = pending.get(req.sessionID);
      if (!p) return undefined;
      pending.delete(req.sessionID);
      return p.userId === id ? p.user : undefined;
    },
  };
}

export type SessionUsers = Pick<ReturnType<typeof createSessionStore>, 'takeUser'>;
