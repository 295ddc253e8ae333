// Walks: start on a guide's published version, take each log entry once after checking it against
// the pinned version, notes, abandon, flags, the record and its summary, and a cheap poll tag.
import type { Knex } from 'knex';
import { GuideContent } from '../../../src/shared/guides/schema';
import { can } from '../../../src/shared/permissions';
import type { SessionUser } from '../../../src/shared/schemas/auth';
import {
  NOTE_WINDOW_MS,
  WALK_INPUT_LIMITS,
  type AbandonInput,
  type AnswerResult,
  type BatchApplied,
  type BatchResult,
  type FlagInput,
  type NoteInput,
  type NoteResult,
  type StartWalkInput,
  type WalkAnswerRecord,
  type WalkDetail,
  type WalkFileView,
  type WalkFlagView,
  type WalkListItem,
  type WalkListQuery,
  type WalkMeta,
  type WalkNoteView,
  type WalkSummary,
} from '../../../src/shared/schemas/walks';
import { DEFAULT_CAUSES } from '../../../src/shared/tags';
import { WalkAnswer } from '../../../src/shared/walks/answers';
import { canAnswer, replayPath, type WalkProblem, type WalkState } from '../../../src/shared/walks/walk-path';
import type { ErrorCode } from '../../../src/shared/errors';
import { AppError } from '../../lib/app-error';
import { zodFields } from '../../lib/validate';
import type { FilesService } from '../files/files.service';
import { walksRepository as repo, walkMeta, type NoteRecord, type VersionRecord, type WalkPatch, type WalkRecord } from './walks.repository';
import { buildSummary } from './walks.summary';

/** Reads-then-writes of one answer tried without a lock before taking one. */
const OPTIMISTIC_TRIES = 3;

/** The walk moved between reading it and storing an answer checked against it; nothing was written. */
class WalkMoved extends Error {}

/** A start with a client id repeated within this window returns the walk the first one made. */
export const START_RETRY_WINDOW_S = 15 * 60;

// Refusals that depend on where the walk stands rather than on the entry itself: the client's
// copy is behind or ahead, so it should reload the walk rather than fix a field.
const CONFLICT_REASONS = new Set(['answer-id-reused', 'not-on-path', 'already-answered', 'not-current', 'walk-ended', 'cautions-unacknowledged', 'walk-closed']);

interface Refusal {
  code: ErrorCode;
  message: string;
  reason: string;
  stepId?: string;
  /** Field paths relative to the entry (`unit`, `calculatorInputs.measuredAt`). */
  fields?: Record<string, string>;
  extra?: Record<string, unknown>;
}

type Applied = { ok: true; duplicate: boolean; state: WalkState } | ({ ok: false } & Refusal);

interface AnswerContext {
  walk: WalkRecord;
  /** The steps of the pinned guide version. */
  content: GuideContent;
  /** The stored log, as entries only (receipt data stripped so retries compare equal). */
  log: WalkAnswer[];
  lastSeq: number;
  causeCodes?: string[];
}

function entryOf(record: WalkAnswerRecord): WalkAnswer {
  const { seq: _seq, receivedAt: _received, ...entry } = record;
  return entry as WalkAnswer;
}

function problemRefusal(problem: WalkProblem, state?: WalkState): Refusal {
  const fields: Record<string, string> = { ...(problem.fields ?? {}) };
  if (problem.field && !fields[problem.field]) fields[problem.field] = problem.message;
  return {
    code: CONFLICT_REASONS.has(problem.code) ? 'conflict' : 'invalid_input',
    message: problem.message,
    reason: problem.code,
    stepId: problem.stepId,
    fields: Object.keys(fields).length ? fields : undefined,
    extra: problem.code === 'cautions-unacknowledged' && state ? { unacknowledged: state.unacknowledged } : undefined,
  };
}

function prefixed(fields: Record<string, string> | undefined, prefix: string): Record<string, string> | undefined {
  if (!fields) return undefined;
  return Object.fromEntries(Object.entries(fields).map(([key, message]) => [`${prefix}${key}`, message]));
}

function refusalError(r: Refusal): AppError {
  return new AppError(r.code, r.message, r.fields, { reason: r.reason, ...(r.stepId ? { stepId: r.stepId } : {}), ...(r.extra ?? {}) });
}

function sameNote(note: NoteRecord, input: NoteInput): boolean {
  const sorted = (ids: string[]) =>
    [...ids]
      .map((id) => id.toLowerCase())
      .sort()
      .join(',');
  return note.stepId === input.stepId && note.text === input.text && sorted(note.fileIds) === sorted(input.fileIds);
}

export function createWalksService(deps: { db: Knex; files: FilesService }) {
  const { db } = deps;

  async function mustFind(trx: Knex, user: SessionUser, id: number, lock = false): Promise<WalkRecord> {
    const walk = await repo.find(trx, user.organisationId, id, { lock });
    if (!walk) throw AppError.notFound('This walk');
    return walk;
  }

  function mustOwn(user: SessionUser, walk: WalkRecord, action: string) {
    if (walk.userId !== user.id) {
      throw AppError.forbidden(`Only the technician who started this walk can ${action}; colleagues can follow it from its link.`);
    }
  }

  async function pinned(trx: Knex, walk: WalkRecord): Promise<VersionRecord> {
    const version = await repo.version(trx, walk.guideVersionId);
    // The foreign key makes this unreachable; the message is for a database edited by hand.
    if (!version) throw AppError.conflict('The guide version this walk was started on no longer exists');
    return version;
  }

  function notesOpen(walk: { status: string; endedAt: Date | null }, now = Date.now()): boolean {
    if (walk.status === 'open') return true;
    return walk.endedAt !== null && now - walk.endedAt.getTime() < NOTE_WINDOW_MS;
  }

  async function causes(trx: Knex, organisationId: number) {
    const own = await repo.causes(trx, organisationId);
    // An organisation that never edited its list works from the defaults, as the causes editor shows.
    const list = own.length ? own : DEFAULT_CAUSES.map((c) => ({ code: c.code, label: c.label, active: true }));
    const labels = new Map(DEFAULT_CAUSES.map((c) => [c.code, c.label]));
    for (const c of own) labels.set(c.code, c.label);
    return { activeCodes: list.filter((c) => c.active).map((c) => c.code), label: (code: string) => labels.get(code) ?? code };
  }

  async function filesById(organisationId: number, notes: NoteRecord[]): Promise<Map<string, WalkFileView>> {
    const ids = [...new Set(notes.flatMap((n) => n.fileIds))];
    const found = await deps.files.describe(organisationId, ids);
    return new Map(found.map((f) => [f.id.toLowerCase(), { id: f.id, kind: f.kind, urls: f.urls, originalName: f.originalName }]));
  }

  function noteView(note: NoteRecord, files: Map<string, WalkFileView>): WalkNoteView {
    return {
      id: note.id,
      clientId: note.clientId,
      stepId: note.stepId,
      text: note.text,
      fileIds: note.fileIds,
      files: note.fileIds.map((id) => files.get(id.toLowerCase())).filter((f): f is WalkFileView => f !== undefined),
      userName: note.userName,
      createdAt: note.createdAt,
    };
  }

  async function detail(trx: Knex, user: SessionUser, walk: WalkRecord): Promise<WalkDetail> {
    const version = await pinned(trx, walk);
    const answers = await repo.answers(trx, walk.id);
    const notes = await repo.notes(trx, walk.id);
    const flags: WalkFlagView[] = await repo.flags(trx, walk);
    const files = await filesById(user.organisationId, notes);
    const forCase = await trx('case_walks').where({ walk_id: walk.id }).first('case_id');
    const owner = walk.userId === user.id;
    return {
      ...walkMeta(walk),
      guide: {
        id: walk.guideId,
        versionId: version.id,
        versionNumber: version.number,
        title: version.title,
        symptom: version.symptom,
        summary: version.summary,
        tags: version.tags,
        guideStatus: version.guideStatus,
        content: version.content,
      },
      answers,
      state: replayPath(version.content, answers.map(entryOf)),
      notes: notes.map((n) => noteView(n, files)),
      flags,
      canAnswer: owner && walk.status === 'open' && can(user.roles, 'walks:run'),
      canAddNotes: owner && can(user.roles, 'walks:run') && notesOpen({ status: walk.status, endedAt: walk.endedAtDate }),
      caseId: forCase ? Number(forCase.case_id) : null,
    };
  }

  // A published version's steps never change afterwards (only its state moves on to superseded),
  // and walks only pin published versions, so answers are checked against a copy kept in memory.
  const contentCache = new Map<number, GuideContent>();
  const CONTENT_CACHE_SIZE = 500;

  async function pinnedContent(trx: Knex, walk: WalkRecord): Promise<GuideContent> {
    const cached = contentCache.get(walk.guideVersionId);
    if (cached) return cached;
    const found = await repo.versionContent(trx, walk.guideVersionId);
    // The foreign key makes this unreachable; the message is for a database edited by hand.
    if (!found) throw AppError.conflict('The guide version this walk was started on no longer exists');
    if (found.state === 'published' || found.state === 'superseded') {
      if (contentCache.size >= CONTENT_CACHE_SIZE) contentCache.delete(contentCache.keys().next().value!);
      contentCache.set(walk.guideVersionId, found.content);
    }
    return found.content;
  }

  /**
   * The walk (locked for the caller's transaction with `lock`), its log and its pinned steps: one
   * round trip when the cache holds the steps.
   */
  async function answerContext(trx: Knex, user: SessionUser, walkId: number, lock: boolean): Promise<AnswerContext> {
    const found = await repo.findWithLog(trx, user.organisationId, walkId, { lock });
    if (!found) throw AppError.notFound('This walk');
    const { walk } = found;
    mustOwn(user, walk, 'answer it');
    const content = await pinnedContent(trx, walk);
    // The log missed an answer committed while the lock was waited for: read it again, now under the lock.
    const logged = found.log ?? (await repo.answers(trx, walk.id)).map((r) => ({ seq: r.seq, entry: entryOf(r) }));
    return { walk, content, log: logged.map((l) => l.entry), lastSeq: logged.length ? logged[logged.length - 1].seq : 0 };
  }

  function endPatch(ctx: AnswerContext, state: WalkState): WalkPatch {
    const patch: WalkPatch = { currentStepId: state.at, answerCount: ctx.walk.answerCount + 1 };
    const end = { status: 'ended' as const, endedAtStepId: state.at, ended: true };
    if (state.ended === 'handoff') return { ...patch, ...end, endKind: 'handoff' };
    if (state.ended === 'fixed-by-try') return { ...patch, ...end, endKind: 'fixed-by-try', outcome: 'fixed' };
    if (state.ended === 'finding' && state.outcome) {
      const finding = ctx.content.steps.find((s) => s.id === state.at);
      const outcome = state.outcome;
      // The finding's cause is confirmed only when its remedy fixed the fault; 'not fixed' leaves it open.
      const causeCode = outcome.outcome === 'fixed-by-other' ? (outcome.causeCode ?? null) : outcome.outcome === 'fixed' && finding?.kind === 'finding' ? finding.causeCode : null;
      return { ...patch, ...end, endKind: 'finding', outcome: outcome.outcome, causeCode, outcomeNote: outcome.note?.trim() || null };
    }
    return patch;
  }

  /** Checks one entry against the walk and stores it unless it is a retry; never throws a refusal. */
  async function applyEntry(trx: Knex, user: SessionUser, ctx: AnswerContext, entry: WalkAnswer): Promise<Applied> {
    const known = ctx.log.some((e) => e.id === entry.id);
    // A retry of an entry that ended the walk must still be accepted as a duplicate, so the status
    // is only checked for entries not stored yet.
    if (!known && ctx.walk.status !== 'open') {
      return {
        ok: false,
        code: 'conflict',
        reason: 'walk-closed',
        message: ctx.walk.status === 'ended' ? 'This walk has ended; it takes no more answers' : 'This walk was abandoned; it takes no more answers',
        stepId: entry.stepId,
      };
    }
    if (!known && entry.kind === 'finding-outcome' && entry.causeCode && !ctx.causeCodes) {
      ctx.causeCodes = (await causes(trx, user.organisationId)).activeCodes;
    }
    const result = canAnswer(ctx.content, ctx.log, entry, { causeCodes: ctx.causeCodes });
    if (!result.ok) {
      const { ok: _ok, ...problem } = result;
      const refusal = problemRefusal(problem, problem.code === 'cautions-unacknowledged' ? replayPath(ctx.content, ctx.log) : undefined);
      return { ok: false, ...refusal };
    }
    if (result.duplicate) return { ok: true, duplicate: true, state: result.state };

    const seq = ctx.lastSeq + 1;
    // The answer and the walk's new place go in one statement, which hands back the walk as stored,
    // and writes nothing if the walk moved since it was read (the answer was checked against that).
    const stored = await repo.appendAnswer(trx, ctx.walk, seq, entry, endPatch(ctx, result.state));
    if (!stored) throw new WalkMoved();
    ctx.walk = stored;
    ctx.lastSeq = seq;
    ctx.log.push(entry);
    return { ok: true, duplicate: false, state: result.state };
  }

  async function freshMeta(trx: Knex, user: SessionUser, id: number): Promise<WalkMeta> {
    return walkMeta(await mustFind(trx, user, id));
  }

  return {
    async start(user: SessionUser, input: StartWalkInput): Promise<{ walk: WalkDetail; created: boolean }> {
      return db.transaction(async (trx) => {
        const guide = await repo.guideForStart(trx, user.organisationId, input.guideId);
        if (!guide) throw new AppError('not_found', 'This guide was not found', { guideId: 'No such guide in your organisation' });
        if (guide.status === 'retired') {
          throw AppError.conflict('This guide is retired and starts no new walks; look for the guide that replaced it', { guideId: 'This guide is retired' });
        }
        const version = guide.publishedVersionId ? await repo.version(trx, guide.publishedVersionId) : undefined;
        if (!version || version.state !== 'published') {
          throw new AppError('not_found', 'This guide has no published version yet, so it cannot be walked', { guideId: 'This guide is not published yet' });
        }
        const content = GuideContent.safeParse(version.content);
        if (!content.success || !content.data.steps.some((s) => s.id === content.data.startStepId)) {
          throw AppError.conflict("The published version of this guide cannot be walked; tell the guide's authors", { guideId: 'The published version is damaged' });
        }
        let place = { site: input.site, line: input.line, applicator: input.applicator, applicatorId: input.applicatorId };
        if (input.applicatorId !== null) {
          const registered = await repo.applicatorPlace(trx, user.organisationId, input.applicatorId);
          if (!registered) throw AppError.invalid('This applicator was not found in your organisation', { applicatorId: 'No such applicator in your organisation' });
          // The record's words win over typed ones, so reports group the walk with its applicator.
          place = { ...registered, applicatorId: input.applicatorId };
        }
        if (input.clientId) {
          await repo.lockUserStarts(trx, user.id);
          const again = await repo.recentEmptyWalk(trx, { organisationId: user.organisationId, userId: user.id, guideVersionId: version.id, ...place }, START_RETRY_WINDOW_S);
          if (again) return { walk: await detail(trx, user, await mustFind(trx, user, again)), created: false };
        }
        const id = await repo.insert(trx, {
          organisationId: user.organisationId,
          guideId: guide.id,
          guideVersionId: version.id,
          userId: user.id,
          ...place,
          currentStepId: content.data.startStepId,
        });
        return { walk: await detail(trx, user, await mustFind(trx, user, id)), created: true };
      });
    },

    async list(user: SessionUser, query: WalkListQuery): Promise<WalkListItem[]> {
      // Without an explicit choice, people who cannot see colleagues' walks get their own.
      const mine = query.mine === undefined ? !can(user.roles, 'walks:view-others') : query.mine === '1';
      if (mine && !can(user.roles, 'walks:run')) throw AppError.forbidden('Your roles do not include running walks, so you have no walks of your own');
      if (!mine && !can(user.roles, 'walks:view-others')) throw AppError.forbidden("Your roles do not allow listing colleagues' walks; use mine=1");
      return db.transaction(
        async (trx) => {
          const walks = await repo.list(trx, user.organisationId, {
            userId: mine ? user.id : undefined,
            status: query.status,
            guideId: query.guideId,
            limit: WALK_INPUT_LIMITS.listLimit,
          });
          const versions = await repo.versionsById(trx, [...new Set(walks.map((w) => w.guideVersionId))]);
          const logs = await repo.answersOf(
            trx,
            walks.map((w) => w.id),
          );
          return walks.map((w): WalkListItem => {
            const version = versions.get(w.guideVersionId)!;
            const state = replayPath(version.content, logs.get(w.id) ?? []);
            const at = state.at ?? w.currentStepId;
            return {
              ...walkMeta(w),
              guideTitle: version.title,
              symptom: version.symptom,
              versionNumber: version.number,
              currentStepTitle: version.content.steps.find((s) => s.id === at)?.title ?? null,
              pathLength: state.path.length,
              stepCount: version.content.steps.length,
            };
          });
        },
        { isolationLevel: 'repeatable read', readOnly: true },
      );
    },

    /**
     * The poll tag of a walk's detail as this viewer sees it: changes whenever anything in the
     * detail may have changed (answers, status, notes, flags, the viewer's rights), at the cost of
     * one indexed query.
     */
    async detailTag(user: SessionUser, id: number): Promise<string> {
      const v = await repo.pollVersion(db, user.organisationId, id);
      if (!v) throw AppError.notFound('This walk');
      const owner = v.userId === user.id && can(user.roles, 'walks:run');
      const rights = `${owner && v.status === 'open' ? 1 : 0}${owner && notesOpen(v) ? 1 : 0}`;
      return `W/"walk-${id}-${v.answerCount}-${v.status}-${v.updatedAt.getTime()}-${v.notes}-${v.flags}-${v.resolvedFlags}-u${user.id}-${rights}"`;
    },

    async get(user: SessionUser, id: number): Promise<WalkDetail> {
      return db.transaction(async (trx) => detail(trx, user, await mustFind(trx, user, id)), { isolationLevel: 'repeatable read', readOnly: true });
    },

    /**
     * One answer in two round trips and no open transaction: read the walk and its log, check the
     * entry, then store it with a statement that writes only if the walk has not moved since (its
     * answer count and status), committed on its own. If another answer got in between, the walk
     * is read again; a walk that keeps moving is answered under a row lock instead.
     */
    async answer(user: SessionUser, walkId: number, entry: WalkAnswer): Promise<AnswerResult> {
      const attempt = async (trx: Knex, lock: boolean): Promise<AnswerResult> => {
        const ctx = await answerContext(trx, user, walkId, lock);
        const applied = await applyEntry(trx, user, ctx, entry);
        if (!applied.ok) throw refusalError(applied);
        // The row read, or the row the answer's own statement returned, is the walk as it now stands.
        return { duplicate: applied.duplicate, state: applied.state, walk: walkMeta(ctx.walk) };
      };
      for (let tries = 0; tries < OPTIMISTIC_TRIES; tries++) {
        try {
          return await attempt(db, false);
        } catch (err) {
          if (!(err instanceof WalkMoved)) throw err;
        }
      }
      return db.transaction((trx) => attempt(trx, true));
    },

    /**
     * Applies queued entries in order. Each is idempotent; the first refused one stops the batch
     * and the ones before it stay stored, so the device can drop them from its queue.
     */
    async answerBatch(user: SessionUser, walkId: number, entries: unknown[]): Promise<BatchResult> {
      const outcome = await db.transaction(async (trx) => {
        const ctx = await answerContext(trx, user, walkId, true);
        const applied: BatchApplied[] = [];
        let rejected: { index: number; id: string | null; refusal: Refusal } | undefined;
        for (const [index, raw] of entries.entries()) {
          const rawId = raw && typeof raw === 'object' && typeof (raw as { id?: unknown }).id === 'string' ? (raw as { id: string }).id : null;
          const parsed = WalkAnswer.safeParse(raw);
          if (!parsed.success) {
            const fields = zodFields(parsed.error);
            const first = Object.values(fields)[0] ?? 'This answer is not valid';
            rejected = { index, id: rawId, refusal: { code: 'invalid_input', message: first, reason: 'invalid-entry', fields } };
            break;
          }
          const result = await applyEntry(trx, user, ctx, parsed.data);
          if (!result.ok) {
            const { ok: _ok, ...refusal } = result;
            rejected = { index, id: parsed.data.id, refusal };
            break;
          }
          applied.push({ index, id: parsed.data.id, duplicate: result.duplicate });
        }
        return { applied, rejected, state: replayPath(ctx.content, ctx.log), walk: walkMeta(ctx.walk) };
      });
      const { applied, rejected, state, walk } = outcome;
      if (rejected) {
        const r = rejected.refusal;
        throw new AppError(r.code, `Answer ${rejected.index + 1} of ${entries.length} was refused: ${r.message}`, prefixed(r.fields, `answers.${rejected.index}.`), {
          index: rejected.index,
          id: rejected.id,
          reason: r.reason,
          ...(r.stepId ? { stepId: r.stepId } : {}),
          ...(r.extra ?? {}),
          applied,
          state,
          walk,
        });
      }
      return { applied, state, walk };
    },

    async addNote(user: SessionUser, walkId: number, input: NoteInput): Promise<NoteResult> {
      return db.transaction(async (trx) => {
        const walk = await mustFind(trx, user, walkId, true);
        mustOwn(user, walk, 'add notes to it');
        const existing = await repo.noteByClientId(trx, walk.id, input.clientId);
        if (existing) {
          if (!sameNote(existing, input)) {
            throw AppError.conflict(`Note id '${input.clientId}' was already used for a different note`, { clientId: 'This note id was already used for a different note' });
          }
          return { duplicate: true, note: noteView(existing, await filesById(user.organisationId, [existing])) };
        }
        if (!notesOpen({ status: walk.status, endedAt: walk.endedAtDate })) {
          throw AppError.conflict('Notes can be added while the walk is open and for a day after it ends');
        }
        const version = await pinned(trx, walk);
        if (!version.content.steps.some((s) => s.id === input.stepId)) {
          throw AppError.invalid(`The guide has no step '${input.stepId}'`, { stepId: `The guide has no step '${input.stepId}'` });
        }
        const found = await repo.existingFileIds(trx, user.organisationId, input.fileIds);
        const missing = input.fileIds.filter((id) => !found.has(id));
        if (missing.length) {
          throw AppError.invalid(`${missing.length === 1 ? 'A photo was' : `${missing.length} photos were`} not found; upload again`, {
            fileIds: `Not found: ${missing.join(', ')}`,
          });
        }
        await repo.insertNote(trx, { walkId: walk.id, clientId: input.clientId, stepId: input.stepId, text: input.text, fileIds: input.fileIds, userId: user.id });
        await repo.update(trx, walk.id, {});
        const note = (await repo.noteByClientId(trx, walk.id, input.clientId))!;
        return { duplicate: false, note: noteView(note, await filesById(user.organisationId, [note])) };
      });
    },

    async abandon(user: SessionUser, walkId: number, input: AbandonInput): Promise<WalkMeta> {
      return db.transaction(async (trx) => {
        const walk = await mustFind(trx, user, walkId, true);
        mustOwn(user, walk, 'abandon it');
        // A repeated abandon (a retry from the device) finds the walk already in the state it asked for.
        if (walk.status === 'abandoned') return walkMeta(walk);
        if (walk.status === 'ended') throw AppError.conflict('This walk has already ended; it cannot be abandoned');
        await repo.update(trx, walk.id, {
          status: 'abandoned',
          endKind: 'abandoned',
          endedAtStepId: walk.currentStepId,
          outcomeNote: input.reason || null,
          ended: true,
        });
        return freshMeta(trx, user, walk.id);
      });
    },

    async flag(user: SessionUser, walkId: number, input: FlagInput): Promise<WalkFlagView> {
      return db.transaction(async (trx) => {
        const walk = await mustFind(trx, user, walkId);
        const version = await pinned(trx, walk);
        if (!version.content.steps.some((s) => s.id === input.stepId)) {
          throw AppError.invalid(`The guide has no step '${input.stepId}'`, { stepId: `The guide has no step '${input.stepId}'` });
        }
        const id = await repo.insertFlag(trx, {
          organisationId: user.organisationId,
          guideId: walk.guideId,
          guideVersionId: walk.guideVersionId,
          stepId: input.stepId,
          walkId: walk.id,
          userId: user.id,
          comment: input.comment,
        });
        return (await repo.flags(trx, walk)).find((f) => f.id === id)!;
      });
    },

    async summary(user: SessionUser, id: number): Promise<WalkSummary> {
      return db.transaction(
        async (trx) => {
          const walk = await mustFind(trx, user, id);
          const version = await pinned(trx, walk);
          const log = (await repo.answers(trx, walk.id)).map(entryOf);
          const notes = await repo.notes(trx, walk.id);
          const { label } = await causes(trx, user.organisationId);
          return buildSummary({ walk, guide: version, log, state: replayPath(version.content, log), notes, causeLabel: label });
        },
        { isolationLevel: 'repeatable read', readOnly: true },
      );
    },
  };
}
export type WalksService = ReturnType<typeof createWalksService>;
