// The guides API's inputs (validated by the server, reused by the editor's forms) and the shapes
// it answers with. Guide content and metadata themselves are defined in ../guides/schema.ts.
import { z } from 'zod';
import { CODE_PATTERN, GUIDE_LIMITS, GuideDraftContent, GuideMetaFields, type GuideDraftContent as DraftContent } from '../guides/schema';
import type { GuideProblem } from '../guides/validate';

export const GUIDE_STATUSES = ['active', 'retired'] as const;
export type GuideStatus = (typeof GUIDE_STATUSES)[number];

/** Where the working copy stands: none (only a published version), being edited, or waiting for review. */
export const DRAFT_STATES = ['none', 'draft', 'in_review'] as const;
export type DraftState = (typeof DRAFT_STATES)[number];

export const VERSION_STATES = ['draft', 'in_review', 'published', 'superseded'] as const;
export type VersionState = (typeof VERSION_STATES)[number];

export const GUIDE_LIST_STATUSES = ['all', 'active', 'retired', 'draft', 'in_review', 'review-queue', 'published', 'unpublished'] as const;

// Whitespace-only titles would pass the guide schema's non-empty check and show as blank in lists.
const trimmed = <S extends z.ZodType>(schema: S) => z.preprocess((v) => (typeof v === 'string' ? v.trim() : v), schema);

/** Metadata as the editor sends it: the guide schema's rules, with text trimmed and defaults filled in. */
export const GuideMetaInput = z.object({
  title: trimmed(GuideMetaFields.title),
  symptom: trimmed(GuideMetaFields.symptom),
  summary: trimmed(GuideMetaFields.summary.unwrap()).default(''),
  tags: GuideMetaFields.tags.default([]),
});
export type GuideMetaInput = z.output<typeof GuideMetaInput>;

export const GuideCreateInput = GuideMetaInput.extend({
  /** Starting content; without it the guide starts with one empty Ask step. */
  content: GuideDraftContent.optional(),
});
export type GuideCreateInput = z.output<typeof GuideCreateInput>;

const LockVersion = z.number({ error: 'Base lock version is required' }).int('Base lock version must be a whole number').positive('Base lock version must be positive');

export const GuideSaveInput = z.object({
  meta: GuideMetaInput,
  content: GuideDraftContent,
  /** The draft's lockVersion the editor started from; any other value means someone else saved. */
  baseLockVersion: LockVersion,
});
export type GuideSaveInput = z.output<typeof GuideSaveInput>;

/** Optional on workflow actions: when given, the action is refused if the draft changed since. */
export const GuideActionInput = z.object({ baseLockVersion: LockVersion.optional() });
export type GuideActionInput = z.output<typeof GuideActionInput>;

export const GuideApproveInput = GuideActionInput.extend({
  comment: z.string({ error: 'Comment must be text' }).trim().max(2000, 'Comment must be at most 2000 characters').optional(),
});
export type GuideApproveInput = z.output<typeof GuideApproveInput>;

export const GuideRequestChangesInput = GuideActionInput.extend({
  comment: z.string({ error: 'Say what should change' }).trim().min(1, 'Say what should change').max(2000, 'Comment must be at most 2000 characters'),
});
export type GuideRequestChangesInput = z.output<typeof GuideRequestChangesInput>;

export const GuideDiscardQuery = z.object({ baseLockVersion: z.coerce.number({ error: 'Base lock version must be a number' }).int().positive().optional() });

export const GuideListQuery = z.object({
  status: z.enum(GUIDE_LIST_STATUSES, { error: `Status must be one of ${GUIDE_LIST_STATUSES.join(', ')}` }).default('all'),
  tag: z.string().trim().max(GUIDE_LIMITS.tagLength, 'Tag is too long').optional(),
  q: z.string().trim().max(200, 'Search text is too long').optional(),
  symptom: z.string().trim().max(GUIDE_LIMITS.symptom, 'Symptom is too long').optional(),
});
export type GuideListQuery = z.output<typeof GuideListQuery>;

export const GuideIdParam = z.object({
  id: z.coerce.number({ error: 'Guide id must be a number' }).int('Guide id must be a whole number').positive('Guide id must be a positive whole number').max(2_147_483_647, 'Guide id is too large'),
});
export const GuideVersionParam = GuideIdParam.extend({
  number: z.coerce.number({ error: 'Version must be a number' }).int('Version must be a whole number').positive('Version must be a positive whole number').max(2_147_483_647, 'Version is too large'),
});

/** A version by number, or the guide's published version, or its current draft. */
export const VersionRef = z.union([z.enum(['published', 'draft']), z.coerce.number().int().positive().max(2_147_483_647)], { error: 'Version must be "published", "draft" or a version number' });
export type VersionRef = z.output<typeof VersionRef>;

export const GuideCompareQuery = z.object({ from: VersionRef.default('published'), to: VersionRef.default('draft') });
export const GuideExportQuery = z.object({ version: VersionRef.optional() });

export const CauseInput = z.object({
  code: z.string({ error: 'Cause code is required' }).trim().regex(CODE_PATTERN, 'Cause code must be 1 to 60 lower-case letters, digits or hyphens'),
  label: z.string({ error: 'Cause label is required' }).trim().min(1, 'Cause label is required').max(GUIDE_LIMITS.label, `Cause label must be at most ${GUIDE_LIMITS.label} characters`),
  component: z.string({ error: 'Component must be a tag slug' }).trim().regex(CODE_PATTERN, 'Component must be a tag slug (lower-case letters, digits or hyphens)').nullish(),
});
export const CauseListInput = z.object({
  causes: z.array(CauseInput, { error: 'Causes must be a list' }).min(1, 'Keep at least one cause').max(GUIDE_LIMITS.causes, `At most ${GUIDE_LIMITS.causes} causes`),
});
export type CauseListInput = z.output<typeof CauseListInput>;
export const CauseListQuery = z.object({ includeInactive: z.enum(['1', '0']).optional() });

// ---- Responses ----

export interface CauseView {
  code: string;
  label: string;
  component: string | null;
  active: boolean;
}

export interface GuideMetaView {
  title: string;
  symptom: string;
  summary: string;
  tags: string[];
}

export interface GuideListItem {
  id: number;
  title: string;
  symptom: string;
  summary: string;
  tags: string[];
  status: GuideStatus;
  publishedVersion: number | null;
  publishedAt: string | null;
  // The rest is for authors; readers get null, 'none' or 0.
  draftState: DraftState;
  draftVersion: number | null;
  draftUpdatedAt: string | null;
  draftUpdatedByName: string | null;
  submittedById: number | null;
  submittedByName: string | null;
  errorCount: number | null;
  warningCount: number | null;
  lockVersion: number | null;
  openFlagCount: number;
  walksNotFixed: number;
  walksFixedByOther: number;
  updatedAt: string;
}

export interface GuideVersionView {
  number: number;
  state: VersionState;
  meta: GuideMetaView;
  content: DraftContent;
  createdAt: string;
  updatedAt: string;
  createdByName: string | null;
  updatedByName: string | null;
  submittedById: number | null;
  submittedByName: string | null;
  submittedAt: string | null;
  reviewedByName: string | null;
  reviewComment: string | null;
  publishedAt: string | null;
  errorCount: number;
  warningCount: number;
}

export interface GuideDraftView extends GuideVersionView {
  /** Worked out on every read against the organisation's current causes, articles and calculators. */
  validation: { errors: GuideProblem[]; warnings: GuideProblem[] };
}

export interface GuideVersionSummary {
  number: number;
  state: VersionState;
  title: string;
  createdAt: string;
  createdByName: string | null;
  publishedAt: string | null;
}

export interface GuideEventView {
  kind: string;
  versionNumber: number | null;
  userName: string | null;
  comment: string | null;
  createdAt: string;
}

export interface StepFlagView {
  id: number;
  stepId: string;
  versionNumber: number | null;
  comment: string;
  userName: string | null;
  createdAt: string;
}

export interface GuideDetail {
  id: number;
  status: GuideStatus;
  retiredAt: string | null;
  createdAt: string;
  updatedAt: string;
  /** What technicians walk; null until a version is approved. */
  published: GuideVersionView | null;
  // Authors only; readers get null, [] and {}.
  draftState: DraftState | null;
  lockVersion: number | null;
  draft: GuideDraftView | null;
  versions: GuideVersionSummary[];
  events: GuideEventView[];
  /** Open flags by step id. */
  flags: Record<string, StepFlagView[]>;
}

export interface StepChange {
  id: string;
  kind: string;
  title: string;
}

export interface GuideComparison {
  from: { number: number; state: VersionState };
  to: { number: number; state: VersionState };
  meta: {
    title?: { from: string; to: string };
    symptom?: { from: string; to: string };
    summary?: { from: string; to: string };
    tags?: { added: string[]; removed: string[] };
  };
  startStepId?: { from: string; to: string };
  steps: {
    added: StepChange[];
    removed: StepChange[];
    /** `fields` names the step fields that differ, e.g. ['title', 'bands', 'cautions']. */
    changed: (StepChange & { fields: string[] })[];
    unchanged: number;
  };
}

export interface GuideImportResult {
  guide: GuideDetail;
  /** What the file carried that belongs to the exporting site and was left out. */
  dropped: { articleIds: number; photoIds: number; tags: string[] };
  /** Cause codes from the file that the organisation did not have, now added to its list. */
  causesAdded: string[];
}
