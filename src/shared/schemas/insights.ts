// Query parameters and answers of /api/insights: recurring causes, service forecast, guide
// effectiveness and reliability per component. Shared so the pages read exactly what routes send.
import { z } from 'zod';
import type { ParetoBar } from '../insights/pareto';
import type { Interval } from '../insights/intervals';

const MAX_ID = 2_147_483_647;
const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/;

const id = (label: string) =>
  z.coerce
    .number({ error: `${label} must be a number` })
    .int(`${label} must be a whole number`)
    .positive(`${label} must be positive`)
    .max(MAX_ID, `${label} is too large`);

const date = (label: string) =>
  z
    .string({ error: `${label} must be a date` })
    .regex(ISO_DATE, `${label} must be a date written as YYYY-MM-DD`)
    .refine((v) => {
      const d = new Date(`${v}T00:00:00Z`);
      return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === v;
    }, `${label} is not a real calendar date`);

export const INSIGHT_ACTUATIONS = ['electric', 'air-operated'] as const;
export const TREND_BUCKETS = ['week', 'month'] as const;
export type TrendBucket = (typeof TREND_BUCKETS)[number];

export const CausesQuery = z
  .object({
    from: date('From').optional(),
    to: date('To').optional(),
    siteId: id('Site id').optional(),
    lineId: id('Line id').optional(),
    actuation: z.enum(INSIGHT_ACTUATIONS, { error: 'Actuation must be electric or air-operated' }).optional(),
    fluidFamily: z.string({ error: 'Fluid family must be text' }).trim().min(1, 'Fluid family must not be empty').max(60, 'Fluid family is too long').optional(),
    guideId: id('Guide id').optional(),
    repeatDays: z.coerce
      .number({ error: 'Repeat window must be a number of days' })
      .int('Repeat window must be a whole number of days')
      .min(1, 'Repeat window must be at least 1 day')
      .max(3650, 'Repeat window must be at most 3650 days')
      .default(90),
    bucket: z.enum(TREND_BUCKETS, { error: 'Trend must be by week or month' }).default('month'),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, { path: ['to'], message: 'To must be on or after From' });
export type CausesQuery = z.output<typeof CausesQuery>;

export const FORECAST_HORIZONS = [30, 60, 90] as const;
export const ForecastQuery = z.object({
  days: z.coerce
    .number({ error: 'Days must be 30, 60 or 90' })
    .refine((d) => (FORECAST_HORIZONS as readonly number[]).includes(d), 'Days must be 30, 60 or 90')
    .default(90),
  siteId: id('Site id').optional(),
});
export type ForecastQuery = z.output<typeof ForecastQuery>;

export const RELIABILITY_PARTS = ['seat', 'needle', 'seals', 'coil'] as const;
export type ReliabilityPart = (typeof RELIABILITY_PARTS)[number];
export const RELIABILITY_PART_LABELS: Record<ReliabilityPart, string> = { seat: 'Seat', needle: 'Needle', seals: 'Dynamic seals', coil: 'Coil' };
export const ReliabilityQuery = z.object({
  part: z.enum(RELIABILITY_PARTS, { error: `Part must be one of ${RELIABILITY_PARTS.join(', ')}` }).default('seat'),
  actuation: z.enum(INSIGHT_ACTUATIONS, { error: 'Actuation must be electric or air-operated' }).optional(),
  fluidFamily: z.string({ error: 'Fluid family must be text' }).trim().min(1, 'Fluid family must not be empty').max(60, 'Fluid family is too long').optional(),
});
export type ReliabilityQuery = z.output<typeof ReliabilityQuery>;

export const GuidesQuery = z.object({
  from: date('From').optional(),
  to: date('To').optional(),
});
export type GuidesQuery = z.output<typeof GuidesQuery>;

export const DigestPreferenceInput = z.object({
  enabled: z.boolean({ error: 'Enabled must be true or false' }),
});
export type DigestPreferenceInput = z.output<typeof DigestPreferenceInput>;

// ---- Answers ---------------------------------------------------------------------------------

/**
 * Where the figures come from: the summary tables as of their last refresh, or the raw history
 * read just now (filtered questions, or before the first refresh).
 */
export interface Freshness {
  /** ISO time of the refresh the figures come from; null when computed from the history just now. */
  asOf: string | null;
}

export interface InsightsStatus {
  /** Last refresh of the organisation's summaries; null before the first. */
  refreshedAt: string | null;
  fullAt: string | null;
  tookMs: number | null;
  /** A refresh asked for and not yet run. */
  requestedAt: string | null;
  /** Changes recorded since the last refresh, waiting for the next one. */
  changesWaiting: boolean;
}

export interface DigestPreference {
  enabled: boolean;
  /** Only managers receive the weekly digest. */
  eligible: boolean;
  lastSentAt: string | null;
}

export interface CausesAnswer extends Freshness {
  from: string;
  to: string;
  total: number;
  fromWalks: number;
  fromService: number;
  pareto: (ParetoBar & { label: string })[];
  repeatDays: number;
  /** All repeats in the period; `repeats` holds the latest 200. */
  repeatTotal: number;
  repeats: { applicatorId: number; tag: string; code: string; label: string; firstOn: string; repeatOn: string; daysApart: number }[];
  bucket: TrendBucket;
  /** One row per period; top causes as columns (by code). */
  trend: { period: string; counts: Record<string, number> }[];
  trendCodes: string[];
  /** Why something cannot be shown, in words; null when everything could be computed. */
  empty: string | null;
}

export interface ForecastRow {
  applicatorId: number;
  tag: string;
  siteId: number;
  site: string;
  line: string;
  part: 'seat' | 'needle' | 'seals';
  dueOn: string;
  daysRemaining: number;
  status: 'ok' | 'overdue';
  cyclesSince: number;
  threshold: number;
  parts: { name: string; partNumber: string | null; quantity: number }[];
  partsKnown: boolean;
}

export interface ForecastAnswer extends Freshness {
  today: string;
  days: number;
  rows: ForecastRow[];
  partsToOrder: { partNumber: string | null; name: string; quantity: number; applicators: number }[];
  /** Services in the window whose parts are not known from earlier services of that kind. */
  partsUnknown: number;
  /** Applicators whose dates cannot be forecast, with the reason. */
  noForecast: { applicatorId: number; tag: string; siteId: number; reason: string }[];
  /** Where intervals come from for applicators without their own. */
  defaultIntervals: { seat: number; needle: number; seals: number; source: 'organisation' | 'common-practice' };
}

export interface GuideEffectiveness {
  guideId: number;
  versionId: number;
  versionNumber: number;
  title: string;
  started: number;
  finished: number;
  fixed: number;
  notFixed: number;
  fixedByOther: number;
  abandoned: number;
  open: number;
  abandonedAt: { stepId: string; title: string; count: number }[];
  medianMinutesToFinding: number | null;
  openFlags: number;
}

export interface GuidesAnswer extends Freshness {
  from: string;
  to: string;
  versions: GuideEffectiveness[];
}

export interface ReliabilityAnswer extends Freshness {
  part: ReliabilityPart;
  unit: 'cycles';
  /** The first MAX_LISTED intervals; `intervalCount` says how many were used. */
  intervals: (Interval & { applicatorId: number; tag: string })[];
  intervalCount: number;
  failures: number;
  suspensions: number;
  skipped: string[];
  fit: {
    method: 'maximum likelihood';
    shape: number;
    scale: number;
    b10: number;
    warnings: string[];
  } | null;
  /** Median-rank regression, drawn on the probability plot. */
  plot: {
    method: 'median-rank regression';
    shape: number;
    scale: number;
    rSquared: number;
    /** Evenly thinned to at most a thousand for drawing; `pointsTotal` failures were ranked. */
    points: { cycles: number; medianRank: number; x: number; y: number }[];
    pointsTotal: number;
  } | null;
  /** The interval the organisation plans by, and where it sits on the fitted curve. */
  planned: { cycles: number; source: string; sourceKind: 'organisation' | 'common-practice'; unreliabilityAtPlanned: number | null } | null;
  cannotFit: string | null;
}
