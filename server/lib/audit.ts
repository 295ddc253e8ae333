// The audit log's one way in and its read side: an insert inside the caller's transaction (so the
// record exists exactly when the change does) and a filtered, paged list. There is no update or delete.
import type { Knex } from 'knex';

export interface AuditEntry {
  organisationId: number;
  userId: number | null;
  action: string;
  entityKind: string;
  entityId?: string | number | null;
  before?: unknown;
  after?: unknown;
}

export interface AuditEvent {
  id: number;
  userId: number | null;
  userName: string | null;
  userEmail: string | null;
  action: string;
  entityKind: string;
  entityId: string | null;
  before: unknown;
  after: unknown;
  at: string;
}

export interface AuditQuery {
  action?: string;
  entityKind?: string;
  entityId?: string;
  userId?: number;
  from?: string;
  to?: string;
  page: number;
  pageSize: number;
}

const json = (v: unknown) => (v === undefined || v === null ? null : JSON.stringify(v));

export async function audit(trx: Knex, entry: AuditEntry): Promise<void> {
  await trx('audit_events').insert({
    organisation_id: entry.organisationId,
    user_id: entry.userId,
    action: entry.action,
    entity_kind: entry.entityKind,
    entity_id: entry.entityId === undefined || entry.entityId === null ? null : String(entry.entityId),
    before: json(entry.before),
    after: json(entry.after),
  });
}

export const auditRepository = {
  async list(db: Knex, organisationId: number, q: AuditQuery): Promise<{ events: AuditEvent[]; total: number }> {
    const base = db('audit_events as e').where('e.organisation_id', organisationId);
    if (q.action) base.andWhere('e.action', q.action);
    if (q.entityKind) base.andWhere('e.entity_kind', q.entityKind);
    if (q.entityId) base.andWhere('e.entity_id', q.entityId);
    if (q.userId) base.andWhere('e.user_id', q.userId);
    if (q.from) base.andWhere('e.created_at', '>=', q.from);
    if (q.to) base.andWhere('e.created_at', '<', q.to);
    const [{ n }] = await base.clone().count({ n: '*' });
    const rows = await base
      .clone()
      .leftJoin('users as u', 'u.id', 'e.user_id')
      .select('e.*', 'u.name as user_name', 'u.email as user_email')
      .orderBy([
        { column: 'e.created_at', order: 'desc' },
        { column: 'e.id', order: 'desc' },
      ])
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize);
    return {
      total: Number(n),
      events: rows.map((r) => ({
        id: Number(r.id),
        userId: r.user_id,
        userName: r.user_name ?? null,
        userEmail: r.user_email ?? null,
        action: r.action,
        entityKind: r.entity_kind,
        entityId: r.entity_id,
        before: r.before,
        after: r.after,
        at: new Date(r.created_at).toISOString(),
      })),
    };
  },
};
