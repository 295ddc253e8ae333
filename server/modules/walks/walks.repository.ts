// Walks, their answer log, notes and flags, and the guide versions they pin, as plain typed
// objects. Guides are read from their tables directly so walks do not depend on the guides module.
import type { Knex } from 'knex';
import { preparedQuery } from '../../db/prepared';
import type { GuideContent } from '../../../src/shared/guides/schema';
import type { WalkAnswerRecord, WalkEndKind, WalkFlagView, WalkMeta, WalkStatus } from '../../../src/shared/schemas/walks';
import type { FindingOutcome, WalkAnswer } from '../../../src/shared/walks/answers';

export interface WalkRow {
  id: number;
  organisation_id: number;
  guide_id: number;
  guide_version_id: number;
  user_id: number;
  user_name?: string | null;
  site: string | null;
  line: string | null;
  applicator: string | null;
  applicator_id: number | null;
  status: WalkStatus;
  current_step_id: string | null;
  ended_at_step_id: string | null;
  end_kind: WalkEndKind | null;
  outcome: FindingOutcome | null;
  cause_code: string | null;
  outcome_note: string | null;
  answer_count: number;
  started_at: Date;
  ended_at: Date | null;
  updated_at: Date;
}

export interface WalkRecord extends WalkMeta {
  organisationId: number;
  startedAtDate: Date;
  endedAtDate: Date | null;
}

export function toWalk(r: WalkRow): WalkRecord {
  return {
    id: r.id,
    organisationId: r.organisation_id,
    guideId: r.guide_id,
    guideVersionId: r.guide_version_id,
    userId: r.user_id,
    userName: r.user_name ?? null,
    site: r.site,
    line: r.line,
    applicator: r.applicator,
    applicatorId: r.applicator_id ?? null,
    status: r.status,
    currentStepId: r.current_step_id,
    endedAtStepId: r.ended_at_step_id,
    endKind: r.end_kind,
    outcome: r.outcome,
    causeCode: r.cause_code,
    outcomeNote: r.outcome_note,
    answerCount: r.answer_count,
    startedAt: r.started_at.toISOString(),
    updatedAt: r.updated_at.toISOString(),
    endedAt: r.ended_at?.toISOString() ?? null,
    startedAtDate: r.started_at,
    endedAtDate: r.ended_at,
  };
}

/** The walk's public fields, without the repository's extras. */
export function walkMeta(w: WalkRecord): WalkMeta {
  const { organisationId: _o, startedAtDate: _s, endedAtDate: _e, ...meta } = w;
  return meta;
}

export interface GuideForStart {
  id: number;
  status: 'active' | 'retired';
  publishedVersionId: number | null;
}

export interface VersionRecord {
  id: number;
  guideId: number;
  number: number;
  state: string;
  title: string;
  symptom: string;
  summary: string;
  tags: string[];
  content: GuideContent;
  guideStatus: 'active' | 'retired';
}

export interface NoteRecord {
  id: number;
  clientId: string;
  stepId: string;
  text: string;
  fileIds: string[];
  userId: number | null;
  userName: string | null;
  createdAt: string;
}

export interface WalkPatch {
  status?: WalkStatus;
  currentStepId?: string | null;
  endedAtStepId?: string | null;
  endKind?: WalkEndKind | null;
  outcome?: FindingOutcome | null;
  causeCode?: string | null;
  outcomeNote?: string | null;
  answerCount?: number;
  /** Stamps ended_at with the transaction's time. */
  ended?: boolean;
}

const WALK_COLUMNS = ['w.*', 'u.name as user_name'];

function toNote(r: { id: number; client_id: string; step_id: string; text: string; file_ids: string[]; user_id: number | null; user_name?: string | null; created_at: Date }): NoteRecord {
  return {
    id: r.id,
    clientId: r.client_id,
    stepId: r.step_id,
    text: r.text,
    fileIds: r.file_ids,
    userId: r.user_id,
    userName: r.user_name ?? null,
    createdAt: r.created_at.toISOString(),
  };
}

/** The walk's columns a patch may set, each with its field. */
const PATCH_COLUMNS = [
  ['status', 'status'],
  ['currentStepId', 'current_step_id'],
  ['endedAtStepId', 'ended_at_step_id'],
  ['endKind', 'end_kind'],
  ['outcome', 'outcome'],
  ['causeCode', 'cause_code'],
  ['outcomeNote', 'outcome_note'],
  ['answerCount', 'answer_count'],
] as const satisfies readonly (readonly [Exclude<keyof WalkPatch, 'ended'>, keyof WalkRow])[];

/** The columns a patch sets (fields left undefined are left alone), for Knex's update(). */
function patchColumns(db: Knex, patch: WalkPatch): Record<string, unknown> {
  const set: Record<string, unknown> = { updated_at: db.fn.now() };
  for (const [field, column] of PATCH_COLUMNS) if (patch[field] !== undefined) set[column] = patch[field];
  if (patch.ended) set.ended_at = db.fn.now();
  return set;
}

/** The same assignments as SQL with `?` placeholders, for a raw (prepared) statement. */
function patchAssignments(patch: WalkPatch): { sql: string; values: unknown[] } {
  const parts = ['updated_at = current_timestamp'];
  const values: unknown[] = [];
  for (const [field, column] of PATCH_COLUMNS) {
    if (patch[field] === undefined) continue;
    parts.push(`${column} = ?`);
    values.push(patch[field]);
  }
  if (patch.ended) parts.push('ended_at = current_timestamp');
  return { sql: parts.join(', '), values };
}

// Named columns rather than *, so a prepared statement keeps its result shape when a migration
// adds a column while servers are running.
const WALK_FIELDS = [
  'id',
  'organisation_id',
  'guide_id',
  'guide_version_id',
  'user_id',
  'site',
  'line',
  'applicator',
  'applicator_id',
  'status',
  'current_step_id',
  'ended_at_step_id',
  'end_kind',
  'outcome',
  'cause_code',
  'outcome_note',
  'answer_count',
  'started_at',
  'updated_at',
  'ended_at',
] as const satisfies readonly (keyof WalkRow)[];

const FIND_WITH_LOG_SQL = `
  select ${WALK_FIELDS.map((f) => `w.${f}`).join(', ')}, u.name as user_name,
         (select coalesce(json_agg(json_build_object('seq', a.seq, 'id', a.client_id, 'kind', a.kind, 'stepId', a.step_id, 'payload', a.payload) order by a.seq), '[]'::json)
            from walk_answers a where a.walk_id = w.id) as log
    from walks w left join users u on u.id = w.user_id
   where w.id = ? and w.organisation_id = ?`;

/** One stored entry of a walk's log with its place in it. */
export interface LoggedAnswer {
  seq: number;
  entry: WalkAnswer;
}

export const walksRepository = {
  async guideForStart(db: Knex, organisationId: number, guideId: number): Promise<GuideForStart | undefined> {
    // A share lock keeps the guide from being retired or republished while the walk pins its version.
    const row = await db('guides').where({ id: guideId, organisation_id: organisationId }).forShare().first('id', 'status', 'published_version_id');
    return row ? { id: row.id, status: row.status, publishedVersionId: row.published_version_id } : undefined;
  },

  async version(db: Knex, versionId: number): Promise<VersionRecord | undefined> {
    const r = await db('guide_versions as v')
      .join('guides as g', 'g.id', 'v.guide_id')
      .where('v.id', versionId)
      .first('v.id', 'v.guide_id', 'v.number', 'v.state', 'v.title', 'v.symptom', 'v.summary', 'v.tags', 'v.content', 'g.status as guide_status');
    if (!r) return undefined;
    return {
      id: r.id,
      guideId: r.guide_id,
      number: r.number,
      state: r.state,
      title: r.title,
      symptom: r.symptom,
      summary: r.summary,
      tags: r.tags,
      content: r.content as GuideContent,
      guideStatus: r.guide_status,
    };
  },

  /** Just the steps of a version, for checking answers against it. */
  async versionContent(db: Knex, versionId: number): Promise<{ state: string; content: GuideContent } | undefined> {
    const r = await db('guide_versions').where({ id: versionId }).first('state', 'content');
    return r ? { state: r.state, content: r.content as GuideContent } : undefined;
  },

  async versionsById(db: Knex, ids: number[]): Promise<Map<number, { number: number; title: string; symptom: string; content: GuideContent }>> {
    if (!ids.length) return new Map();
    const rows = await db('guide_versions').whereIn('id', ids).select('id', 'number', 'title', 'symptom', 'content');
    return new Map(rows.map((r) => [r.id as number, { number: r.number, title: r.title, symptom: r.symptom, content: r.content as GuideContent }]));
  },

  async insert(
    db: Knex,
    row: {
      organisationId: number;
      guideId: number;
      guideVersionId: number;
      userId: number;
      site: string | null;
      line: string | null;
      applicator: string | null;
      applicatorId: number | null;
      currentStepId: string;
    },
  ): Promise<number> {
    const [r] = await db('walks')
      .insert({
        organisation_id: row.organisationId,
        guide_id: row.guideId,
        guide_version_id: row.guideVersionId,
        user_id: row.userId,
        site: row.site,
        line: row.line,
        applicator: row.applicator,
        applicator_id: row.applicatorId,
        status: 'open',
        current_step_id: row.currentStepId,
      })
      .returning('id');
    return r.id;
  },

  /** An unanswered open walk the same user started moments ago on the same version and place. */
  async recentEmptyWalk(
    db: Knex,
    row: { organisationId: number; userId: number; guideVersionId: number; site: string | null; line: string | null; applicator: string | null; applicatorId: number | null },
    withinSeconds: number,
  ): Promise<number | undefined> {
    const found = await db('walks')
      .where({ organisation_id: row.organisationId, user_id: row.userId, guide_version_id: row.guideVersionId, status: 'open', answer_count: 0 })
      .whereRaw('site is not distinct from ?', [row.site])
      .whereRaw('line is not distinct from ?', [row.line])
      .whereRaw('applicator is not distinct from ?', [row.applicator])
      .whereRaw('applicator_id is not distinct from ?', [row.applicatorId])
      .whereRaw(`started_at > now() - make_interval(secs => ?)`, [withinSeconds])
      .orderBy('id', 'desc')
      .first('id');
    return found?.id;
  },

  /** The tag, line and site of a registered applicator, as the walk's place. */
  async applicatorPlace(db: Knex, organisationId: number, applicatorId: number): Promise<{ site: string; line: string; applicator: string } | undefined> {
    const r = await db('applicators as a')
      .join('lines as l', 'l.id', 'a.line_id')
      .join('sites as s', 's.id', 'a.site_id')
      .where({ 'a.id': applicatorId, 'a.organisation_id': organisationId })
      .first('a.tag', 'l.name as line', 's.name as site');
    return r ? { site: r.site, line: r.line, applicator: r.tag } : undefined;
  },

  /** Serialises starts by one user, so two retries of one start cannot both create a walk. */
  async lockUserStarts(db: Knex, userId: number): Promise<void> {
    await db.raw('select pg_advisory_xact_lock(?, ?)', [0x5741_4c4b, userId]);
  },

  async find(db: Knex, organisationId: number, id: number, opts: { lock?: boolean } = {}): Promise<WalkRecord | undefined> {
    const q = db('walks as w').leftJoin('users as u', 'u.id', 'w.user_id').where({ 'w.id': id, 'w.organisation_id': organisationId }).first(WALK_COLUMNS);
    if (opts.lock) q.forUpdate('w');
    const row = (await q) as WalkRow | undefined;
    return row ? toWalk(row) : undefined;
  },

  async update(db: Knex, id: number, patch: WalkPatch): Promise<void> {
    await db('walks').where({ id }).update(patchColumns(db, patch));
  },

  /**
   * The walk with its answer log, in one statement (one round trip instead of two); with `lock`,
   * the row is locked for the caller's transaction. Unlocked, row and log come from one snapshot
   * and always agree. Locked, the log is read from the statement's snapshot, which can miss an
   * answer committed while the lock was waited for, whereas the locked row is always the newest: the
   * log is then returned only when its length equals the row's answer_count, else null (read it again).
   */
  async findWithLog(db: Knex, organisationId: number, id: number, opts: { lock?: boolean } = {}): Promise<{ walk: WalkRecord; log: LoggedAnswer[] | null } | undefined> {
    // A prepared statement: answering a step reads this on every answer.
    const { rows } = await preparedQuery(db, opts.lock ? `${FIND_WITH_LOG_SQL} for update of w` : FIND_WITH_LOG_SQL, [id, organisationId]);
    const row = rows[0] as (WalkRow & { log: { seq: number; id: string; kind: string; stepId: string; payload: WalkAnswer }[] }) | undefined;
    if (!row) return undefined;
    const walk = toWalk(row);
    if (row.log.length !== row.answer_count) return { walk, log: null };
    return { walk, log: row.log.map((a) => ({ seq: a.seq, entry: { ...a.payload, id: a.id, kind: a.kind, stepId: a.stepId } as WalkAnswer })) };
  },

  /**
   * Stores one answer and moves the walk on, in one statement, only if the walk still stands where
   * the caller read it (same answer count and status): the answer was checked against that. Returns
   * the walk as it now stands, or undefined when it had moved meanwhile and nothing was written.
   */
  async appendAnswer(db: Knex, walk: WalkRecord, seq: number, entry: WalkAnswer, patch: WalkPatch): Promise<WalkRecord | undefined> {
    // The statement's text depends only on which fields the patch sets (a few variants), so each
    // variant is prepared once per connection.
    const set = patchAssignments(patch);
    const sql = `with moved as (
        update walks set ${set.sql} where id = ? and answer_count = ? and status = ? returning ${WALK_FIELDS.join(', ')}
      ), added as (
        insert into walk_answers (walk_id, seq, client_id, kind, step_id, payload, answered_at)
        select id, ?, ?, ?, ?, ?::jsonb, ?::timestamptz from moved
      )
      select * from moved`;
    const { rows } = await preparedQuery(db, sql, [...set.values, walk.id, walk.answerCount, walk.status, seq, entry.id, entry.kind, entry.stepId, JSON.stringify(entry), entry.answeredAt]);
    const row = rows[0] as WalkRow | undefined;
    return row ? toWalk({ ...row, user_name: walk.userName }) : undefined;
  },

  async answers(db: Knex, walkId: number): Promise<WalkAnswerRecord[]> {
    const rows = await db('walk_answers').where({ walk_id: walkId }).orderBy('seq').select('seq', 'client_id', 'kind', 'step_id', 'payload', 'received_at');
    // The payload is the entry exactly as validated on arrival; the columns are the indexed copies.
    return rows.map((r) => ({ ...(r.payload as WalkAnswer), id: r.client_id, kind: r.kind, stepId: r.step_id, seq: r.seq, receivedAt: r.received_at.toISOString() }) as WalkAnswerRecord);
  },

  /** The organisation's causes; empty when it has never set its own list. */
  async causes(db: Knex, organisationId: number): Promise<{ code: string; label: string; active: boolean }[]> {
    const rows = await db('causes').where({ organisation_id: organisationId }).orderBy(['position', 'code']).select('code', 'label', 'active');
    return rows.map((r) => ({ code: r.code, label: r.label, active: r.active }));
  },

  async notes(db: Knex, walkId: number): Promise<NoteRecord[]> {
    const rows = await db('walk_notes as n').leftJoin('users as u', 'u.id', 'n.user_id').where('n.walk_id', walkId).orderBy('n.id').select('n.*', 'u.name as user_name');
    return rows.map(toNote);
  },

  async noteByClientId(db: Knex, walkId: number, clientId: string): Promise<NoteRecord | undefined> {
    const row = await db('walk_notes as n').leftJoin('users as u', 'u.id', 'n.user_id').where({ 'n.walk_id': walkId, 'n.client_id': clientId }).first('n.*', 'u.name as user_name');
    return row ? toNote(row) : undefined;
  },

  async insertNote(db: Knex, row: { walkId: number; clientId: string; stepId: string; text: string; fileIds: string[]; userId: number }): Promise<void> {
    await db('walk_notes').insert({
      walk_id: row.walkId,
      client_id: row.clientId,
      step_id: row.stepId,
      text: row.text,
      file_ids: row.fileIds,
      user_id: row.userId,
    });
  },

  async existingFileIds(db: Knex, organisationId: number, ids: string[]): Promise<Set<string>> {
    if (!ids.length) return new Set();
    const rows = await db('files').where({ organisation_id: organisationId }).whereIn('id', ids).select('id');
    return new Set(rows.map((r) => String(r.id).toLowerCase()));
  },

  async flags(db: Knex, walk: { id: number; guideId: number }): Promise<WalkFlagView[]> {
    const rows = await db('step_flags as f')
      .leftJoin('users as u', 'u.id', 'f.user_id')
      // guide_id first so the (guide_id, resolved_at) index does the narrowing.
      .where({ 'f.guide_id': walk.guideId, 'f.walk_id': walk.id })
      .orderBy('f.id')
      .select('f.id', 'f.step_id', 'f.comment', 'f.created_at', 'f.resolved_at', 'u.name as user_name');
    return rows.map((r) => ({
      id: r.id,
      stepId: r.step_id,
      comment: r.comment,
      userName: r.user_name ?? null,
      createdAt: r.created_at.toISOString(),
      resolvedAt: r.resolved_at?.toISOString() ?? null,
    }));
  },

  async insertFlag(db: Knex, row: { organisationId: number; guideId: number; guideVersionId: number; stepId: string; walkId: number; userId: number; comment: string }): Promise<number> {
    const [r] = await db('step_flags')
      .insert({
        organisation_id: row.organisationId,
        guide_id: row.guideId,
        guide_version_id: row.guideVersionId,
        step_id: row.stepId,
        walk_id: row.walkId,
        user_id: row.userId,
        comment: row.comment,
      })
      .returning('id');
    return r.id;
  },

  /**
   * Everything a poller's copy of a walk depends on, in one indexed query: when none of it moved,
   * the detail has not changed and need not be built.
   */
  async pollVersion(
    db: Knex,
    organisationId: number,
    id: number,
  ): Promise<{ userId: number; status: WalkStatus; answerCount: number; updatedAt: Date; endedAt: Date | null; notes: number; flags: number; resolvedFlags: number } | undefined> {
    const r = await db('walks as w')
      .where({ 'w.id': id, 'w.organisation_id': organisationId })
      .first(
        'w.user_id',
        'w.status',
        'w.answer_count',
        'w.updated_at',
        'w.ended_at',
        db.raw('(select count(*)::int from walk_notes n where n.walk_id = w.id) as notes'),
        db.raw('(select count(*)::int from step_flags f where f.guide_id = w.guide_id and f.walk_id = w.id) as flags'),
        db.raw('(select count(*)::int from step_flags f where f.guide_id = w.guide_id and f.walk_id = w.id and f.resolved_at is not null) as resolved_flags'),
      );
    if (!r) return undefined;
    return {
      userId: r.user_id,
      status: r.status,
      answerCount: r.answer_count,
      updatedAt: r.updated_at,
      endedAt: r.ended_at,
      notes: r.notes,
      flags: r.flags,
      resolvedFlags: r.resolved_flags,
    };
  },

  async list(db: Knex, organisationId: number, opts: { userId?: number; status: WalkStatus | 'all'; guideId?: number; limit: number }): Promise<WalkRecord[]> {
    const q = db('walks as w')
      .leftJoin('users as u', 'u.id', 'w.user_id')
      .where('w.organisation_id', organisationId)
      .select(WALK_COLUMNS)
      .orderBy('w.updated_at', 'desc')
      .orderBy('w.id', 'desc')
      .limit(opts.limit);
    if (opts.userId !== undefined) q.where('w.user_id', opts.userId);
    if (opts.status !== 'all') q.where('w.status', opts.status);
    if (opts.guideId !== undefined) q.where('w.guide_id', opts.guideId);
    const rows = (await q) as WalkRow[];
    return rows.map(toWalk);
  },

  async answersOf(db: Knex, walkIds: number[]): Promise<Map<number, WalkAnswer[]>> {
    const byWalk = new Map<number, WalkAnswer[]>(walkIds.map((id) => [id, []]));
    if (!walkIds.length) return byWalk;
    const rows = await db('walk_answers').whereIn('walk_id', walkIds).orderBy(['walk_id', 'seq']).select('walk_id', 'client_id', 'kind', 'step_id', 'payload');
    for (const r of rows) byWalk.get(r.walk_id)?.push({ ...(r.payload as WalkAnswer), id: r.client_id, kind: r.kind, stepId: r.step_id } as WalkAnswer);
    return byWalk;
  },
};
