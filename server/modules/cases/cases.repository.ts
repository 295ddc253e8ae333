// Cases, their timeline, linked walks and notices, as plain typed objects; every read of cases is
// scoped to what the viewer may see.
import type { Knex } from 'knex';
import { can, type Role } from '../../../src/shared/permissions';
import type { SessionUser } from '../../../src/shared/schemas/auth';
import {
  CASE_PRIORITIES,
  CASE_STATUSES,
  type CaseAge,
  type CaseListItem,
  type CaseListQuery,
  type CasePriority,
  type CaseStatus,
  type MailStatus,
  type NoticeView,
} from '../../../src/shared/schemas/cases';

export interface CaseRecord extends CaseListItem {
  organisationId: number;
  callerPhone: string | null;
  callerEmail: string | null;
  applicatorId: number | null;
  createdBy: { id: number; name: string } | null;
  handedOffAt: string | null;
  resolvedAt: string | null;
  closedAt: string | null;
}

interface CaseRow {
  id: number;
  organisation_id: number;
  caller_name: string | null;
  caller_company: string | null;
  caller_phone: string | null;
  caller_email: string | null;
  site: string | null;
  line: string | null;
  applicator: string | null;
  applicator_id: number | null;
  symptom: string;
  priority: CasePriority;
  status: CaseStatus;
  assignee_id: number | null;
  assignee_name: string | null;
  created_by: number | null;
  created_by_name: string | null;
  handed_off_at: Date | null;
  resolved_at: Date | null;
  closed_at: Date | null;
  created_at: Date;
  updated_at: Date;
}

function toCase(row: CaseRow): CaseRecord {
  return {
    id: row.id,
    organisationId: row.organisation_id,
    callerName: row.caller_name,
    callerCompany: row.caller_company,
    callerPhone: row.caller_phone,
    callerEmail: row.caller_email,
    site: row.site,
    line: row.line,
    applicator: row.applicator,
    applicatorId: row.applicator_id,
    symptom: row.symptom,
    priority: row.priority,
    status: row.status,
    assignee: row.assignee_id !== null && row.assignee_name !== null ? { id: row.assignee_id, name: row.assignee_name } : null,
    createdBy: row.created_by !== null && row.created_by_name !== null ? { id: row.created_by, name: row.created_by_name } : null,
    handedOffAt: row.handed_off_at?.toISOString() ?? null,
    resolvedAt: row.resolved_at?.toISOString() ?? null,
    closedAt: row.closed_at?.toISOString() ?? null,
    createdAt: row.created_at.toISOString(),
    updatedAt: row.updated_at.toISOString(),
  };
}

export function listItem(c: CaseRecord): CaseListItem {
  return {
    id: c.id,
    callerName: c.callerName,
    callerCompany: c.callerCompany,
    site: c.site,
    line: c.line,
    applicator: c.applicator,
    symptom: c.symptom,
    priority: c.priority,
    status: c.status,
    assignee: c.assignee,
    createdAt: c.createdAt,
    updatedAt: c.updatedAt,
  };
}

/** Support and managers see every case; the others only what the service level gives them. */
export function seesAllCases(roles: readonly Role[]): boolean {
  return can(roles, 'cases:work') || roles.includes('manager');
}

function scoped(db: Knex, user: SessionUser) {
  const q = db('cases as c').leftJoin('users as a', 'a.id', 'c.assignee_id').leftJoin('users as cb', 'cb.id', 'c.created_by').where('c.organisation_id', user.organisationId);
  if (!seesAllCases(user.roles)) {
    const handedOff = user.roles.includes('author') || user.roles.includes('admin');
    q.where((w) => {
      w.where('c.assignee_id', user.id);
      if (handedOff) w.orWhereNotNull('c.handed_off_at');
    });
  }
  return q;
}

const likeEscape = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

const AGE_CLAUSES: Record<CaseAge, string> = {
  day: `c.created_at >= now() - interval '1 day'`,
  week: `c.created_at >= now() - interval '7 days'`,
  'over-week': `c.created_at < now() - interval '7 days'`,
  'over-month': `c.created_at < now() - interval '30 days'`,
};

function rankSql(column: string, values: readonly string[]): string {
  return `case ${column} ${values.map((v, i) => `when '${v}' then ${i}`).join(' ')} else ${values.length} end`;
}

const SORTS: Record<CaseListQuery['sort'], string> = {
  created: 'c.created_at',
  updated: 'c.updated_at',
  priority: rankSql('c.priority', CASE_PRIORITIES),
  status: rankSql('c.status', CASE_STATUSES),
  caller: `lower(coalesce(c.caller_name, c.caller_company, ''))`,
  site: `lower(coalesce(c.site, ''))`,
  assignee: `lower(coalesce(a.name, ''))`,
};

export interface EventRow {
  id: string;
  kind: string;
  user_name: string | null;
  text: string | null;
  from_status: CaseStatus | null;
  to_status: CaseStatus | null;
  walk_id: number | null;
  guide_title: string | null;
  mail_message_id: number | null;
  mail_to: string | null;
  mail_subject: string | null;
  mail_status: MailStatus | null;
  mail_error: string | null;
  assignee_id: number | null;
  assignee_name: string | null;
  file_ids: string[];
  created_at: Date;
}

export interface LinkedWalkRow {
  id: number;
  guide_id: number;
  status: 'open' | 'ended' | 'abandoned';
  end_kind: 'finding' | 'handoff' | 'fixed-by-try' | 'abandoned' | null;
  outcome: 'fixed' | 'not-fixed' | 'fixed-by-other' | null;
  current_step_id: string | null;
  ended_at_step_id: string | null;
  started_at: Date;
  ended_at: Date | null;
  user_id: number;
  user_name: string | null;
  title: string;
  symptom: string;
  content: { steps?: { id: string; title: string }[] };
}

export const casesRepository = {
  async find(db: Knex, user: SessionUser, id: number, opts: { lock?: boolean } = {}): Promise<CaseRecord | null> {
    const q = scoped(db, user).where('c.id', id).first('c.*', 'a.name as assignee_name', 'cb.name as created_by_name');
    if (opts.lock) q.forUpdate('c');
    const row = (await q) as CaseRow | undefined;
    return row ? toCase(row) : null;
  },

  async list(db: Knex, user: SessionUser, query: CaseListQuery): Promise<{ items: CaseRecord[]; total: number }> {
    const filtered = () => {
      const q = scoped(db, user);
      if (query.status === 'open') q.whereIn('c.status', ['new', 'in-progress', 'waiting', 'handed-off']);
      else if (query.status !== 'all') q.where('c.status', query.status);
      if (query.assignee === 'me') q.where('c.assignee_id', user.id);
      else if (query.assignee === 'none') q.whereNull('c.assignee_id');
      else if (typeof query.assignee === 'number') q.where('c.assignee_id', query.assignee);
      if (query.site) q.whereRaw(`c.site ilike ? escape '\\'`, [`%${likeEscape(query.site)}%`]);
      if (query.age) q.whereRaw(AGE_CLAUSES[query.age]);
      if (query.q) {
        const like = `%${likeEscape(query.q)}%`;
        q.where((w) => {
          for (const col of ['c.caller_name', 'c.caller_company', 'c.symptom', 'c.site', 'c.line', 'c.applicator']) w.orWhereRaw(`${col} ilike ? escape '\\'`, [like]);
          if (/^\d{1,9}$/.test(query.q!)) w.orWhere('c.id', Number(query.q));
        });
      }
      return q;
    };
    const [{ count }] = await filtered().count<{ count: string }[]>('c.id as count');
    const dir = query.dir === 'desc' ? 'desc' : 'asc';
    const rows = (await filtered()
      .select('c.*', 'a.name as assignee_name', 'cb.name as created_by_name')
      .orderByRaw(`${SORTS[query.sort]} ${dir} nulls last, c.id ${dir}`)
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize)) as CaseRow[];
    return { items: rows.map(toCase), total: Number(count) };
  },

  async counts(db: Knex, user: SessionUser): Promise<Record<CaseStatus, number>> {
    const rows = await scoped(db, user).select('c.status').count<{ status: CaseStatus; count: string }[]>('c.id as count').groupBy('c.status');
    const counts = Object.fromEntries(CASE_STATUSES.map((s) => [s, 0])) as Record<CaseStatus, number>;
    for (const r of rows) counts[r.status] = Number(r.count);
    return counts;
  },

  async insert(db: Knex, row: Record<string, unknown>): Promise<number> {
    const [r] = await db('cases').insert(row).returning('id');
    return r.id as number;
  },

  async update(db: Knex, id: number, patch: Record<string, unknown>) {
    await db('cases')
      .where({ id })
      .update({ ...patch, updated_at: db.fn.now() });
  },

  async insertEvent(
    db: Knex,
    e: {
      caseId: number;
      kind: string;
      userId: number | null;
      text?: string | null;
      fromStatus?: CaseStatus | null;
      toStatus?: CaseStatus | null;
      walkId?: number | null;
      mailMessageId?: number | null;
      assigneeId?: number | null;
      fileIds?: string[];
    },
  ) {
    await db('case_events').insert({
      case_id: e.caseId,
      kind: e.kind,
      user_id: e.userId,
      text: e.text ?? null,
      from_status: e.fromStatus ?? null,
      to_status: e.toStatus ?? null,
      walk_id: e.walkId ?? null,
      mail_message_id: e.mailMessageId ?? null,
      assignee_id: e.assigneeId ?? null,
      file_ids: e.fileIds ?? [],
    });
  },

  async events(db: Knex, caseId: number): Promise<EventRow[]> {
    return (await db('case_events as e')
      .leftJoin('users as u', 'u.id', 'e.user_id')
      .leftJoin('users as a', 'a.id', 'e.assignee_id')
      .leftJoin('walks as w', 'w.id', 'e.walk_id')
      .leftJoin('guide_versions as gv', 'gv.id', 'w.guide_version_id')
      .leftJoin('mail_messages as m', 'm.id', 'e.mail_message_id')
      .where('e.case_id', caseId)
      .orderBy('e.id', 'asc')
      .select(
        'e.id',
        'e.kind',
        'u.name as user_name',
        'e.text',
        'e.from_status',
        'e.to_status',
        'e.walk_id',
        'gv.title as guide_title',
        'e.mail_message_id',
        'm.to_address as mail_to',
        'm.subject as mail_subject',
        'm.status as mail_status',
        'm.last_error as mail_error',
        'e.assignee_id',
        'a.name as assignee_name',
        'e.file_ids',
        'e.created_at',
      )) as EventRow[];
  },

  async walks(db: Knex, caseId: number): Promise<LinkedWalkRow[]> {
    return (await db('case_walks as cw')
      .join('walks as w', 'w.id', 'cw.walk_id')
      .join('guide_versions as gv', 'gv.id', 'w.guide_version_id')
      .leftJoin('users as u', 'u.id', 'w.user_id')
      .where('cw.case_id', caseId)
      .orderBy('w.started_at', 'asc')
      .select(
        'w.id',
        'w.guide_id',
        'w.status',
        'w.end_kind',
        'w.outcome',
        'w.current_step_id',
        'w.ended_at_step_id',
        'w.started_at',
        'w.ended_at',
        'w.user_id',
        'u.name as user_name',
        'gv.title',
        'gv.symptom',
        'gv.content',
      )) as LinkedWalkRow[];
  },

  async walkInOrg(db: Knex, organisationId: number, walkId: number) {
    return db('walks').where({ id: walkId, organisation_id: organisationId }).first('id', 'site', 'line', 'applicator');
  },

  async caseOfWalk(db: Knex, walkId: number): Promise<number | null> {
    const row = await db('case_walks').where({ walk_id: walkId }).first('case_id');
    return row ? (row.case_id as number) : null;
  },

  async linkWalk(db: Knex, caseId: number, walkId: number, userId: number) {
    await db('case_walks').insert({ case_id: caseId, walk_id: walkId, linked_by: userId });
  },

  async people(db: Knex, organisationId: number): Promise<{ id: number; name: string; email: string; roles: Role[] }[]> {
    return db('users')
      .where({ organisation_id: organisationId, active: true })
      .whereRaw(`roles && array['support','author','technician']::text[]`)
      .orderBy('name')
      .select('id', 'name', 'email', 'roles');
  },

  async person(db: Knex, organisationId: number, id: number): Promise<{ id: number; name: string; email: string; roles: Role[] } | undefined> {
    return db('users').where({ organisation_id: organisationId, id, active: true }).first('id', 'name', 'email', 'roles');
  },

  async existingFileIds(db: Knex, organisationId: number, ids: string[]): Promise<Set<string>> {
    if (!ids.length) return new Set();
    const rows = await db('files').whereIn('id', ids).where({ organisation_id: organisationId }).select('id');
    return new Set(rows.map((r: { id: string }) => r.id.toLowerCase()));
  },

  async insertNotice(db: Knex, n: { organisationId: number; userId: number; caseId: number | null; kind: string; title: string; body?: string | null }) {
    await db('notices').insert({ organisation_id: n.organisationId, user_id: n.userId, case_id: n.caseId, kind: n.kind, title: n.title, body: n.body ?? null });
  },

  async notices(db: Knex, userId: number, limit: number): Promise<NoticeView[]> {
    const rows = await db('notices')
      .where({ user_id: userId })
      .orderBy([
        { column: 'created_at', order: 'desc' },
        { column: 'id', order: 'desc' },
      ])
      .limit(limit);
    return rows.map((r: { id: number; kind: string; title: string; body: string | null; case_id: number | null; created_at: Date; read_at: Date | null }) => ({
      id: r.id,
      kind: r.kind,
      title: r.title,
      body: r.body,
      caseId: r.case_id,
      createdAt: r.created_at.toISOString(),
      readAt: r.read_at?.toISOString() ?? null,
    }));
  },

  async unreadNotices(db: Knex, userId: number): Promise<number> {
    const row = await db('notices').where({ user_id: userId }).whereNull('read_at').count<{ count: string }[]>('* as count').first();
    return Number(row?.count ?? 0);
  },

  async markNoticeRead(db: Knex, userId: number, id: number): Promise<boolean> {
    const n = await db('notices')
      .where({ id, user_id: userId })
      .update({ read_at: db.raw('coalesce(read_at, now())') });
    return n > 0;
  },
};
