// Articles: drafts with a revision per save, review by a different author, publish, archive,
// compare and restore. Readers only ever see the approved revision.
import { diffLines, diffWordsWithSpace } from 'diff';
import type { Knex } from 'knex';
import type { SessionUser } from '../../../src/shared/schemas/auth';
import { can } from '../../../src/shared/permissions';
import { slugify, type ArticleCreateInput, type ArticleDetail, type ArticleSaveInput, type ArticleWorkflow } from '../../../src/shared/schemas/articles';
import { AppError } from '../../lib/app-error';
import { prepareRichText } from '../../lib/rich-text';
import type { FilesService } from '../files/files.service';
import type { TagsService } from '../tags/tags.service';
import { articlesRepository as repo, toRevision, type ArticleRow, type RevisionRow } from './articles.repository';
import { audit } from '../../lib/audit';

/** Autosaves by the same author within this window fold into the revision they started. */
export const AUTOSAVE_FOLD_MS = 5 * 60 * 1000;

export function createArticlesService(deps: { db: Knex; tags: TagsService; files: FilesService }) {
  const { db } = deps;
  const isAuthor = (u: SessionUser) => can(u.roles, 'articles:write');

  async function organisationSettings(trx: Knex, organisationId: number): Promise<{ allowSelfPublish?: boolean }> {
    const org = await trx('organisations').where({ id: organisationId }).first();
    return org?.settings ?? {};
  }

  async function prepare(trx: Knex, user: SessionUser, input: ArticleCreateInput) {
    const active = await deps.tags.activeSlugs(user.organisationId);
    const unknown = input.tags.filter((t) => !active.has(t));
    if (unknown.length) {
      throw AppError.invalid(`Unknown tag${unknown.length > 1 ? 's' : ''}: ${unknown.join(', ')}`, { tags: `Unknown tag: ${unknown.join(', ')}` });
    }
    const rich = prepareRichText(input.body);
    if (rich.fileIds.length) {
      const found = await deps.files.describe(user.organisationId, rich.fileIds);
      if (found.length !== rich.fileIds.length) throw AppError.invalid('A photo in the text was not found; upload it again', { body: 'A photo in the text was not found' });
    }
    return {
      title: input.title,
      summary: input.summary,
      body_json: rich.doc,
      body_html: rich.html,
      body_text: rich.text,
      tags: [...new Set(input.tags)],
      keywords: [...new Set(input.keywords.map((k) => k.toLowerCase()))],
      hazards: rich.hazards,
      file_ids: rich.fileIds,
    };
  }

  async function mustFind(trx: Knex, user: SessionUser, id: number, lock = false): Promise<ArticleRow> {
    const a = lock ? await repo.lock(trx, user.organisationId, id) : await repo.find(trx, user.organisationId, id);
    if (!a) throw AppError.notFound('This article');
    return a;
  }

  async function detail(trx: Knex, user: SessionUser, a: ArticleRow): Promise<ArticleDetail> {
    const author = isAuthor(user);
    const published = await repo.revisionById(trx, a.published_revision_id);
    if (!author && (!published || a.workflow === 'archived')) throw AppError.notFound('This article');
    const head = author ? await repo.revisionById(trx, a.head_revision_id) : undefined;
    const shown = (head ?? published)!;
    const names = await trx('users')
      .whereIn(
        'id',
        [a.created_by, a.submitted_by, a.reviewed_by].filter((x): x is number => x !== null),
      )
      .select('id', 'name');
    const nameOf = (id: number | null) => names.find((n) => n.id === id)?.name ?? null;
    const fileIds = [...new Set([...(head?.file_ids ?? []), ...(published?.file_ids ?? [])])];
    return {
      id: a.id,
      slug: a.slug,
      title: shown.title,
      summary: shown.summary,
      workflow: a.workflow,
      published: Boolean(published),
      hasUnpublishedChanges: Boolean(published) && a.published_revision_id !== a.head_revision_id,
      tags: shown.tags,
      hazards: shown.hazards,
      headRevision: head?.number ?? published!.number,
      version: a.version,
      updatedAt: a.updated_at.toISOString(),
      authorName: nameOf(a.created_by),
      publishedRevision: published ? toRevision(published) : null,
      head: head ? toRevision(head) : null,
      submittedByName: nameOf(a.submitted_by),
      submittedById: a.submitted_by,
      reviewedByName: nameOf(a.reviewed_by),
      reviewedAt: a.reviewed_at?.toISOString() ?? null,
      events: author ? await repo.events(trx, a.id) : [],
      files: (await deps.files.describe(user.organisationId, fileIds)).map((f) => ({ id: f.id, kind: f.kind, urls: f.urls, originalName: f.originalName })),
    };
  }

  async function touch(trx: Knex, a: ArticleRow, patch: Record<string, unknown>) {
    await trx('articles')
      .where({ id: a.id })
      .update({ ...patch, version: a.version + 1, updated_at: trx.fn.now() });
  }

  function conflict(a: ArticleRow, head: RevisionRow) {
    return new AppError('conflict', `Someone else changed this article (revision ${head.number}, saved by ${head.author_name ?? 'another author'}) since you opened it.`, undefined, {
      current: { version: a.version, revision: toRevision(head) },
    });
  }

  async function transition(user: SessionUser, id: number, from: ArticleWorkflow[], to: ArticleWorkflow, event: string, comment?: string, extra: Record<string, unknown> = {}) {
    return db.transaction(async (trx) => {
      const a = await mustFind(trx, user, id, true);
      if (!from.includes(a.workflow)) {
        throw AppError.conflict(`This article is ${a.workflow.replace('_', ' ')}; it cannot be ${event.replace('_', ' ')} now.`);
      }
      const head = await repo.revisionById(trx, a.head_revision_id);
      await touch(trx, a, { workflow: to, ...extra });
      await repo.event(trx, a.id, event, user.id, head?.number ?? null, comment);
      if (event === 'archived' || event === 'restored') {
        await audit(trx, {
          organisationId: user.organisationId,
          userId: user.id,
          action: `article.${event === 'archived' ? 'archive' : 'unarchive'}`,
          entityKind: 'article',
          entityId: a.id,
          before: { title: head?.title, workflow: a.workflow },
          after: { title: head?.title, workflow: to },
        });
      }
      return detail(trx, user, (await repo.find(trx, user.organisationId, id))!);
    });
  }

  return {
    async list(user: SessionUser, query: { status: string; tag?: string; q?: string; mine?: string }) {
      const readerView = !isAuthor(user);
      return repo.list(db, user.organisationId, {
        readerView,
        status: query.status,
        tag: query.tag,
        q: query.q,
        mineUserId: query.mine === '1' ? user.id : undefined,
        excludeSubmitter: query.status === 'review-queue' ? user.id : undefined,
      });
    },

    async get(user: SessionUser, id: number) {
      return detail(db, user, await mustFind(db, user, id));
    },

    async create(user: SessionUser, input: ArticleCreateInput) {
      return db.transaction(async (trx) => {
        const slug = slugify(input.title);
        if (await repo.slugTaken(trx, user.organisationId, slug)) {
          throw AppError.conflict('An article with this title already exists', { title: 'An article with this title already exists; choose another title' });
        }
        const fields = await prepare(trx, user, input);
        const [row] = await trx('articles').insert({ organisation_id: user.organisationId, slug, workflow: 'draft', created_by: user.id }).returning('*');
        const revId = await repo.insertRevision(trx, { article_id: row.id, number: 1, author_id: user.id, note: null, ...fields });
        await trx('articles').where({ id: row.id }).update({ head_revision_id: revId });
        await repo.event(trx, row.id, 'created', user.id, 1);
        return detail(trx, user, (await repo.find(trx, user.organisationId, row.id))!);
      });
    },

    async save(user: SessionUser, id: number, input: ArticleSaveInput) {
      return db.transaction(async (trx) => {
        const a = await mustFind(trx, user, id, true);
        const head = (await repo.revisionById(trx, a.head_revision_id))!;
        if (a.version !== input.baseVersion) throw conflict(a, head);
        if (a.workflow === 'in_review') throw AppError.conflict('This article is waiting for review. Withdraw it from review to edit it.');
        if (a.workflow === 'archived') throw AppError.conflict('This article is archived. Restore it from the archive to edit it.');
        const slug = slugify(input.title);
        const neverPublished = a.published_revision_id === null;
        if (slug !== a.slug && (await repo.slugTaken(trx, user.organisationId, slug, a.id))) {
          throw AppError.conflict('An article with this title already exists', { title: 'An article with this title already exists; choose another title' });
        }
        const fields = await prepare(trx, user, input);
        const fold = input.autosave && head.author_id === user.id && head.id !== a.published_revision_id && Date.now() - head.updated_at.getTime() < AUTOSAVE_FOLD_MS;
        let number = head.number;
        if (fold) {
          await repo.updateRevision(trx, head.id, { ...fields, note: input.note ?? head.note });
        } else {
          number = head.number + 1;
          const revId = await repo.insertRevision(trx, { article_id: a.id, number, author_id: user.id, note: input.note ?? null, ...fields });
          await trx('articles').where({ id: a.id }).update({ head_revision_id: revId });
        }
        await touch(trx, a, { workflow: 'draft', ...(neverPublished ? { slug } : {}) });
        return detail(trx, user, (await repo.find(trx, user.organisationId, id))!);
      });
    },

    async submit(user: SessionUser, id: number) {
      const a = await mustFind(db, user, id);
      if (a.published_revision_id === a.head_revision_id) throw AppError.conflict('Nothing has changed since the published revision, so there is nothing to review.');
      return transition(user, id, ['draft'], 'in_review', 'submitted', undefined, { submitted_by: user.id, submitted_at: db.fn.now() });
    },

    async withdraw(user: SessionUser, id: number) {
      return transition(user, id, ['in_review'], 'draft', 'withdrawn');
    },

    async approve(user: SessionUser, id: number, comment?: string) {
      return db.transaction(async (trx) => {
        const a = await mustFind(trx, user, id, true);
        if (a.workflow !== 'in_review') throw AppError.conflict('Only an article waiting for review can be approved.');
        const settings = await organisationSettings(trx, user.organisationId);
        if (a.submitted_by === user.id && !settings.allowSelfPublish) {
          throw AppError.forbidden('A different author must approve this article (your organisation does not allow self-publishing).');
        }
        const head = (await repo.revisionById(trx, a.head_revision_id))!;
        await touch(trx, a, { workflow: 'published', published_revision_id: a.head_revision_id, reviewed_by: user.id, reviewed_at: trx.fn.now() });
        await repo.event(trx, a.id, 'approved', user.id, head.number, comment);
        await audit(trx, {
          organisationId: user.organisationId,
          userId: user.id,
          action: 'article.approve',
          entityKind: 'article',
          entityId: a.id,
          before: { title: head.title, workflow: a.workflow },
          after: { title: head.title, workflow: 'published', revision: head.number },
        });
        return detail(trx, user, (await repo.find(trx, user.organisationId, id))!);
      });
    },

    async requestChanges(user: SessionUser, id: number, comment: string) {
      return transition(user, id, ['in_review'], 'draft', 'changes_requested', comment);
    },

    async archive(user: SessionUser, id: number) {
      return transition(user, id, ['draft', 'published'], 'archived', 'archived');
    },

    async unarchive(user: SessionUser, id: number) {
      const a = await mustFind(db, user, id);
      return transition(user, id, ['archived'], a.published_revision_id === a.head_revision_id && a.published_revision_id ? 'published' : 'draft', 'restored');
    },

    async revisions(user: SessionUser, id: number) {
      const a = await mustFind(db, user, id);
      const rows = await repo.revisions(db, a.id);
      const published = a.published_revision_id ? await repo.revisionById(db, a.published_revision_id) : undefined;
      return rows.map((r) => ({
        number: r.number,
        title: r.title,
        note: r.note,
        authorName: r.author_name,
        createdAt: r.created_at.toISOString(),
        updatedAt: r.updated_at.toISOString(),
        published: published?.number === r.number,
      }));
    },

    async revision(user: SessionUser, id: number, number: number) {
      const a = await mustFind(db, user, id);
      const r = await repo.revisionByNumber(db, a.id, number);
      if (!r) throw AppError.notFound(`Revision ${number}`);
      return toRevision(r);
    },

    async compare(user: SessionUser, id: number, from: number, to: number) {
      const a = await mustFind(db, user, id);
      const [x, y] = await Promise.all([repo.revisionByNumber(db, a.id, from), repo.revisionByNumber(db, a.id, to)]);
      if (!x) throw AppError.notFound(`Revision ${from}`);
      if (!y) throw AppError.notFound(`Revision ${to}`);
      const chunks = (changes: { value: string; added?: boolean; removed?: boolean }[]) => changes.map((c) => ({ value: c.value, change: c.added ? 'added' : c.removed ? 'removed' : 'same' }));
      return {
        from,
        to,
        title: chunks(diffWordsWithSpace(x.title, y.title)),
        summary: chunks(diffWordsWithSpace(x.summary, y.summary)),
        body: chunks(diffLines(x.body_text + '\n', y.body_text + '\n')),
        tags: { added: y.tags.filter((t) => !x.tags.includes(t)), removed: x.tags.filter((t) => !y.tags.includes(t)) },
      };
    },

    async restore(user: SessionUser, id: number, number: number, baseVersion: number) {
      return db.transaction(async (trx) => {
        const a = await mustFind(trx, user, id, true);
        const head = (await repo.revisionById(trx, a.head_revision_id))!;
        if (a.version !== baseVersion) throw conflict(a, head);
        if (a.workflow === 'in_review' || a.workflow === 'archived') throw AppError.conflict(`This article is ${a.workflow.replace('_', ' ')}; it cannot be changed now.`);
        const old = await repo.revisionByNumber(trx, a.id, number);
        if (!old) throw AppError.notFound(`Revision ${number}`);
        const revId = await repo.insertRevision(trx, {
          article_id: a.id,
          number: head.number + 1,
          author_id: user.id,
          note: `Restored from revision ${number}`,
          title: old.title,
          summary: old.summary,
          body_json: old.body_json,
          body_html: old.body_html,
          body_text: old.body_text,
          tags: old.tags,
          keywords: old.keywords,
          hazards: old.hazards,
          file_ids: old.file_ids,
        });
        await trx('articles').where({ id: a.id }).update({ head_revision_id: revId });
        await touch(trx, a, { workflow: 'draft' });
        await repo.event(trx, a.id, 'reverted', user.id, head.number + 1, `Restored revision ${number}`);
        return detail(trx, user, (await repo.find(trx, user.organisationId, id))!);
      });
    },
  };
}
export type ArticlesService = ReturnType<typeof createArticlesService>;
