// Guides, their versions, events and open step flags as plain typed objects. Every function takes
// the caller's transaction handle; row → API mapping is spelled out field by field.
import type { Knex } from 'knex';
import type { GuideDraftContent } from '../../../src/shared/guides/schema';
import type { DraftState, GuideEventView, GuideListItem, GuideStatus, GuideVersionSummary, GuideVersionView, StepFlagView, VersionState } from '../../../src/shared/schemas/guides';

export interface GuideRow {
  id: number;
  organisation_id: number;
  status: GuideStatus;
  draft_version_id: number | null;
  published_version_id: number | null;
  lock_version: number;
  created_by: number | null;
  retired_at: Date | null;
  created_at: Date;
  updated_at: Date;
}

export interface VersionRow {
  id: number;
  guide_id: number;
  number: number;
  state: VersionState;
  title: string;
  symptom: string;
  summary: string;
  tags: string[];
  content: GuideDraftContent;
  error_count: number;
  warning_count: number;
  created_by: number | null;
  updated_by: number | null;
  submitted_by: number | null;
  submitted_at: Date | null;
  reviewed_by: number | null;
  published_at: Date | null;
  review_comment: string | null;
  created_at: Date;
  updated_at: Date;
  created_by_name?: string | null;
  updated_by_name?: string | null;
  submitted_by_name?: string | null;
  reviewed_by_name?: string | null;
}

/** The columns a save writes; everything else about a version is workflow. */
export interface VersionFields {
  title: string;
  symptom: string;
  summary: string;
  tags: string[];
  content: GuideDraftContent;
  error_count: number;
  warning_count: number;
}

/** A time from JavaScript, or the database's own clock (`trx.fn.now()`). */
type Timestamp = Date | Knex.Raw;

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);

export function toVersion(r: VersionRow): GuideVersionView {
  return {
    number: r.number,
    state: r.state,
    meta: { title: r.title, symptom: r.symptom, summary: r.summary, tags: r.tags },
    content: r.content,
    createdAt: r.created_at.toISOString(),
    updatedAt: r.updated_at.toISOString(),
    createdByName: r.created_by_name ?? null,
    updatedByName: r.updated_by_name ?? null,
    submittedById: r.submitted_by,
    submittedByName: r.submitted_by_name ?? null,
    submittedAt: iso(r.submitted_at),
    reviewedByName: r.reviewed_by_name ?? null,
    reviewComment: r.review_comment,
    publishedAt: iso(r.published_at),
    errorCount: r.error_count,
    warningCount: r.warning_count,
  };
}

function versionQuery(db: Knex) {
  return db('guide_versions as v')
    .leftJoin('users as cu', 'cu.id', 'v.created_by')
    .leftJoin('users as uu', 'uu.id', 'v.updated_by')
    .leftJoin('users as su', 'su.id', 'v.submitted_by')
    .leftJoin('users as ru', 'ru.id', 'v.reviewed_by')
    .select('v.*', 'cu.name as created_by_name', 'uu.name as updated_by_name', 'su.name as submitted_by_name', 'ru.name as reviewed_by_name');
}

/** `%` and `_` typed by a user are literal characters, not wildcards. */
function likePattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

const count = (v: unknown) => Number(v ?? 0);

export const guidesRepository = {
  async find(db: Knex, organisationId: number, id: number): Promise<GuideRow | undefined> {
    return db('guides').where({ id, organisation_id: organisationId }).first();
  },

  /** The guide row locked for the rest of the transaction: state changes queue behind each other. */
  async lock(db: Knex, organisationId: number, id: number): Promise<GuideRow | undefined> {
    return db('guides').where({ id, organisation_id: organisationId }).forUpdate().first();
  },

  async insertGuide(db: Knex, row: { organisation_id: number; created_by: number }): Promise<number> {
    const [r] = await db('guides').insert(row).returning('id');
    return r.id;
  },

  async updateGuide(db: Knex, id: number, patch: Partial<Pick<GuideRow, 'status' | 'draft_version_id' | 'published_version_id' | 'lock_version'>> & { retired_at?: Timestamp | null }) {
    await db('guides')
      .where({ id })
      .update({ ...patch, updated_at: db.fn.now() });
  },

  async versionById(db: Knex, id: number | null): Promise<VersionRow | undefined> {
    if (!id) return undefined;
    return versionQuery(db).where('v.id', id).first();
  },

  async versionByNumber(db: Knex, guideId: number, number: number): Promise<VersionRow | undefined> {
    return versionQuery(db).where({ 'v.guide_id': guideId, 'v.number': number }).first();
  },

  /**
   * The number for a new version: above every number a version or an event ever carried, so a
   * discarded draft's number is never given to different content.
   */
  async nextVersionNumber(db: Knex, guideId: number): Promise<number> {
    const v = await db('guide_versions').where({ guide_id: guideId }).max('number as n').first();
    const e = await db('guide_events').where({ guide_id: guideId }).max('version_number as n').first();
    return Math.max(count(v?.n), count(e?.n)) + 1;
  },

  async insertVersion(db: Knex, row: VersionFields & { guide_id: number; number: number; created_by: number; updated_by: number }): Promise<number> {
    const [r] = await db('guide_versions')
      .insert({ ...row, state: 'draft', content: JSON.stringify(row.content) })
      .returning('id');
    return r.id;
  },

  async updateVersion(
    db: Knex,
    id: number,
    patch: Partial<VersionFields> &
      Partial<Pick<VersionRow, 'state' | 'updated_by' | 'submitted_by' | 'reviewed_by' | 'review_comment'>> & {
        submitted_at?: Timestamp | null;
        published_at?: Timestamp | null;
      },
  ) {
    const { content, ...rest } = patch;
    await db('guide_versions')
      .where({ id })
      .update({ ...rest, ...(content !== undefined ? { content: JSON.stringify(content) } : {}), updated_at: db.fn.now() });
  },

  /** The one change a published version ever sees: its state, never its text or its timestamps. */
  async supersede(db: Knex, id: number) {
    await db('guide_versions').where({ id, state: 'published' }).update({ state: 'superseded' });
  },

  /** Only an unpublished draft is ever deleted; the guard is in the query as well as the service. */
  async deleteDraftVersion(db: Knex, id: number) {
    await db('guide_versions').where({ id }).whereIn('state', ['draft', 'in_review']).delete();
  },

  async versions(db: Knex, guideId: number): Promise<GuideVersionSummary[]> {
    const rows = await db('guide_versions as v')
      .leftJoin('users as u', 'u.id', 'v.created_by')
      .select('v.number', 'v.state', 'v.title', 'v.created_at', 'v.published_at', 'u.name as created_by_name')
      .where('v.guide_id', guideId)
      .orderBy('v.number', 'desc');
    return rows.map((r) => ({
      number: r.number,
      state: r.state,
      title: r.title,
      createdAt: r.created_at.toISOString(),
      createdByName: r.created_by_name ?? null,
      publishedAt: iso(r.published_at),
    }));
  },

  async event(db: Knex, guideId: number, kind: string, userId: number, versionNumber: number | null, comment?: string | null) {
    await db('guide_events').insert({ guide_id: guideId, kind, user_id: userId, version_number: versionNumber, comment: comment ?? null });
  },

  async events(db: Knex, guideId: number): Promise<GuideEventView[]> {
    const rows = await db('guide_events as e')
      .leftJoin('users as u', 'u.id', 'e.user_id')
      .select('e.kind', 'e.version_number', 'e.comment', 'e.created_at', 'u.name as user_name')
      .where('e.guide_id', guideId)
      .orderBy('e.created_at', 'desc')
      .orderBy('e.id', 'desc')
      .limit(200);
    return rows.map((r) => ({
      kind: r.kind,
      versionNumber: r.version_number,
      userName: r.user_name ?? null,
      comment: r.comment,
      createdAt: r.created_at.toISOString(),
    }));
  },

  async openFlags(db: Knex, guideId: number): Promise<StepFlagView[]> {
    const rows = await db('step_flags as f')
      .leftJoin('users as u', 'u.id', 'f.user_id')
      .leftJoin('guide_versions as v', 'v.id', 'f.guide_version_id')
      .select('f.id', 'f.step_id', 'f.comment', 'f.created_at', 'u.name as user_name', 'v.number as version_number')
      .where('f.guide_id', guideId)
      .whereNull('f.resolved_at')
      .orderBy('f.created_at', 'asc')
      .orderBy('f.id', 'asc');
    return rows.map((r) => ({
      id: r.id,
      stepId: r.step_id,
      versionNumber: r.version_number ?? null,
      comment: r.comment,
      userName: r.user_name ?? null,
      createdAt: r.created_at.toISOString(),
    }));
  },

  /** Articles a guide may link to: published and not archived. */
  async publishedArticleIds(db: Knex, organisationId: number): Promise<number[]> {
    const rows = await db('articles').where({ organisation_id: organisationId }).whereNotNull('published_revision_id').whereNot('workflow', 'archived').select('id');
    return rows.map((r) => r.id as number);
  },

  /** Which of these file ids are this organisation's uploads (ids that are not UUIDs never are). */
  async existingFileIds(db: Knex, organisationId: number, ids: readonly string[]): Promise<Set<string>> {
    const candidates = [...new Set(ids)].filter((id) => /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(id));
    if (!candidates.length) return new Set();
    const rows = await db('files').where({ organisation_id: organisationId }).whereIn('id', candidates).select('id');
    return new Set(rows.map((r) => String(r.id)));
  },

  async list(db: Knex, organisationId: number, opts: { readerView: boolean; status: string; tag?: string; q?: string; symptom?: string; userId: number }): Promise<GuideListItem[]> {
    const flags = db('step_flags').whereNull('resolved_at').groupBy('guide_id').select('guide_id', db.raw('count(*) as open_flags'));
    const walks = db('walks')
      .where({ status: 'ended' })
      .groupBy('guide_id')
      .select('guide_id', db.raw(`count(*) filter (where outcome = 'not-fixed') as not_fixed`), db.raw(`count(*) filter (where outcome = 'fixed-by-other') as fixed_by_other`));
    // Authors see the working copy's metadata; readers only ever the published one.
    const meta = opts.readerView ? 'p' : 'm';
    const q = db('guides as g')
      .leftJoin('guide_versions as d', 'd.id', 'g.draft_version_id')
      .leftJoin('guide_versions as p', 'p.id', 'g.published_version_id')
      .joinRaw('join guide_versions as m on m.id = coalesce(g.draft_version_id, g.published_version_id)')
      .leftJoin('users as du', 'du.id', 'd.updated_by')
      .leftJoin('users as su', 'su.id', 'd.submitted_by')
      .leftJoin(flags.as('f'), 'f.guide_id', 'g.id')
      .leftJoin(walks.as('w'), 'w.guide_id', 'g.id')
      .where('g.organisation_id', organisationId)
      .select(
        'g.id',
        'g.status',
        'g.lock_version',
        'g.updated_at',
        `${meta}.title`,
        `${meta}.symptom`,
        `${meta}.summary`,
        `${meta}.tags`,
        'p.number as published_number',
        'p.published_at',
        'd.number as draft_number',
        'd.state as draft_state',
        'd.updated_at as draft_updated_at',
        'd.error_count',
        'd.warning_count',
        'd.submitted_by',
        'du.name as draft_updated_by_name',
        'su.name as submitted_by_name',
        'f.open_flags',
        'w.not_fixed',
        'w.fixed_by_other',
      )
      .orderBy('g.updated_at', 'desc')
      .orderBy('g.id', 'desc')
      .limit(500);

    if (opts.readerView) {
      q.where('g.status', 'active').whereNotNull('g.published_version_id');
    } else {
      switch (opts.status) {
        case 'active':
        case 'retired':
          q.where('g.status', opts.status);
          break;
        case 'draft':
        case 'in_review':
          q.where('d.state', opts.status);
          break;
        case 'review-queue':
          q.where('d.state', 'in_review').where((w) => w.whereNull('d.submitted_by').orWhereNot('d.submitted_by', opts.userId));
          break;
        case 'published':
          q.whereNotNull('g.published_version_id');
          break;
        case 'unpublished':
          q.whereNull('g.published_version_id');
          break;
      }
    }
    if (opts.tag) q.whereRaw(`? = any(${meta}.tags)`, [opts.tag]);
    if (opts.symptom) q.whereILike(`${meta}.symptom`, likePattern(opts.symptom));
    if (opts.q) {
      const pattern = likePattern(opts.q);
      q.where((w) => w.whereILike(`${meta}.title`, pattern).orWhereILike(`${meta}.symptom`, pattern).orWhereILike(`${meta}.summary`, pattern));
    }

    const rows = await q;
    return rows.map((r) => {
      const author = !opts.readerView;
      const draftState: DraftState = author && r.draft_state ? r.draft_state : 'none';
      return {
        id: r.id,
        title: r.title,
        symptom: r.symptom,
        summary: r.summary,
        tags: r.tags,
        status: r.status,
        publishedVersion: r.published_number ?? null,
        publishedAt: iso(r.published_at),
        draftState,
        draftVersion: author ? (r.draft_number ?? null) : null,
        draftUpdatedAt: author ? iso(r.draft_updated_at) : null,
        draftUpdatedByName: author ? (r.draft_updated_by_name ?? null) : null,
        submittedById: author && draftState === 'in_review' ? r.submitted_by : null,
        submittedByName: author && draftState === 'in_review' ? (r.submitted_by_name ?? null) : null,
        errorCount: author && r.draft_number ? r.error_count : null,
        warningCount: author && r.draft_number ? r.warning_count : null,
        lockVersion: author ? r.lock_version : null,
        openFlagCount: author ? count(r.open_flags) : 0,
        walksNotFixed: author ? count(r.not_fixed) : 0,
        walksFixedByOther: author ? count(r.fixed_by_other) : 0,
        updatedAt: r.updated_at.toISOString(),
      };
    });
  },
};
