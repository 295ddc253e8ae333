// Input schemas for articles, shared by the editor and the server.
import { z } from 'zod';

export const ARTICLE_WORKFLOWS = ['draft', 'in_review', 'published', 'archived'] as const;
export type ArticleWorkflow = (typeof ARTICLE_WORKFLOWS)[number];

export const TipTapDoc = z.object({ type: z.literal('doc', { error: 'Body must be an editor document' }), content: z.array(z.unknown()).optional() }, { error: 'Body is required' }).loose();

export function slugify(title: string): string {
  return title
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 80);
}

export const ArticleFields = z.object({
  title: z
    .string({ error: 'Title is required' })
    .trim()
    .min(1, 'Title is required')
    .max(160, 'Title must be at most 160 characters')
    .refine((t) => slugify(t).length > 0, 'Title needs at least one letter or digit'),
  summary: z.string().trim().max(400, 'Summary must be at most 400 characters').default(''),
  body: TipTapDoc,
  tags: z.array(z.string().max(60), { error: 'Tags must be a list' }).max(30, 'At most 30 tags').default([]),
  keywords: z
    .array(z.string().trim().min(1, 'A keyword cannot be empty').max(40, 'A keyword is at most 40 characters'), { error: 'Keywords must be a list' })
    .max(20, 'At most 20 keywords')
    .default([]),
});

export const ArticleCreateInput = ArticleFields;
export type ArticleCreateInput = z.output<typeof ArticleCreateInput>;

export const ArticleSaveInput = ArticleFields.extend({
  /** The article version the author started from; a different one means someone else saved. */
  baseVersion: z.number({ error: 'Base version is required' }).int().positive(),
  /** Autosaves by the same author within a few minutes fold into one revision. */
  autosave: z.boolean().default(false),
  note: z.string().trim().max(300, 'Note must be at most 300 characters').optional(),
});
export type ArticleSaveInput = z.output<typeof ArticleSaveInput>;

export const ArticleListQuery = z.object({
  status: z.enum([...ARTICLE_WORKFLOWS, 'all', 'review-queue'], { error: 'Unknown status' }).default('all'),
  tag: z.string().max(60).optional(),
  q: z.string().trim().max(200, 'Search text is too long').optional(),
  mine: z.enum(['1', '0']).optional(),
});

export const ReviewInput = z.object({ comment: z.string().trim().max(2000, 'Comment must be at most 2000 characters').optional() });
export const RequestChangesInput = z.object({ comment: z.string({ error: 'Say what should change' }).trim().min(1, 'Say what should change').max(2000) });

export const RestoreInput = z.object({ baseVersion: z.number({ error: 'Base version is required' }).int().positive() });

export const ArticleIdParam = z.object({ id: z.coerce.number({ error: 'Article id must be a number' }).int().positive('Article id must be a positive whole number') });
export const RevisionParam = ArticleIdParam.extend({ number: z.coerce.number({ error: 'Revision must be a number' }).int().positive() });
export const CompareQuery = z.object({ from: z.coerce.number().int().positive(), to: z.coerce.number().int().positive() });

export interface ArticleSummary {
  id: number;
  slug: string;
  title: string;
  summary: string;
  workflow: ArticleWorkflow;
  published: boolean;
  hasUnpublishedChanges: boolean;
  tags: string[];
  hazards: string[];
  headRevision: number;
  version: number;
  updatedAt: string;
  authorName: string | null;
}

export interface ArticleRevisionView {
  number: number;
  title: string;
  summary: string;
  body: unknown;
  html: string;
  tags: string[];
  keywords: string[];
  hazards: string[];
  authorName: string | null;
  createdAt: string;
  updatedAt: string;
  note: string | null;
}

export interface ArticleEventView {
  kind: string;
  userName: string | null;
  revisionNumber: number | null;
  comment: string | null;
  createdAt: string;
}

export interface ArticleDetail extends ArticleSummary {
  /** What readers see; null until first approved. */
  publishedRevision: ArticleRevisionView | null;
  /** The working copy (authors only). */
  head: ArticleRevisionView | null;
  submittedByName: string | null;
  submittedById: number | null;
  reviewedByName: string | null;
  reviewedAt: string | null;
  events: ArticleEventView[];
  files: { id: string; kind: string; urls: Record<string, string>; originalName: string }[];
}
