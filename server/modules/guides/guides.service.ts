// Guides: one mutable draft beside immutable published versions, review by a different author,
// retire and restore, compare, and the guide file for sharing between sites. Technicians only
// ever see the published version of an active guide.
import type { Knex } from 'knex';
import { listCalculators } from '../../../src/shared/calculators';
import { causesUsedBy, exportGuideFile, parseGuideFile, type GuideFile } from '../../../src/shared/guides/export';
import { GuideContent, type DraftStep, type GuideDraftContent, type RichBody } from '../../../src/shared/guides/schema';
import { validateGuide, type ValidationContext } from '../../../src/shared/guides/validate';
import { can } from '../../../src/shared/permissions';
import { slugify } from '../../../src/shared/schemas/articles';
import type { SessionUser } from '../../../src/shared/schemas/auth';
import type {
  GuideApproveInput,
  GuideComparison,
  GuideCreateInput,
  GuideDetail,
  GuideDraftView,
  GuideImportResult,
  GuideListItem,
  GuideListQuery,
  GuideMetaInput,
  GuideSaveInput,
  GuideVersionView,
  StepFlagView,
  VersionRef,
} from '../../../src/shared/schemas/guides';
import type { TipTapNode } from '../../../src/shared/rich-text/extensions';
import { AppError } from '../../lib/app-error';
import { cleanDoc, renderDoc } from '../../lib/rich-text';
import type { FilesService } from '../files/files.service';
import type { TagsService } from '../tags/tags.service';
import type { CausesService } from './causes.service';
import { compareVersions } from './guides.compare';
import { problemsError, zodProblems, type PathProblem } from './guides.problems';
import { guidesRepository as repo, toVersion, type GuideRow, type VersionFields, type VersionRow } from './guides.repository';
import { audit } from '../../lib/audit';

// Declarations never change while the server runs.
const CALCULATORS = listCalculators();

export interface GuidesServiceDeps {
  db: Knex;
  tags: TagsService;
  files: FilesService;
  causes: CausesService;
}

/** A new guide's first step: the symptom as the first question, for the author to fill in. */
function starterContent(symptom: string): GuideDraftContent {
  return {
    startStepId: 'start',
    steps: [{ kind: 'ask', id: 'start', title: symptom, cautions: [], photoIds: [], articleIds: [], choices: [] }],
  };
}

function stepLabel(step: DraftStep, index: number) {
  return `Step ${index + 1} ('${step.id}')`;
}

/** Image nodes left out, counting them: their files belong to the site that made the document. */
function withoutImages(node: TipTapNode): { node: TipTapNode; removed: number } {
  let removed = 0;
  const walk = (n: TipTapNode): TipTapNode => {
    if (!n.content) return n;
    const content = n.content.filter((c) => (c.type === 'image' ? (removed++, false) : true)).map(walk);
    return { ...n, content };
  };
  const out = walk(node);
  return { node: out, removed };
}

export function createGuidesService(deps: GuidesServiceDeps) {
  const { db } = deps;
  const isAuthor = (u: SessionUser) => can(u.roles, 'guides:write');

  async function mustFind(trx: Knex, user: SessionUser, id: number, lock = false): Promise<GuideRow> {
    const g = lock ? await repo.lock(trx, user.organisationId, id) : await repo.find(trx, user.organisationId, id);
    if (!g) throw AppError.notFound('This guide');
    return g;
  }

  async function validationContext(trx: Knex, organisationId: number): Promise<ValidationContext> {
    const [causeCodes, articleIds] = await Promise.all([deps.causes.activeCodes(organisationId, trx), repo.publishedArticleIds(trx, organisationId)]);
    return { causeCodes, articleIds, calculators: CALCULATORS };
  }

  async function checkTags(organisationId: number, tags: readonly string[], field: string) {
    const active = await deps.tags.activeSlugs(organisationId);
    const unknown = [...new Set(tags)].filter((t) => !active.has(t));
    if (unknown.length) {
      const list = unknown.join(', ');
      throw AppError.invalid(`Unknown tag${unknown.length > 1 ? 's' : ''}: ${list}`, { [field]: `Unknown tag: ${list}` });
    }
  }

  /**
   * Rebuilds every step body's html from its doc (cleaned first), and checks that photos belong to
   * the organisation. An imported file's photos, article links and body images belong to the
   * exporting site and are dropped instead, with a count.
   */
  async function prepareContent(trx: Knex, organisationId: number, content: GuideDraftContent, mode: 'save' | 'import') {
    const dropped = { articleIds: 0, photoIds: 0 };
    const problems: PathProblem[] = [];
    const docs: ({ doc: TipTapNode; fileIds: string[] } | undefined)[] = content.steps.map((step, i) => {
      if (!step.body) return undefined;
      try {
        const cleaned = cleanDoc(step.body.doc, `content.steps[${i}].body`);
        if (mode === 'import' && cleaned.fileIds.length) {
          const { node, removed } = withoutImages(cleaned.doc);
          dropped.photoIds += removed;
          return { doc: node, fileIds: [] };
        }
        return cleaned;
      } catch (err) {
        if (!(err instanceof AppError)) throw err;
        problems.push({ path: `content.steps[${i}].body`, message: `${stepLabel(step, i)}: ${err.message}` });
        return undefined;
      }
    });

    if (mode === 'save') {
      const wanted = content.steps.flatMap((s, i) => [...s.photoIds, ...(docs[i]?.fileIds ?? [])]);
      const existing = await repo.existingFileIds(trx, organisationId, wanted);
      content.steps.forEach((step, i) => {
        step.photoIds.forEach((photoId, j) => {
          if (!existing.has(photoId)) {
            problems.push({ path: `content.steps[${i}].photoIds[${j}]`, message: `${stepLabel(step, i)}: photo ${photoId} was not found; upload it again` });
          }
        });
        if (docs[i]?.fileIds.some((f) => !existing.has(f))) {
          problems.push({ path: `content.steps[${i}].body`, message: `${stepLabel(step, i)}: a photo in the text was not found; upload it again` });
        }
      });
    }

    const steps = content.steps.map((step, i): DraftStep => {
      let out: DraftStep = step;
      if (mode === 'import') {
        dropped.articleIds += step.articleIds.length;
        dropped.photoIds += step.photoIds.length;
        out = { ...out, articleIds: [], photoIds: [] };
      }
      const prepared = docs[i];
      if (prepared) {
        try {
          out = { ...out, body: { doc: prepared.doc as RichBody['doc'], html: renderDoc(prepared.doc) } };
        } catch (err) {
          if (!(err instanceof AppError)) throw err;
          problems.push({ path: `content.steps[${i}].body`, message: `${stepLabel(step, i)}: ${err.message}` });
        }
      }
      return out;
    });
    if (problems.length) throw problemsError('Some steps cannot be saved', problems);
    return { content: { startStepId: content.startStepId, steps }, dropped };
  }

  function versionFields(meta: GuideMetaInput, content: GuideDraftContent, ctx: ValidationContext): VersionFields {
    const v = validateGuide(content, ctx);
    return {
      title: meta.title,
      symptom: meta.symptom,
      summary: meta.summary ?? '',
      tags: [...new Set(meta.tags)],
      content,
      error_count: v.errors.length,
      warning_count: v.warnings.length,
    };
  }

  /**
   * Everything that blocks submit and approve: the finished-guide shape, then the validator's
   * errors (which word graph problems per step); one message per path, the validator's first.
   */
  function blockingProblems(content: GuideDraftContent, ctx: ValidationContext): PathProblem[] {
    const problems: PathProblem[] = validateGuide(content, ctx).errors.map((e) => ({ path: e.path ? `content.${e.path}` : 'content', message: e.message }));
    const strict = GuideContent.safeParse(content);
    if (!strict.success) {
      const known = new Set(problems.map((p) => p.path));
      for (const p of zodProblems(strict.error.issues, { content }, ['content'])) {
        if (!known.has(p.path)) {
          problems.push(p);
          known.add(p.path);
        }
      }
    }
    return problems;
  }

  async function organisationSettings(trx: Knex, organisationId: number): Promise<{ allowSelfPublish?: boolean }> {
    const org = await trx('organisations').where({ id: organisationId }).first();
    return org?.settings ?? {};
  }

  async function detail(trx: Knex, user: SessionUser, g: GuideRow): Promise<GuideDetail> {
    const published = await repo.versionById(trx, g.published_version_id);
    const base = {
      id: g.id,
      status: g.status,
      retiredAt: g.retired_at?.toISOString() ?? null,
      createdAt: g.created_at.toISOString(),
      updatedAt: g.updated_at.toISOString(),
    };
    if (!isAuthor(user)) {
      if (!published || g.status === 'retired') throw AppError.notFound('This guide');
      return { ...base, published: toVersion(published), draftState: null, lockVersion: null, draft: null, versions: [], events: [], flags: {} };
    }
    const draftRow = await repo.versionById(trx, g.draft_version_id);
    let draft: GuideDraftView | null = null;
    if (draftRow) {
      const ctx = await validationContext(trx, g.organisation_id);
      draft = { ...toVersion(draftRow), validation: validateGuide(draftRow.content, ctx) };
    }
    const flags: Record<string, StepFlagView[]> = {};
    for (const f of await repo.openFlags(trx, g.id)) (flags[f.stepId] ??= []).push(f);
    return {
      ...base,
      published: published ? toVersion(published) : null,
      draftState: draftRow ? (draftRow.state === 'in_review' ? 'in_review' : 'draft') : 'none',
      lockVersion: g.lock_version,
      draft,
      versions: await repo.versions(trx, g.id),
      events: await repo.events(trx, g.id),
      flags,
    };
  }

  async function reload(trx: Knex, user: SessionUser, id: number) {
    return detail(trx, user, await mustFind(trx, user, id));
  }

  async function conflict(trx: Knex, user: SessionUser, g: GuideRow): Promise<AppError> {
    const current = await detail(trx, user, g);
    const by = current.draft?.updatedByName ?? 'another author';
    const what = current.draft ? `draft version ${current.draft.number} was saved by ${by}` : 'its draft was published or discarded';
    return new AppError('conflict', `Someone else changed this guide since you opened it (${what}). Your changes were not saved.`, undefined, { current });
  }

  async function checkLock(trx: Knex, user: SessionUser, g: GuideRow, base: number | undefined) {
    if (base !== undefined && base !== g.lock_version) throw await conflict(trx, user, g);
  }

  async function mustHaveDraft(trx: Knex, g: GuideRow, state: 'draft' | 'in_review', action: string): Promise<VersionRow> {
    const draft = await repo.versionById(trx, g.draft_version_id);
    if (!draft) throw AppError.conflict(`This guide has no draft to ${action}.`);
    if (draft.state !== state) {
      throw AppError.conflict(
        state === 'draft' ? `Version ${draft.number} is waiting for review; withdraw it from review first.` : `Version ${draft.number} is not waiting for review, so it cannot be ${action}d.`,
      );
    }
    return draft;
  }

  async function refuseIfBroken(trx: Knex, g: GuideRow, draft: VersionRow, what: string) {
    const ctx = await validationContext(trx, g.organisation_id);
    const problems = blockingProblems(draft.content, ctx);
    if (problems.length) throw problemsError(`Version ${draft.number} cannot be ${what} yet`, problems);
    return validateGuide(draft.content, ctx);
  }

  async function bump(trx: Knex, g: GuideRow, patch: Parameters<typeof repo.updateGuide>[2] = {}) {
    await repo.updateGuide(trx, g.id, { ...patch, lock_version: g.lock_version + 1 });
  }

  async function createGuide(trx: Knex, user: SessionUser, fields: VersionFields, event: string, comment?: string) {
    const id = await repo.insertGuide(trx, { organisation_id: user.organisationId, created_by: user.id });
    const versionId = await repo.insertVersion(trx, { ...fields, guide_id: id, number: 1, created_by: user.id, updated_by: user.id });
    await repo.updateGuide(trx, id, { draft_version_id: versionId });
    await repo.event(trx, id, event, user.id, 1, comment);
    return reload(trx, user, id);
  }

  async function resolve(trx: Knex, g: GuideRow, ref: VersionRef): Promise<VersionRow> {
    if (ref === 'published') {
      const v = await repo.versionById(trx, g.published_version_id);
      if (!v) throw AppError.notFound('A published version of this guide');
      return v;
    }
    if (ref === 'draft') {
      const v = await repo.versionById(trx, g.draft_version_id);
      if (!v) throw AppError.notFound('A draft of this guide');
      return v;
    }
    const v = await repo.versionByNumber(trx, g.id, ref);
    if (!v) throw AppError.notFound(`Version ${ref}`);
    return v;
  }

  return {
    async list(user: SessionUser, query: GuideListQuery): Promise<GuideListItem[]> {
      return repo.list(db, user.organisationId, { readerView: !isAuthor(user), userId: user.id, ...query });
    },

    async get(user: SessionUser, id: number): Promise<GuideDetail> {
      return reload(db, user, id);
    },

    async create(user: SessionUser, input: GuideCreateInput): Promise<GuideDetail> {
      await checkTags(user.organisationId, input.tags, 'tags');
      return db.transaction(async (trx) => {
        const { content } = await prepareContent(trx, user.organisationId, input.content ?? starterContent(input.symptom), 'save');
        const ctx = await validationContext(trx, user.organisationId);
        return createGuide(trx, user, versionFields(input, content, ctx), 'created');
      });
    },

    async saveDraft(user: SessionUser, id: number, input: GuideSaveInput): Promise<GuideDetail> {
      return db.transaction(async (trx) => {
        const g = await mustFind(trx, user, id, true);
        await checkLock(trx, user, g, input.baseLockVersion);
        const draft = await repo.versionById(trx, g.draft_version_id);
        if (draft?.state === 'in_review') {
          throw AppError.conflict(`Version ${draft.number} is waiting for review; withdraw it from review first to edit it.`);
        }
        await checkTags(user.organisationId, input.meta.tags, 'meta.tags');
        const { content } = await prepareContent(trx, user.organisationId, input.content, 'save');
        const fields = versionFields(input.meta, content, await validationContext(trx, user.organisationId));
        if (draft) {
          await repo.updateVersion(trx, draft.id, { ...fields, updated_by: user.id });
          await bump(trx, g);
        } else {
          // The published version stays as it is; the edit becomes the next version.
          const number = await repo.nextVersionNumber(trx, g.id);
          const versionId = await repo.insertVersion(trx, { ...fields, guide_id: g.id, number, created_by: user.id, updated_by: user.id });
          await bump(trx, g, { draft_version_id: versionId });
          await repo.event(trx, g.id, 'draft_started', user.id, number);
        }
        return reload(trx, user, id);
      });
    },

    async startDraft(user: SessionUser, id: number): Promise<GuideDetail> {
      return db.transaction(async (trx) => {
        const g = await mustFind(trx, user, id, true);
        const existing = await repo.versionById(trx, g.draft_version_id);
        if (existing) throw AppError.conflict(`This guide already has a draft (version ${existing.number}); open it instead.`);
        const published = await repo.versionById(trx, g.published_version_id);
        if (!published) throw AppError.conflict('This guide has no published version to start a draft from.');
        const ctx = await validationContext(trx, user.organisationId);
        const fields = versionFields(published, published.content, ctx);
        const number = await repo.nextVersionNumber(trx, g.id);
        const versionId = await repo.insertVersion(trx, { ...fields, guide_id: g.id, number, created_by: user.id, updated_by: user.id });
        await bump(trx, g, { draft_version_id: versionId });
        await repo.event(trx, g.id, 'draft_started', user.id, number, `From version ${published.number}`);
        return reload(trx, user, id);
      });
    },

    async discardDraft(user: SessionUser, id: number, baseLockVersion?: number): Promise<GuideDetail> {
      return db.transaction(async (trx) => {
        const g = await mustFind(trx, user, id, true);
        await checkLock(trx, user, g, baseLockVersion);
        const draft = await mustHaveDraft(trx, g, 'draft', 'discard');
        if (!g.published_version_id) {
          throw AppError.conflict('This guide has never been published, so there is no version to go back to. Retire the guide instead.');
        }
        await bump(trx, g, { draft_version_id: null });
        await repo.deleteDraftVersion(trx, draft.id);
        await repo.event(trx, g.id, 'draft_discarded', user.id, draft.number);
        return reload(trx, user, id);
      });
    },

    async submit(user: SessionUser, id: number, baseLockVersion?: number): Promise<GuideDetail> {
      return db.transaction(async (trx) => {
        const g = await mustFind(trx, user, id, true);
        await checkLock(trx, user, g, baseLockVersion);
        const draft = await mustHaveDraft(trx, g, 'draft', 'submit');
        const v = await refuseIfBroken(trx, g, draft, 'submitted');
        await repo.updateVersion(trx, draft.id, {
          state: 'in_review',
          submitted_by: user.id,
          submitted_at: trx.fn.now(),
          reviewed_by: null,
          review_comment: null,
          error_count: 0,
          warning_count: v.warnings.length,
        });
        await bump(trx, g);
        await repo.event(trx, g.id, 'submitted', user.id, draft.number);
        return reload(trx, user, id);
      });
    },

    async withdraw(user: SessionUser, id: number, baseLockVersion?: number): Promise<GuideDetail> {
      return db.transaction(async (trx) => {
        const g = await mustFind(trx, user, id, true);
        await checkLock(trx, user, g, baseLockVersion);
        const draft = await mustHaveDraft(trx, g, 'in_review', 'withdraw');
        await repo.updateVersion(trx, draft.id, { state: 'draft' });
        await bump(trx, g);
        await repo.event(trx, g.id, 'withdrawn', user.id, draft.number);
        return reload(trx, user, id);
      });
    },

    async approve(user: SessionUser, id: number, input: GuideApproveInput): Promise<GuideDetail> {
      return db.transaction(async (trx) => {
        const g = await mustFind(trx, user, id, true);
        await checkLock(trx, user, g, input.baseLockVersion);
        const draft = await mustHaveDraft(trx, g, 'in_review', 'approve');
        const settings = await organisationSettings(trx, user.organisationId);
        if (draft.submitted_by === user.id && !settings.allowSelfPublish) {
          throw AppError.forbidden('A different author must approve this guide (your organisation does not allow self-publishing).');
        }
        // Causes, articles or calculators may have changed since it was submitted.
        const v = await refuseIfBroken(trx, g, draft, 'approved');
        if (g.published_version_id) await repo.supersede(trx, g.published_version_id);
        await repo.updateVersion(trx, draft.id, {
          state: 'published',
          published_at: trx.fn.now(),
          reviewed_by: user.id,
          review_comment: input.comment ?? null,
          error_count: 0,
          warning_count: v.warnings.length,
        });
        await bump(trx, g, { published_version_id: draft.id, draft_version_id: null });
        await repo.event(trx, g.id, 'approved', user.id, draft.number, input.comment);
        await audit(trx, {
          organisationId: user.organisationId,
          userId: user.id,
          action: 'guide.approve',
          entityKind: 'guide',
          entityId: g.id,
          before: { publishedVersionId: g.published_version_id },
          after: { title: draft.title, version: draft.number },
        });
        return reload(trx, user, id);
      });
    },

    async requestChanges(user: SessionUser, id: number, comment: string, baseLockVersion?: number): Promise<GuideDetail> {
      return db.transaction(async (trx) => {
        const g = await mustFind(trx, user, id, true);
        await checkLock(trx, user, g, baseLockVersion);
        const draft = await mustHaveDraft(trx, g, 'in_review', 'send back');
        await repo.updateVersion(trx, draft.id, { state: 'draft', reviewed_by: user.id, review_comment: comment });
        await bump(trx, g);
        await repo.event(trx, g.id, 'changes_requested', user.id, draft.number, comment);
        return reload(trx, user, id);
      });
    },

    async retire(user: SessionUser, id: number): Promise<GuideDetail> {
      return db.transaction(async (trx) => {
        const g = await mustFind(trx, user, id, true);
        if (g.status === 'retired') throw AppError.conflict('This guide is already retired.');
        await repo.updateGuide(trx, g.id, { status: 'retired', retired_at: trx.fn.now() });
        await repo.event(trx, g.id, 'retired', user.id, null);
        await audit(trx, {
          organisationId: user.organisationId,
          userId: user.id,
          action: 'guide.retire',
          entityKind: 'guide',
          entityId: g.id,
          before: { status: g.status },
          after: { status: 'retired' },
        });
        return reload(trx, user, id);
      });
    },

    async restore(user: SessionUser, id: number): Promise<GuideDetail> {
      return db.transaction(async (trx) => {
        const g = await mustFind(trx, user, id, true);
        if (g.status !== 'retired') throw AppError.conflict('This guide is not retired.');
        await repo.updateGuide(trx, g.id, { status: 'active', retired_at: null });
        await repo.event(trx, g.id, 'restored', user.id, null);
        await audit(trx, {
          organisationId: user.organisationId,
          userId: user.id,
          action: 'guide.restore',
          entityKind: 'guide',
          entityId: g.id,
          before: { status: g.status },
          after: { status: 'active' },
        });
        return reload(trx, user, id);
      });
    },

    async version(user: SessionUser, id: number, number: number): Promise<GuideVersionView> {
      const g = await mustFind(db, user, id);
      return toVersion(await resolve(db, g, number));
    },

    async compare(user: SessionUser, id: number, from: VersionRef, to: VersionRef): Promise<GuideComparison> {
      const g = await mustFind(db, user, id);
      return compareVersions(await resolve(db, g, from), await resolve(db, g, to));
    },

    async exportFile(user: SessionUser, id: number, ref?: VersionRef): Promise<{ file: GuideFile; filename: string }> {
      const g = await mustFind(db, user, id);
      const v = await resolve(db, g, ref ?? (g.published_version_id ? 'published' : 'draft'));
      const causes = causesUsedBy(v.content as GuideContent, await deps.causes.list(user.organisationId, { includeInactive: true }));
      // A receiving server rebuilds html from doc and never trusts it, so the file leaves it out:
      // then a file read and written again is the same whether or not it carried html.
      const content = { ...v.content, steps: v.content.steps.map((step) => (step.body ? { ...step, body: { doc: step.body.doc } } : step)) };
      const file = exportGuideFile({
        guide: {
          title: v.title,
          symptom: v.symptom,
          ...(v.summary ? { summary: v.summary } : {}),
          tags: v.tags,
          ...(causes.length ? { causes } : {}),
        },
        content: content as GuideContent,
        exportedAt: new Date(),
      });
      // Exports leave the building, so who took which version out is worth keeping.
      await audit(db, { organisationId: user.organisationId, userId: user.id, action: 'guide.export', entityKind: 'guide', entityId: g.id, after: { title: v.title, version: v.number } });
      return { file, filename: `${slugify(v.title) || 'guide'}.beadpath-guide.json` };
    },

    async importFile(user: SessionUser, json: unknown): Promise<GuideImportResult> {
      const causeCodes = await deps.causes.activeCodes(user.organisationId);
      const parsed = parseGuideFile(json, { causeCodes, calculators: CALCULATORS });
      if (!parsed.ok) throw problemsError('The guide file cannot be imported', parsed.problems);
      const { file } = parsed;
      const activeTags = await deps.tags.activeSlugs(user.organisationId);
      const tags = file.guide.tags.filter((t) => activeTags.has(t));
      const droppedTags = file.guide.tags.filter((t) => !activeTags.has(t));
      return db.transaction(async (trx) => {
        const causesAdded = await deps.causes.addMissing(trx, user.organisationId, file.guide.causes ?? []);
        const { content, dropped } = await prepareContent(trx, user.organisationId, file.content, 'import');
        const meta = { title: file.guide.title, symptom: file.guide.symptom, summary: file.guide.summary ?? '', tags };
        const fields = versionFields(meta, content, await validationContext(trx, user.organisationId));
        const guide = await createGuide(trx, user, fields, 'imported', `From a file exported at ${file.exportedAt}`);
        await audit(trx, {
          organisationId: user.organisationId,
          userId: user.id,
          action: 'guide.import',
          entityKind: 'guide',
          entityId: guide.id,
          after: { title: meta.title, causesAdded: causesAdded.length, exportedAt: file.exportedAt },
        });
        return { guide, dropped: { ...dropped, tags: droppedTags }, causesAdded };
      });
    },
  };
}
export type GuidesService = ReturnType<typeof createGuidesService>;
