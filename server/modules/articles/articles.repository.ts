// Articles, revisions and events as plain typed objects.
import type { Knex } from 'knex';
import type { ArticleEventView, ArticleRevisionView, ArticleSummary, ArticleWorkflow } from '../../../src/shared/schemas/articles';

export interface ArticleRow {
  id: number;
  organisation_id: number;
  slug: string;
  workflow: ArticleWorkflow;
  version: number;
  head_revision_id: number;
  published_revision_id: number | null;
  created_by: number | null;
  submitted_by: number | null;
  submitted_at: Date | null;
  reviewed_by: number | null;
  reviewed_at: Date | null;
  updated_at: Date;
}

export interface RevisionRow {
  id: number;
  article_id: number;
  number: number;
  title: string;
  summary: string;
  body_json: unknown;
  body_html: string;
  body_text: string;
  tags: string[];
  keywords: string[];
  hazards: string[];
  file_ids: string[];
  author_id: number | null;
  author_name?: string | null;
  note: string | null;
  created_at: Date;
  updated_at: Date;
}

export function toRevision(r: RevisionRow): ArticleRevisionView {
  return {
    number: r.number,
    title: r.title,
    summary: r.summary,
    body: r.body_json,
    html: r.body_html,
    tags: r.tags,
    keywords: r.keywords,
    hazards: r.hazards,
    authorName: r.author_name ?? null,
    createdAt: r.created_at.toISOString(),
    updatedAt: r.updated_at.toISOString(),
    note: r.note,
  };
}

export const articlesRepository = {
  async lock(db: Knex, organisationId: number, id: number): Promise<ArticleRow | undefined> {
    return db('articles').where({ id, organisation_id: organisationId }).forUpdate().first();
  },
  async find(db: Knex, organisationId: number, id: number): Promise<ArticleRow | undefined> {
    return db('articles').where({ id, organisation_id: organisationId }).first();
  },
  async slugTaken(db: Knex, organisationId: number, slug: string, exceptId?: number) {
    const q = db('articles').where({ organisation_id: organisationId, slug });
    if (exceptId) q.whereNot({ id: exceptId });
    return Boolean(await q.first());
  },
  async revisionById(db: Knex, id: number | null): Promise<RevisionRow | undefined> {
    if (!id) return undefined;
    return db('article_revisions as r').leftJoin('users as u', 'u.id', 'r.author_id').select('r.*', 'u.name as author_name').where('r.id', id).first();
  },
  async revisionByNumber(db: Knex, articleId: number, number: number): Promise<RevisionRow | undefined> {
    return db('article_revisions as r').leftJoin('users as u', 'u.id', 'r.author_id').select('r.*', 'u.name as author_name').where({ 'r.article_id': articleId, 'r.number': number }).first();
  },
  async revisions(db: Knex, articleId: number) {
    return db('article_revisions as r')
      .leftJoin('users as u', 'u.id', 'r.author_id')
      .select('r.number', 'r.title', 'r.note', 'r.created_at', 'r.updated_at', 'u.name as author_name')
      .where('r.article_id', articleId)
      .orderBy('r.number', 'desc');
  },
  async insertRevision(db: Knex, row: Omit<RevisionRow, 'id' | 'created_at' | 'updated_at' | 'author_name'>): Promise<number> {
    const [r] = await db('article_revisions')
      .insert({ ...row, body_json: JSON.stringify(row.body_json) })
      .returning('id');
    return r.id;
  },
  async updateRevision(db: Knex, id: number, patch: Partial<RevisionRow>) {
    await db('article_revisions')
      .where({ id })
      .update({ ...patch, ...(patch.body_json !== undefined ? { body_json: JSON.stringify(patch.body_json) } : {}), updated_at: db.fn.now() });
  },
  async event(db: Knex, articleId: number, kind: string, userId: number | null, revisionNumber: number | null, comment?: string | null) {
    await db('article_events').insert({ article_id: articleId, kind, user_id: userId, revision_number: revisionNumber, comment: comment ?? null });
  },
  async events(db: Knex, articleId: number): Promise<ArticleEventView[]> {
    const rows = await db('article_events as e')
      .leftJoin('users as u', 'u.id', 'e.user_id')
      .select('e.*', 'u.name as user_name')
      .where('e.article_id', articleId)
      .orderBy('e.created_at', 'desc')
      .orderBy('e.id', 'desc')
      .limit(100);
    return rows.map((r) => ({ kind: r.kind, userName: r.user_name, revisionNumber: r.revision_number, comment: r.comment, createdAt: r.created_at.toISOString() }));
  },
  /** Listing rows: the head revision for authors, the published one for readers. */
  async list(db: Knex, organisationId: number, opts: { readerView: boolean; status?: string; tag?: string; q?: string; mineUserId?: number; excludeSubmitter?: number }): Promise<ArticleSummary[]> {
    const q = db('articles as a')
      .join('article_revisions as r', 'r.id', opts.readerView ? 'a.published_revision_id' : 'a.head_revision_id')
      .leftJoin('users as u', 'u.id', 'a.created_by')
      .where('a.organisation_id', organisationId)
      .select('a.*', 'r.title', 'r.summary', 'r.tags', 'r.hazards', 'r.number as head_number', 'u.name as author_name')
      .orderBy('a.updated_at', 'desc')
      .limit(500);
    if (opts.readerView) q.whereNot('a.workflow', 'archived');
    else if (opts.status === 'review-queue') {
      q.where('a.workflow', 'in_review');
      if (opts.excludeSubmitter) q.whereNot('a.submitted_by', opts.excludeSubmitter);
    } else if (opts.status && opts.status !== 'all') q.where('a.workflow', opts.status);
    if (opts.tag) q.whereRaw('? = any(r.tags)', [opts.tag]);
    if (opts.q) q.where((w) => w.whereILike('r.title', `%${opts.q}%`).orWhereILike('r.summary', `%${opts.q}%`).orWhereILike('r.body_text', `%${opts.q}%`));
    if (opts.mineUserId) q.where('a.created_by', opts.mineUserId);
    const rows = await q;
    return rows.map((a) => ({
      id: a.id,
      slug: a.slug,
      title: a.title,
      summary: a.summary,
      workflow: a.workflow,
      published: a.published_revision_id !== null,
      hasUnpublishedChanges: a.published_revision_id !== null && a.published_revision_id !== a.head_revision_id,
      tags: a.tags,
      hazards: a.hazards,
      headRevision: a.head_number,
      version: a.version,
      updatedAt: a.updated_at.toISOString(),
      authorName: a.author_name,
    }));
  },
};
