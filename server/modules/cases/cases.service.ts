// Cases: log a call, edit it, notes with attachments, status changes, walks run with the caller,
// hand-off to an author or senior technician (e-mail and in-app notice), and the caller's summary.
// Every change and the messages it causes are written in one transaction.
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import { can, type Role } from '../../../src/shared/permissions';
import type { SessionUser } from '../../../src/shared/schemas/auth';
import {
  CASE_STATUS_LABELS,
  CASE_TRANSITIONS,
  type CaseApplicatorView,
  type CaseDetail,
  type CaseEvent,
  type CaseEventKind,
  type CaseHandoffInput,
  type CaseInput,
  type CaseList,
  type CaseListQuery,
  type CaseNoteInput,
  type CasePatchInput,
  type CasePerson,
  type CaseStatus,
  type CaseStatusInput,
  type CaseSummaryInput,
  type CaseWalkView,
  type NoticeView,
  type SummaryPreview,
} from '../../../src/shared/schemas/cases';
import type { Config } from '../../config/env';
import { AppError } from '../../lib/app-error';
import type { FilesService } from '../files/files.service';
import type { MailService } from '../mail/mail.service';
import { linkOrigin } from '../mail/origin';
import { createWalksService } from '../walks/walks.service';
import { handoffNotice, summaryMail, type WalkRecordForMail } from './cases.messages';
import { casesRepository as repo, listItem, type CaseRecord, type EventRow, type LinkedWalkRow } from './cases.repository';

export interface CasesServiceDeps {
  db: Knex;
  config: Config;
  logger: Logger;
  files: FilesService;
  mail: MailService;
}

const HANDOFF_ROLES: readonly Role[] = ['author', 'technician'];
const ASSIGNABLE_ROLES: readonly Role[] = ['support', 'author', 'technician'];

const FIELD_LABELS: Record<string, string> = {
  callerName: "caller's name",
  callerCompany: 'company',
  callerPhone: 'phone',
  callerEmail: 'e-mail',
  site: 'site',
  line: 'line',
  applicator: 'valve',
  applicatorId: 'registered valve',
  symptom: 'what they see',
  priority: 'priority',
};

const COLUMNS: Record<string, string> = {
  callerName: 'caller_name',
  callerCompany: 'caller_company',
  callerPhone: 'caller_phone',
  callerEmail: 'caller_email',
  site: 'site',
  line: 'line',
  applicator: 'applicator',
  applicatorId: 'applicator_id',
  symptom: 'symptom',
  priority: 'priority',
};

export function createCasesService(deps: CasesServiceDeps) {
  const { db, mail } = deps;
  const walks = createWalksService({ db, files: deps.files });
  let applicatorsTable: Promise<boolean> | null = null;

  const canWork = (user: SessionUser) => can(user.roles, 'cases:work');
  const isAssignee = (user: SessionUser, c: CaseRecord) => c.assignee?.id === user.id;

  async function mustFind(trx: Knex, user: SessionUser, id: number, lock = false): Promise<CaseRecord> {
    const c = await repo.find(trx, user, id, { lock });
    if (!c) throw AppError.notFound('This case');
    return c;
  }

  function mustWorkOn(user: SessionUser, c: CaseRecord, what: string) {
    if (!canWork(user) && !isAssignee(user, c)) throw AppError.forbidden(`Only the support desk or the person the case is assigned to can ${what}`);
  }

  /** The registered valve, when the assets tables exist and it belongs to the organisation. */
  async function registeredValve(trx: Knex, organisationId: number, id: number | null): Promise<CaseApplicatorView | null> {
    if (id === null) return null;
    applicatorsTable ??= db.schema.hasTable('applicators');
    if (!(await applicatorsTable)) return null;
    const row = await trx('applicators as ap')
      .leftJoin('sites as s', 's.id', 'ap.site_id')
      .leftJoin('lines as l', 'l.id', 'ap.line_id')
      .where({ 'ap.id': id, 'ap.organisation_id': organisationId })
      .first('ap.id', 'ap.tag', 's.name as site_name', 'l.name as line_name');
    return row ? { id: row.id, tag: row.tag, siteName: row.site_name ?? null, lineName: row.line_name ?? null } : null;
  }

  async function assignable(trx: Knex, organisationId: number, id: number, roles: readonly Role[], field: string, words: string) {
    const person = await repo.person(trx, organisationId, id);
    if (!person || !person.roles.some((r) => roles.includes(r))) {
      throw AppError.invalid(`Pick ${words}`, { [field]: `Pick ${words} who is active in your organisation` });
    }
    return person;
  }

  function walkView(row: LinkedWalkRow): CaseWalkView {
    const at = row.status === 'open' ? row.current_step_id : (row.ended_at_step_id ?? row.current_step_id);
    return {
      id: row.id,
      guideId: row.guide_id,
      guideTitle: row.title,
      symptom: row.symptom,
      status: row.status,
      endKind: row.end_kind,
      outcome: row.outcome,
      stepTitle: row.content?.steps?.find((s) => s.id === at)?.title ?? null,
      startedAt: row.started_at.toISOString(),
      endedAt: row.ended_at?.toISOString() ?? null,
      userId: row.user_id,
      userName: row.user_name,
    };
  }

  async function eventViews(organisationId: number, rows: EventRow[]): Promise<CaseEvent[]> {
    const ids = [...new Set(rows.flatMap((r) => r.file_ids))];
    const files = new Map((await deps.files.describe(organisationId, ids)).map((f) => [f.id.toLowerCase(), { id: f.id, kind: f.kind, urls: f.urls, originalName: f.originalName }]));
    return rows.map((r) => ({
      id: Number(r.id),
      kind: r.kind as CaseEventKind,
      userName: r.user_name,
      text: r.text,
      fromStatus: r.from_status,
      toStatus: r.to_status,
      walk: r.walk_id !== null ? { id: r.walk_id, guideTitle: r.guide_title ?? 'A walk' } : null,
      mail:
        r.mail_message_id !== null && r.mail_to !== null ? { id: r.mail_message_id, to: r.mail_to, subject: r.mail_subject ?? '', status: r.mail_status ?? 'queued', lastError: r.mail_error } : null,
      assignee: r.assignee_id !== null && r.assignee_name !== null ? { id: r.assignee_id, name: r.assignee_name } : null,
      files: r.file_ids.map((id) => files.get(id.toLowerCase())).filter((f): f is NonNullable<typeof f> => f !== undefined),
      createdAt: r.created_at.toISOString(),
    }));
  }

  async function detail(trx: Knex, user: SessionUser, c: CaseRecord): Promise<CaseDetail> {
    // One connection in a transaction: the reads go one after another.
    const events = await repo.events(trx, c.id);
    const linked = await repo.walks(trx, c.id);
    const registered = await registeredValve(trx, user.organisationId, c.applicatorId);
    const mayChange = canWork(user) || isAssignee(user, c);
    return {
      ...listItem(c),
      callerPhone: c.callerPhone,
      callerEmail: c.callerEmail,
      applicatorId: c.applicatorId,
      registered,
      createdBy: c.createdBy,
      handedOffAt: c.handedOffAt,
      resolvedAt: c.resolvedAt,
      closedAt: c.closedAt,
      walks: linked.map(walkView),
      events: await eventViews(user.organisationId, events),
      canWork: canWork(user),
      canNote: mayChange,
      canChangeStatus: mayChange,
      allowedStatuses: mayChange ? [...CASE_TRANSITIONS[c.status]] : [],
    };
  }

  async function fresh(trx: Knex, user: SessionUser, id: number): Promise<CaseDetail> {
    return detail(trx, user, await mustFind(trx, user, id));
  }

  function statusStamps(to: CaseStatus, trx: Knex): Record<string, unknown> {
    if (to === 'resolved') return { status: to, resolved_at: trx.fn.now() };
    if (to === 'closed') return { status: to, closed_at: trx.fn.now() };
    // Reopening clears the stamps, so "resolved at" always means the last time it was resolved.
    return { status: to, resolved_at: null, closed_at: null };
  }

  /** A walk done with the caller: its record as the walks module builds it. */
  async function walkRecord(user: SessionUser, walkId: number): Promise<WalkRecordForMail> {
    const [summary, walkDetail] = await Promise.all([walks.summary(user, walkId), walks.get(user, walkId)]);
    return { summary, detail: walkDetail };
  }

  /** The walk a summary is about: the one asked for, else the last linked one that ended. */
  async function summaryWalk(trx: Knex, c: CaseRecord, walkId: number | null | undefined): Promise<number | null> {
    const linked = await repo.walks(trx, c.id);
    if (walkId) {
      if (!linked.some((w) => w.id === walkId)) throw AppError.invalid('This walk is not linked to the case', { walkId: 'Pick a walk done for this case' });
      return walkId;
    }
    const ended = linked.filter((w) => w.status === 'ended');
    return (ended.at(-1) ?? linked.at(-1))?.id ?? null;
  }

  return {
    async list(user: SessionUser, query: CaseListQuery): Promise<CaseList> {
      return db.transaction(
        async (trx) => {
          const { items, total } = await repo.list(trx, user, query);
          return { cases: items.map(listItem), total, page: query.page, pageSize: query.pageSize, counts: await repo.counts(trx, user) };
        },
        { isolationLevel: 'repeatable read', readOnly: true },
      );
    },

    async people(user: SessionUser): Promise<CasePerson[]> {
      const people = await repo.people(db, user.organisationId);
      return people.map((p) => ({ id: p.id, name: p.name, roles: p.roles, takesHandoffs: p.roles.some((r) => HANDOFF_ROLES.includes(r)) }));
    },

    async get(user: SessionUser, id: number): Promise<CaseDetail> {
      return db.transaction(async (trx) => fresh(trx, user, id), { isolationLevel: 'repeatable read', readOnly: true });
    },

    async create(user: SessionUser, input: CaseInput): Promise<CaseDetail> {
      return db.transaction(async (trx) => {
        const valve = await registeredValve(trx, user.organisationId, input.applicatorId);
        if (input.applicatorId !== null && !valve) {
          throw AppError.invalid('The registered valve was not found', { applicatorId: 'No such valve in your organisation' });
        }
        const assignee = input.assigneeId !== null ? await assignable(trx, user.organisationId, input.assigneeId, ASSIGNABLE_ROLES, 'assigneeId', 'a support, author or technician colleague') : null;
        const id = await repo.insert(trx, {
          organisation_id: user.organisationId,
          caller_name: input.callerName,
          caller_company: input.callerCompany,
          caller_phone: input.callerPhone,
          caller_email: input.callerEmail,
          // The registered valve fills the place words the caller did not give, so lists and filters need no join.
          site: input.site ?? valve?.siteName ?? null,
          line: input.line ?? valve?.lineName ?? null,
          applicator: input.applicator ?? valve?.tag ?? null,
          applicator_id: valve?.id ?? null,
          symptom: input.symptom,
          priority: input.priority,
          status: 'new',
          assignee_id: assignee?.id ?? null,
          created_by: user.id,
        });
        await repo.insertEvent(trx, { caseId: id, kind: 'created', userId: user.id, toStatus: 'new', text: `Call logged: ${input.symptom}` });
        if (assignee) {
          await repo.insertEvent(trx, { caseId: id, kind: 'assigned', userId: user.id, assigneeId: assignee.id });
          if (assignee.id !== user.id) {
            await repo.insertNotice(trx, {
              organisationId: user.organisationId,
              userId: assignee.id,
              caseId: id,
              kind: 'assigned',
              title: `Case ${id} assigned to you by ${user.name}`,
              body: input.symptom,
            });
          }
        }
        return fresh(trx, user, id);
      });
    },

    async update(user: SessionUser, id: number, patch: CasePatchInput): Promise<CaseDetail> {
      return db.transaction(async (trx) => {
        const c = await mustFind(trx, user, id, true);
        const row: Record<string, unknown> = {};
        const changed: string[] = [];
        for (const [key, column] of Object.entries(COLUMNS)) {
          const value = (patch as Record<string, unknown>)[key];
          if (value === undefined) continue;
          const current = (c as unknown as Record<string, unknown>)[key];
          if (value === current) continue;
          row[column] = value;
          changed.push(FIELD_LABELS[key]);
        }
        if (row.applicator_id !== undefined && row.applicator_id !== null) {
          const valve = await registeredValve(trx, user.organisationId, row.applicator_id as number);
          if (!valve) throw AppError.invalid('The registered valve was not found', { applicatorId: 'No such valve in your organisation' });
        }
        const site = patch.site === undefined ? c.site : patch.site;
        const applicatorId = patch.applicatorId === undefined ? c.applicatorId : patch.applicatorId;
        const callerName = patch.callerName === undefined ? c.callerName : patch.callerName;
        const company = patch.callerCompany === undefined ? c.callerCompany : patch.callerCompany;
        if (!site && !applicatorId) throw AppError.invalid('A case needs a site', { site: 'Say which site the call is about, or pick a registered valve' });
        if (!callerName && !company) throw AppError.invalid('A case needs a caller', { callerName: "Give the caller's name or their company" });

        let assignee: { id: number; name: string } | null | undefined;
        if (patch.assigneeId !== undefined && patch.assigneeId !== (c.assignee?.id ?? null)) {
          assignee = patch.assigneeId === null ? null : await assignable(trx, user.organisationId, patch.assigneeId, ASSIGNABLE_ROLES, 'assigneeId', 'a support, author or technician colleague');
          row.assignee_id = assignee?.id ?? null;
        }
        if (!Object.keys(row).length) return detail(trx, user, c);
        await repo.update(trx, c.id, row);
        if (changed.length) await repo.insertEvent(trx, { caseId: c.id, kind: 'edited', userId: user.id, text: `Changed ${changed.join(', ')}` });
        if (assignee !== undefined) {
          await repo.insertEvent(trx, { caseId: c.id, kind: 'assigned', userId: user.id, assigneeId: assignee?.id ?? null, text: assignee ? null : 'Unassigned' });
          if (assignee && assignee.id !== user.id) {
            await repo.insertNotice(trx, {
              organisationId: user.organisationId,
              userId: assignee.id,
              caseId: c.id,
              kind: 'assigned',
              title: `Case ${c.id} assigned to you by ${user.name}`,
              body: c.symptom,
            });
          }
        }
        return fresh(trx, user, c.id);
      });
    },

    async setStatus(user: SessionUser, id: number, input: CaseStatusInput): Promise<CaseDetail> {
      return db.transaction(async (trx) => {
        const c = await mustFind(trx, user, id, true);
        mustWorkOn(user, c, 'change its status');
        if (c.status === input.status) return detail(trx, user, c);
        if (input.status === 'handed-off') {
          throw AppError.invalid('Use Hand off to pass a case to someone', { status: 'A case is handed off with the Hand off action, which names the person' });
        }
        if (!CASE_TRANSITIONS[c.status].includes(input.status)) {
          throw AppError.conflict(`A case that is ${CASE_STATUS_LABELS[c.status].toLowerCase()} cannot become ${CASE_STATUS_LABELS[input.status].toLowerCase()}`, {
            status: 'Not allowed from the current status',
          });
        }
        await repo.update(trx, c.id, statusStamps(input.status, trx));
        await repo.insertEvent(trx, { caseId: c.id, kind: 'status', userId: user.id, fromStatus: c.status, toStatus: input.status, text: input.note });
        return fresh(trx, user, c.id);
      });
    },

    async addNote(user: SessionUser, id: number, input: CaseNoteInput): Promise<CaseDetail> {
      return db.transaction(async (trx) => {
        const c = await mustFind(trx, user, id, true);
        mustWorkOn(user, c, 'add notes');
        const found = await repo.existingFileIds(trx, user.organisationId, input.fileIds);
        const missing = input.fileIds.filter((f) => !found.has(f));
        if (missing.length) {
          throw AppError.invalid(`${missing.length === 1 ? 'An attachment was' : `${missing.length} attachments were`} not found; upload again`, { fileIds: `Not found: ${missing.join(', ')}` });
        }
        await repo.insertEvent(trx, { caseId: c.id, kind: 'note', userId: user.id, text: input.text || null, fileIds: input.fileIds });
        await repo.update(trx, c.id, {});
        return fresh(trx, user, c.id);
      });
    },

    async linkWalk(user: SessionUser, id: number, walkId: number): Promise<CaseDetail> {
      return db.transaction(async (trx) => {
        const c = await mustFind(trx, user, id, true);
        const walk = await repo.walkInOrg(trx, user.organisationId, walkId);
        if (!walk) throw new AppError('not_found', 'This walk was not found', { walkId: 'No such walk in your organisation' });
        const owner = await repo.caseOfWalk(trx, walkId);
        if (owner === c.id) return detail(trx, user, c);
        if (owner !== null) throw AppError.conflict(`This walk already belongs to case ${owner}`, { walkId: `Already linked to case ${owner}` });
        if (c.status === 'closed') throw AppError.conflict('This case is closed; reopen it before walking a guide for it');
        await repo.linkWalk(trx, c.id, walkId, user.id);
        await repo.insertEvent(trx, { caseId: c.id, kind: 'walk', userId: user.id, walkId });
        // Walking a guide with the caller is work on the case.
        if (c.status === 'new' || c.status === 'waiting' || c.status === 'resolved') {
          await repo.update(trx, c.id, statusStamps('in-progress', trx));
          await repo.insertEvent(trx, { caseId: c.id, kind: 'status', userId: user.id, fromStatus: c.status, toStatus: 'in-progress' });
        } else {
          await repo.update(trx, c.id, {});
        }
        return fresh(trx, user, c.id);
      });
    },

    async handoff(user: SessionUser, id: number, input: CaseHandoffInput, requestOrigin?: string): Promise<CaseDetail> {
      // The walk's record is read first, in its own snapshot: it only grows, never changes.
      const walk = input.walkId !== null ? await walkRecord(user, input.walkId) : null;
      const origin = linkOrigin(deps.config, requestOrigin);
      const messageIds: number[] = [];
      const out = await db.transaction(async (trx) => {
        const c = await mustFind(trx, user, id, true);
        if (c.status === 'resolved' || c.status === 'closed') throw AppError.conflict('This case is finished; reopen it before handing it off');
        const person = await assignable(trx, user.organisationId, input.assigneeId, HANDOFF_ROLES, 'assigneeId', 'an author or technician');
        if (input.walkId !== null && (await repo.caseOfWalk(trx, input.walkId)) !== c.id) {
          throw AppError.invalid('This walk is not linked to the case', { walkId: 'Pick a walk done for this case' });
        }
        await repo.update(trx, c.id, { status: 'handed-off', assignee_id: person.id, handed_off_at: trx.fn.now(), resolved_at: null, closed_at: null });
        await repo.insertEvent(trx, { caseId: c.id, kind: 'handoff', userId: user.id, assigneeId: person.id, walkId: input.walkId, text: input.note, fromStatus: c.status, toStatus: 'handed-off' });
        const content = handoffNotice({ organisationName: user.organisationName, assigneeName: person.name, fromName: user.name, kase: c, note: input.note, origin, walk });
        const messageId = await mail.record(trx, {
          organisationId: user.organisationId,
          kind: 'case-handoff',
          to: person.email,
          content,
          caseId: c.id,
          fromName: user.organisationName,
          replyTo: user.email,
        });
        messageIds.push(messageId);
        await repo.insertEvent(trx, { caseId: c.id, kind: 'email', userId: user.id, mailMessageId: messageId, text: `Hand-off notice to ${person.name}` });
        await repo.insertNotice(trx, {
          organisationId: user.organisationId,
          userId: person.id,
          caseId: c.id,
          kind: 'handoff',
          title: `Case ${c.id} handed to you by ${user.name}`,
          body: `${c.symptom}${c.site ? ` at ${c.site}` : ''}. ${input.note}`,
        });
        return fresh(trx, user, c.id);
      });
      mail.dispatch(messageIds);
      return out;
    },

    async summaryPreview(user: SessionUser, id: number, walkId?: number): Promise<SummaryPreview> {
      const { c, chosen } = await db.transaction(
        async (trx) => {
          const kase = await mustFind(trx, user, id);
          return { c: kase, chosen: await summaryWalk(trx, kase, walkId) };
        },
        { isolationLevel: 'repeatable read', readOnly: true },
      );
      const walk = chosen !== null ? await walkRecord(user, chosen) : null;
      const content = summaryMail({ organisationName: user.organisationName, supportName: user.name, kase: c, note: null, walk });
      return { to: c.callerEmail, subject: content.subject, text: content.text, html: content.html, walkId: chosen };
    },

    async sendSummary(user: SessionUser, id: number, input: CaseSummaryInput): Promise<CaseDetail> {
      const first = await db.transaction(async (trx) => {
        const kase = await mustFind(trx, user, id);
        return { kase, chosen: await summaryWalk(trx, kase, input.walkId) };
      });
      const to = input.to ?? first.kase.callerEmail;
      if (!to) throw AppError.invalid('The case has no e-mail for the caller', { to: "Enter the caller's e-mail" });
      const walk = first.chosen !== null ? await walkRecord(user, first.chosen) : null;
      const messageIds: number[] = [];
      const out = await db.transaction(async (trx) => {
        const c = await mustFind(trx, user, id, true);
        const content = summaryMail({ organisationName: user.organisationName, supportName: user.name, kase: c, note: input.note, walk });
        const messageId = await mail.record(trx, { organisationId: user.organisationId, kind: 'case-summary', to, content, caseId: c.id, fromName: user.organisationName, replyTo: user.email });
        messageIds.push(messageId);
        await repo.insertEvent(trx, { caseId: c.id, kind: 'email', userId: user.id, mailMessageId: messageId, walkId: first.chosen, text: 'Summary to the caller' });
        // An address typed for the summary is the caller's address from now on.
        await repo.update(trx, c.id, c.callerEmail ? {} : { caller_email: to });
        return fresh(trx, user, c.id);
      });
      mail.dispatch(messageIds);
      return out;
    },

    async notices(user: SessionUser): Promise<{ notices: NoticeView[]; unread: number }> {
      return { notices: await repo.notices(db, user.id, 20), unread: await repo.unreadNotices(db, user.id) };
    },

    async readNotice(user: SessionUser, id: number): Promise<void> {
      if (!(await repo.markNoticeRead(db, user.id, id))) throw AppError.notFound('This notice');
    },
  };
}

export type CasesService = ReturnType<typeof createCasesService>;
