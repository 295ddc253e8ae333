// Input schemas and response types of /api/cases, /api/notices and /api/admin/outbox, and the
// password-reset inputs, shared by the support desk's forms and the server.
import { z } from 'zod';
import { Email, NewPassword } from './auth';

import { CASE_PRIORITIES, CASE_STATUSES, type CasePriority, type CaseStatus } from '../case-states';

export * from '../case-states';

export const CASE_LIMITS = {
  name: 120,
  company: 160,
  phone: 40,
  place: 120,
  symptom: 500,
  note: 5000,
  noteFiles: 10,
  pageSize: 100,
} as const;

// PostgreSQL integer ids stop here; a larger number can only be a typo or a probe.
const MAX_ID = 2_147_483_647;

const idOf = (label: string) =>
  z.coerce
    .number({ error: `${label} must be a number` })
    .int(`${label} must be a whole number`)
    .positive(`${label} must be positive`)
    .max(MAX_ID, `${label} is too large`);

/** Optional text: trimmed, empty becomes null. */
const optionalText = (label: string, max: number) =>
  z
    .string({ error: `${label} must be text` })
    .trim()
    .max(max, `${label} must be at most ${max} characters`)
    .nullish()
    .transform((v) => (v ? v : null));

const optionalEmail = z
  .string({ error: 'E-mail must be text' })
  .trim()
  .nullish()
  .transform((v) => (v ? v : null))
  .pipe(Email.nullable());

const phone = optionalText('Phone', CASE_LIMITS.phone).refine((v) => v === null || (/^[+()\d\s./-]{3,}$/.test(v) && /\d{3}/.test(v.replace(/\D/g, ''))), {
  message: 'Phone must be digits, spaces and + ( ) - . / only',
});

export const CaseIdParam = z.object({ id: idOf('Case id') });

const caseFields = {
  callerName: optionalText("Caller's name", CASE_LIMITS.name),
  callerCompany: optionalText('Company', CASE_LIMITS.company),
  callerPhone: phone,
  callerEmail: optionalEmail,
  site: optionalText('Site', CASE_LIMITS.place),
  line: optionalText('Line', CASE_LIMITS.place),
  applicator: optionalText('Valve', CASE_LIMITS.place),
  applicatorId: idOf('Applicator id')
    .nullish()
    .transform((v) => v ?? null),
  symptom: z.string({ error: 'Say what the caller sees' }).trim().min(1, 'Say what the caller sees').max(CASE_LIMITS.symptom, `What they see must be at most ${CASE_LIMITS.symptom} characters`),
  priority: z.enum(CASE_PRIORITIES, { error: `Priority must be one of ${CASE_PRIORITIES.join(', ')}` }).default('normal'),
  assigneeId: idOf('Assignee id')
    .nullish()
    .transform((v) => v ?? null),
};

/** A case needs someone to call back and a place; either may come from a registered valve. */
export const CaseInput = z.object(caseFields).superRefine((v, ctx) => {
  if (!v.callerName && !v.callerCompany) {
    ctx.addIssue({ code: 'custom', path: ['callerName'], message: "Give the caller's name or their company" });
  }
  if (!v.site && !v.applicatorId) {
    ctx.addIssue({ code: 'custom', path: ['site'], message: 'Say which site the call is about, or pick a registered valve' });
  }
});
export type CaseInput = z.output<typeof CaseInput>;

export const CasePatchInput = z
  .object({
    callerName: caseFields.callerName.optional(),
    callerCompany: caseFields.callerCompany.optional(),
    callerPhone: caseFields.callerPhone.optional(),
    callerEmail: caseFields.callerEmail.optional(),
    site: caseFields.site.optional(),
    line: caseFields.line.optional(),
    applicator: caseFields.applicator.optional(),
    applicatorId: caseFields.applicatorId.optional(),
    symptom: caseFields.symptom.optional(),
    priority: z.enum(CASE_PRIORITIES, { error: `Priority must be one of ${CASE_PRIORITIES.join(', ')}` }).optional(),
    assigneeId: caseFields.assigneeId.optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: 'Nothing to change' });
export type CasePatchInput = z.output<typeof CasePatchInput>;

export const CASE_SORTS = ['created', 'updated', 'priority', 'status', 'caller', 'site', 'assignee'] as const;
export type CaseSort = (typeof CASE_SORTS)[number];
export const CASE_AGES = ['day', 'week', 'over-week', 'over-month'] as const;
export type CaseAge = (typeof CASE_AGES)[number];
export const CASE_AGE_LABELS: Record<CaseAge, string> = {
  day: 'Logged in the last day',
  week: 'Logged in the last 7 days',
  'over-week': 'Older than 7 days',
  'over-month': 'Older than 30 days',
};

export const CaseListQuery = z.object({
  /** One status, or `open` for everything still on someone's desk. */
  status: z.enum([...CASE_STATUSES, 'open', 'all'], { error: `Status must be one of ${[...CASE_STATUSES, 'open', 'all'].join(', ')}` }).default('all'),
  /** A user id, `me`, or `none` for unassigned cases. */
  assignee: z.union([z.enum(['me', 'none']), idOf('Assignee id')], { error: 'Assignee must be a user id, me or none' }).optional(),
  site: z.string({ error: 'Site must be text' }).trim().max(CASE_LIMITS.place, 'Site is too long').optional(),
  age: z.enum(CASE_AGES, { error: `Age must be one of ${CASE_AGES.join(', ')}` }).optional(),
  q: z.string({ error: 'Search must be text' }).trim().max(200, 'Search text is too long').optional(),
  sort: z.enum(CASE_SORTS, { error: `Sort must be one of ${CASE_SORTS.join(', ')}` }).default('created'),
  dir: z.enum(['asc', 'desc'], { error: 'Direction must be asc or desc' }).default('asc'),
  page: z.coerce.number({ error: 'Page must be a number' }).int('Page must be a whole number').min(1, 'Page starts at 1').max(100_000).default(1),
  pageSize: z.coerce
    .number({ error: 'Page size must be a number' })
    .int('Page size must be a whole number')
    .min(1, 'Page size must be at least 1')
    .max(CASE_LIMITS.pageSize, `Page size must be at most ${CASE_LIMITS.pageSize}`)
    .default(25),
});
export type CaseListQuery = z.output<typeof CaseListQuery>;

const fileIds = z
  .array(z.uuid({ error: 'Each attachment must be an uploaded file id' }), { error: 'Attachments must be a list of file ids' })
  .max(CASE_LIMITS.noteFiles, `At most ${CASE_LIMITS.noteFiles} attachments per note`)
  .default([])
  .transform((ids) => [...new Set(ids.map((id) => id.toLowerCase()))]);

export const CaseNoteInput = z
  .object({
    text: z.string({ error: 'Note must be text' }).trim().max(CASE_LIMITS.note, `Note must be at most ${CASE_LIMITS.note} characters`).default(''),
    fileIds,
  })
  .refine((n) => n.text.length > 0 || n.fileIds.length > 0, { path: ['text'], message: 'Write a note or attach a file' });
export type CaseNoteInput = z.output<typeof CaseNoteInput>;

export const CaseStatusInput = z.object({
  status: z.enum(CASE_STATUSES, { error: `Status must be one of ${CASE_STATUSES.join(', ')}` }),
  note: optionalText('Note', CASE_LIMITS.note),
});
export type CaseStatusInput = z.output<typeof CaseStatusInput>;

export const CaseWalkInput = z.object({ walkId: idOf('Walk id') });

export const CaseHandoffInput = z.object({
  assigneeId: idOf('Person to hand off to'),
  walkId: idOf('Walk id')
    .nullish()
    .transform((v) => v ?? null),
  note: z.string({ error: 'Say what the person should know' }).trim().min(1, 'Say what the person should know').max(CASE_LIMITS.note, `Note must be at most ${CASE_LIMITS.note} characters`),
});
export type CaseHandoffInput = z.output<typeof CaseHandoffInput>;

export const CaseSummaryQuery = z.object({ walkId: idOf('Walk id').optional() });

export const CaseSummaryInput = z.object({
  walkId: idOf('Walk id')
    .nullish()
    .transform((v) => v ?? null),
  /** Defaults to the caller's e-mail on the case. */
  to: optionalEmail,
  note: optionalText('Message', CASE_LIMITS.note),
});
export type CaseSummaryInput = z.output<typeof CaseSummaryInput>;

export const NoticeIdParam = z.object({ id: idOf('Notice id') });

// ---- Password reset ----------------------------------------------------------------------------

export const ResetRequestInput = z.object({ email: Email });
export const ResetTokenParam = z.object({ token: z.string().min(20, 'The reset link is incomplete').max(200, 'The reset link is not valid') });
export const ResetConfirmInput = z.object({
  token: z.string({ error: 'The reset link is incomplete' }).min(20, 'The reset link is incomplete').max(200, 'The reset link is not valid'),
  password: NewPassword,
});

// ---- Outbox ------------------------------------------------------------------------------------

export const MAIL_STATUSES = ['queued', 'sending', 'retrying', 'sent', 'failed'] as const;
export type MailStatus = (typeof MAIL_STATUSES)[number];
export const MAIL_STATUS_LABELS: Record<MailStatus, string> = {
  queued: 'Waiting to send',
  sending: 'Sending',
  retrying: 'Will try again',
  sent: 'Sent',
  failed: 'Failed',
};
export const MAIL_KINDS = ['invitation', 'password-reset', 'case-handoff', 'case-summary', 'insights-digest'] as const;
export type MailKind = (typeof MAIL_KINDS)[number];
export const MAIL_KIND_LABELS: Record<MailKind, string> = {
  invitation: 'Invitation',
  'password-reset': 'Password reset',
  'case-handoff': 'Hand-off notice',
  'case-summary': 'Case summary',
  'insights-digest': 'Weekly digest',
};

export const OutboxListQuery = z.object({
  status: z.enum([...MAIL_STATUSES, 'all'], { error: `Status must be one of ${[...MAIL_STATUSES, 'all'].join(', ')}` }).default('all'),
  page: z.coerce.number({ error: 'Page must be a number' }).int('Page must be a whole number').min(1, 'Page starts at 1').max(100_000).default(1),
  pageSize: z.coerce.number({ error: 'Page size must be a number' }).int('Page size must be a whole number').min(1).max(100, 'Page size must be at most 100').default(25),
});
export type OutboxListQuery = z.output<typeof OutboxListQuery>;
export const OutboxIdParam = z.object({ id: idOf('Message id') });

// ---- Responses ---------------------------------------------------------------------------------

export interface PersonRef {
  id: number;
  name: string;
}

export interface CaseListItem {
  id: number;
  callerName: string | null;
  callerCompany: string | null;
  site: string | null;
  line: string | null;
  applicator: string | null;
  symptom: string;
  priority: CasePriority;
  status: CaseStatus;
  assignee: PersonRef | null;
  createdAt: string;
  updatedAt: string;
}

export interface CaseList {
  cases: CaseListItem[];
  total: number;
  page: number;
  pageSize: number;
  /** Cases per status among those the viewer may see, whatever the filters. */
  counts: Record<CaseStatus, number>;
}

export interface CaseFileView {
  id: string;
  kind: 'photo' | 'document';
  urls: Record<string, string>;
  originalName: string;
}

export interface CaseWalkView {
  id: number;
  guideId: number;
  guideTitle: string;
  symptom: string;
  status: 'open' | 'ended' | 'abandoned';
  endKind: 'finding' | 'handoff' | 'fixed-by-try' | 'abandoned' | null;
  outcome: 'fixed' | 'not-fixed' | 'fixed-by-other' | null;
  /** Where the walk stands or ended, in the guide's words. */
  stepTitle: string | null;
  startedAt: string;
  endedAt: string | null;
  userId: number;
  userName: string | null;
}

export type CaseEventKind = 'created' | 'edited' | 'note' | 'status' | 'assigned' | 'walk' | 'handoff' | 'email';

export interface CaseEvent {
  id: number;
  kind: CaseEventKind;
  userName: string | null;
  text: string | null;
  fromStatus: CaseStatus | null;
  toStatus: CaseStatus | null;
  walk: { id: number; guideTitle: string } | null;
  mail: { id: number; to: string; subject: string; status: MailStatus; lastError: string | null } | null;
  assignee: PersonRef | null;
  files: CaseFileView[];
  createdAt: string;
}

export interface CaseApplicatorView {
  id: number;
  tag: string;
  siteName: string | null;
  lineName: string | null;
}

export interface CaseDetail extends CaseListItem {
  callerPhone: string | null;
  callerEmail: string | null;
  applicatorId: number | null;
  /** The registered valve, when the case is linked to one that still exists. */
  registered: CaseApplicatorView | null;
  createdBy: PersonRef | null;
  handedOffAt: string | null;
  resolvedAt: string | null;
  closedAt: string | null;
  walks: CaseWalkView[];
  events: CaseEvent[];
  /** What the viewer may do here (the server checks again). */
  canWork: boolean;
  canNote: boolean;
  canChangeStatus: boolean;
  allowedStatuses: CaseStatus[];
}

export interface CasePerson {
  id: number;
  name: string;
  roles: string[];
  /** Authors and technicians take hand-offs. */
  takesHandoffs: boolean;
}

export interface SummaryPreview {
  to: string | null;
  subject: string;
  text: string;
  html: string;
  walkId: number | null;
}

export interface NoticeView {
  id: number;
  kind: string;
  title: string;
  body: string | null;
  caseId: number | null;
  createdAt: string;
  readAt: string | null;
}

export interface OutboxItem {
  id: number;
  kind: MailKind;
  to: string;
  subject: string;
  status: MailStatus;
  attempts: number;
  lastError: string | null;
  caseId: number | null;
  createdAt: string;
  sentAt: string | null;
}

export interface OutboxMessage extends OutboxItem {
  from: string;
  text: string;
  html: string | null;
  smtpResponse: string | null;
  /** Set when the link in the message is withheld from this page. */
  hidden: boolean;
  /** When the local fake SMTP server received it. */
  capturedAt: string | null;
}

export interface OutboxList {
  messages: OutboxItem[];
  total: number;
  page: number;
  pageSize: number;
  counts: Record<MailStatus, number>;
  /** The local fake keeps every message; no real mail leaves. */
  fake: boolean;
}
