// Input schemas and response types of /api/walks, shared by the phone runner (and its offline
// queue) and the server. The answer log's entries themselves are in ../walks/answers.ts.
import { z } from 'zod';
import type { GuideContent, StepKind } from '../guides/schema';
import { ANSWER_ID_PATTERN, WALK_LIMITS, WalkAnswer, type FindingOutcome, type WalkAnswer as WalkAnswerEntry } from '../walks/answers';
import type { WalkEnd, WalkState } from '../walks/walk-path';

export const WALK_STATUSES = ['open', 'ended', 'abandoned'] as const;
export type WalkStatus = (typeof WALK_STATUSES)[number];

export const WALK_END_KINDS = ['finding', 'handoff', 'fixed-by-try', 'abandoned'] as const;
export type WalkEndKind = (typeof WALK_END_KINDS)[number];

export const WALK_INPUT_LIMITS = {
  /** Site, line and applicator are free text until applicators have their own records. */
  place: 120,
  /** Entries per batch: a long offline stretch on one walk stays well below this. */
  batch: 100,
  noteFiles: 10,
  flagComment: 1000,
  abandonReason: 1000,
  listLimit: 200,
} as const;

/** How long after a walk ends its technician may still add notes and photos. */
export const NOTE_WINDOW_MS = 24 * 60 * 60 * 1000;

// PostgreSQL integer ids stop here; a larger number can only be a typo or a probe.
const MAX_ID = 2_147_483_647;

const clientKey = (label: string) => z.string({ error: `${label} is required` }).regex(ANSWER_ID_PATTERN, `${label} must be 8 to 64 letters, digits, hyphens or underscores`);

const stepId = z.string({ error: 'Step id is required' }).min(1, 'Step id is required').max(40, 'Step id is too long');

const placeText = (label: string) =>
  z
    .string({ error: `${label} must be text` })
    .trim()
    .max(WALK_INPUT_LIMITS.place, `${label} must be at most ${WALK_INPUT_LIMITS.place} characters`)
    .nullish()
    .transform((value) => (value ? value : null));

export const WalkIdParam = z.object({
  id: z.coerce.number({ error: 'Walk id must be a number' }).int('Walk id must be a whole number').positive('Walk id must be positive').max(MAX_ID, 'Walk id is too large'),
});

export const StartWalkInput = z.object({
  guideId: z.number({ error: 'Guide is required' }).int('Guide id must be a whole number').positive('Guide id must be positive').max(MAX_ID, 'Guide id is too large'),
  site: placeText('Site'),
  line: placeText('Line'),
  applicator: placeText('Applicator'),
  /** A registered applicator: its tag, line and site replace the three texts above. */
  applicatorId: z
    .number({ error: 'Applicator id must be a number' })
    .int('Applicator id must be a whole number')
    .positive('Applicator id must be positive')
    .max(MAX_ID, 'Applicator id is too large')
    .nullish()
    .transform((value) => value ?? null),
  /** Retry key of the start request; see the route notes on what it protects against. */
  clientId: clientKey('Walk client id').optional(),
});
export type StartWalkInput = z.output<typeof StartWalkInput>;

export const WalkListQuery = z.object({
  mine: z.enum(['1', '0'], { error: 'mine must be 1 or 0' }).optional(),
  status: z.enum([...WALK_STATUSES, 'all'], { error: `Status must be one of ${[...WALK_STATUSES, 'all'].join(', ')}` }).default('all'),
  guideId: z.coerce.number({ error: 'Guide id must be a number' }).int('Guide id must be a whole number').positive('Guide id must be positive').max(MAX_ID).optional(),
});
export type WalkListQuery = z.output<typeof WalkListQuery>;

/** One log entry: choice, reading, try, finding-outcome, acknowledge or back. */
export const AnswerInput = WalkAnswer;

// Entries are checked one by one in the service, so a bad one stops the batch at its own index
// and the good ones before it are still stored.
export const AnswerBatchInput = z.object({
  answers: z.array(z.unknown(), { error: 'Answers must be a list' }).min(1, 'Send at least one answer').max(WALK_INPUT_LIMITS.batch, `Send at most ${WALK_INPUT_LIMITS.batch} answers at a time`),
});

export const NoteInput = z
  .object({
    clientId: clientKey('Note id'),
    stepId,
    text: z.string({ error: 'Note must be text' }).trim().max(WALK_LIMITS.note, `Note must be at most ${WALK_LIMITS.note} characters`).default(''),
    fileIds: z
      .array(z.uuid({ error: 'Each photo must be an uploaded file id' }), { error: 'Photos must be a list of file ids' })
      .max(WALK_INPUT_LIMITS.noteFiles, `At most ${WALK_INPUT_LIMITS.noteFiles} photos per note`)
      .default([])
      .transform((ids) => [...new Set(ids.map((id) => id.toLowerCase()))]),
  })
  .refine((note) => note.text.length > 0 || note.fileIds.length > 0, { path: ['text'], message: 'Write a note or add a photo' });
export type NoteInput = z.output<typeof NoteInput>;

export const AbandonInput = z.object({
  reason: z.string({ error: 'Reason must be text' }).trim().max(WALK_INPUT_LIMITS.abandonReason, `Reason must be at most ${WALK_INPUT_LIMITS.abandonReason} characters`).optional(),
});
export type AbandonInput = z.output<typeof AbandonInput>;

export const FlagInput = z.object({
  stepId,
  comment: z
    .string({ error: 'Say what is wrong or unclear' })
    .trim()
    .min(1, 'Say what is wrong or unclear')
    .max(WALK_INPUT_LIMITS.flagComment, `Comment must be at most ${WALK_INPUT_LIMITS.flagComment} characters`),
});
export type FlagInput = z.output<typeof FlagInput>;

// ---- Responses ------------------------------------------------------------------------------

/** A stored log entry: the entry exactly as sent, plus the server's order and receipt time. */
export type WalkAnswerRecord = WalkAnswerEntry & { seq: number; receivedAt: string };

/** The walk's own fields, without the guide content and the log. */
export interface WalkMeta {
  id: number;
  guideId: number;
  guideVersionId: number;
  userId: number;
  userName: string | null;
  site: string | null;
  line: string | null;
  applicator: string | null;
  /** The registered applicator the walk was started from, if any. */
  applicatorId: number | null;
  status: WalkStatus;
  /** The step the technician is on (the end step once ended). */
  currentStepId: string | null;
  endedAtStepId: string | null;
  endKind: WalkEndKind | null;
  outcome: FindingOutcome | null;
  causeCode: string | null;
  /** The finding outcome's note, or the reason given when abandoning. */
  outcomeNote: string | null;
  answerCount: number;
  startedAt: string;
  updatedAt: string;
  endedAt: string | null;
}

export interface WalkListItem extends WalkMeta {
  guideTitle: string;
  symptom: string;
  versionNumber: number;
  currentStepTitle: string | null;
  /** Steps on the path so far, the one the technician is on included. */
  pathLength: number;
  /** Steps in the pinned guide version. */
  stepCount: number;
}

export interface WalkGuideView {
  id: number;
  versionId: number;
  versionNumber: number;
  title: string;
  symptom: string;
  summary: string;
  tags: string[];
  /** The guide's status today: a walk on a since-retired guide keeps its pinned version. */
  guideStatus: 'active' | 'retired';
  content: GuideContent;
}

export interface WalkFileView {
  id: string;
  kind: 'photo' | 'document';
  urls: Record<string, string>;
  originalName: string;
}

export interface WalkNoteView {
  id: number;
  clientId: string;
  stepId: string;
  text: string;
  fileIds: string[];
  files: WalkFileView[];
  userName: string | null;
  createdAt: string;
}

export interface WalkFlagView {
  id: number;
  stepId: string;
  comment: string;
  userName: string | null;
  createdAt: string;
  resolvedAt: string | null;
}

export interface WalkDetail extends WalkMeta {
  guide: WalkGuideView;
  answers: WalkAnswerRecord[];
  state: WalkState;
  notes: WalkNoteView[];
  flags: WalkFlagView[];
  /** The viewer owns the walk, may run walks, and the walk is open. */
  canAnswer: boolean;
  /** The viewer owns the walk and it is open or ended less than a day ago. */
  canAddNotes: boolean;
  /** The support case this walk was run for (walked with a caller), if any. */
  caseId: number | null;
}

export interface AnswerResult {
  duplicate: boolean;
  state: WalkState;
  walk: WalkMeta;
}

export interface BatchApplied {
  index: number;
  id: string;
  duplicate: boolean;
}

export interface BatchResult {
  applied: BatchApplied[];
  state: WalkState;
  walk: WalkMeta;
}

/** `error.details` of a batch stopped at an entry (the entries before it are stored). */
export interface BatchRejectedDetails {
  index: number;
  id: string | null;
  reason: string;
  stepId?: string;
  applied: BatchApplied[];
  state: WalkState;
  walk: WalkMeta;
}

export interface NoteResult {
  duplicate: boolean;
  note: WalkNoteView;
}

export interface WalkSummaryCaution {
  id: string;
  hazard: string;
  text: string;
  action: string;
  /** Device time of the acknowledgement; null if never acknowledged. */
  acknowledgedAt: string | null;
}

export interface WalkSummaryStep {
  position: number;
  stepId: string;
  title: string;
  kind: StepKind;
  kindLabel: string;
  /** The answer in words; null on the step the walk stopped at unanswered. */
  answer: string | null;
  answeredAt: string | null;
  reading?: {
    value: number;
    unit: string;
    /** The value the bands were read in, e.g. a converted reading or the calculator output. */
    routedValue: { value: number; unit: string } | null;
    bandId: string | null;
    bandLabel: string | null;
    calculator: { id: string; title: string; output: string; outputLabel: string; computed: { value: number; unit: string } | null; inputs: Record<string, unknown> } | null;
  };
  cautions: WalkSummaryCaution[];
  notes: { text: string; fileIds: string[]; createdAt: string }[];
}

export interface WalkSummary {
  walkId: number;
  guideId: number;
  guideTitle: string;
  symptom: string;
  versionNumber: number;
  technician: string | null;
  site: string | null;
  line: string | null;
  applicator: string | null;
  status: WalkStatus;
  endKind: WalkEndKind | null;
  ended: WalkEnd | null;
  outcome: FindingOutcome | null;
  outcomeLabel: string | null;
  outcomeNote: string | null;
  causeCode: string | null;
  causeLabel: string | null;
  startedAt: string;
  endedAt: string | null;
  steps: WalkSummaryStep[];
  /** Set when the walk ended at a Hand-off: ready to paste into a message. */
  handoffText: string | null;
  /** The whole record as plain text, for sharing or printing without the page. */
  text: string;
}
