// Zod schemas and types for a guide version's content and its metadata: what is stored as JSONB,
// what the editor's forms hold, and what the guide file carries.
import { z } from 'zod';
import { HAZARD_KEYS, type Hazard } from '../tags';
import { QUANTITY_KINDS, type QuantityKind } from '../units';
import { STEP_KINDS } from './labels';

export { END_STEP_KINDS, STEP_KIND_LABELS, STEP_KINDS, isEndStep, type StepKind } from './labels';

/**
 * Limits enforced by the schemas and by validateGuide. They keep a guide small enough to walk on
 * a phone with poor signal and to validate on every keystroke in the editor.
 */
export const GUIDE_LIMITS = {
  steps: 300,
  idLength: 40,
  stepTitle: 200,
  label: 200,
  text: 2000,
  remedyItem: 500,
  remedyItems: 30,
  parts: 30,
  partName: 200,
  partNumber: 60,
  partQuantity: 999,
  cautionsPerStep: 10,
  photosPerStep: 20,
  photoIdLength: 100,
  articlesPerStep: 20,
  minChoices: 2,
  maxChoices: 12,
  minBands: 1,
  maxBands: 12,
  fixedInputs: 20,
  nameLength: 60,
  unitLength: 20,
  /** Serialised size of a step body's editor document, in UTF-8 bytes. */
  bodyBytes: 100_000,
  bodyHtmlChars: 400_000,
  causeCode: 60,
  typicalMinutes: 10_080,
  guideTitle: 200,
  symptom: 200,
  summary: 2000,
  tags: 30,
  tagLength: 60,
  causes: 200,
  /** A path with more steps than this draws a warning: long walks lose people. */
  longPath: 15,
} as const;

/** Step, choice, band and caution ids: short, stable, safe in URLs and logs. */
export const ID_PATTERN = /^[a-z0-9-]{1,40}$/;
/** Cause codes and tag slugs, as in tags.ts. */
export const CODE_PATTERN = /^[a-z0-9-]{1,60}$/;

type Mode = 'strict' | 'draft';
type Issue = { code?: string; input?: unknown; keys?: string[] };

function typeError(label: string, what: string) {
  return (issue: Issue) => (issue.input === undefined ? `${label} is required` : `${label} must be ${what}`);
}

// Unknown fields are refused rather than dropped so that a file round-trips exactly and a typo in
// a hand-edited file is reported instead of silently losing data.
function objectError(label: string) {
  return (issue: Issue) => {
    if (issue.code === 'unrecognized_keys') {
      const keys = (issue.keys ?? []).map((key) => `'${key}'`).join(', ');
      return `${label} has unknown field${(issue.keys ?? []).length === 1 ? '' : 's'} ${keys}`;
    }
    return issue.input === undefined ? `${label} is required` : `${label} must be an object`;
  };
}

/** A strict object whose messages name it in plain words; shared with the guide file schema. */
export function labelledObject<T extends z.core.$ZodLooseShape>(label: string, shape: T) {
  return z.strictObject(shape, { error: objectError(label) });
}
const obj = labelledObject;

/** Text that must not be empty, with messages that name the field. */
export function requiredText(label: string, max: number) {
  return text(label, max, 'strict');
}

/** Text that a draft may leave empty but a finished guide may not. */
function text(label: string, max: number, mode: Mode) {
  const base = z.string({ error: typeError(label, 'text') });
  const capped = base.max(max, `${label} must be at most ${max} characters`);
  return mode === 'strict' ? base.min(1, `${label} must not be empty`).max(max, `${label} must be at most ${max} characters`) : capped;
}

function id(label: string) {
  return z.string({ error: typeError(label, 'text') }).regex(ID_PATTERN, `${label} must be 1 to ${GUIDE_LIMITS.idLength} lower-case letters, digits or hyphens`);
}

/** A reference to a step: a draft may hold '' while the author has not chosen the target yet. */
function stepRef(label: string, mode: Mode) {
  const ref = id(label);
  return mode === 'strict' ? ref : z.union([z.literal(''), ref], { error: typeError(label, 'a step id') });
}

function list<T extends z.ZodType>(label: string, item: T, min: number, max: number, mode: Mode) {
  const arr = z.array(item, { error: typeError(label, 'a list') });
  const least = mode === 'strict' ? min : 0;
  const withMax = arr.max(max, `${label}: at most ${max} allowed`);
  return least > 0 ? withMax.min(least, `${label}: at least ${least} needed`) : withMax;
}

function utf8Bytes(value: unknown): number {
  return new TextEncoder().encode(JSON.stringify(value) ?? '').length;
}

/** The editor's document: only the outer shape is checked here; the server sanitises the rest. */
export const RichDoc = z.object({ type: z.literal('doc', { error: 'Body document must have type "doc"' }) }, { error: typeError('Body document', 'an editor document') }).catchall(z.unknown());

export const RichBody = obj('Body', {
  doc: RichDoc,
  /** Filled by the server from doc after sanitising; never trusted from a client or a file. */
  html: z
    .string({ error: typeError('Body HTML', 'text') })
    .max(GUIDE_LIMITS.bodyHtmlChars, 'Body HTML is too long')
    .optional(),
}).refine((body) => utf8Bytes(body.doc) <= GUIDE_LIMITS.bodyBytes, {
  message: `Body is too long: at most ${GUIDE_LIMITS.bodyBytes / 1000} kB`,
  path: ['doc'],
});
export type RichBody = z.infer<typeof RichBody>;

function enumOf<K extends string>(keys: readonly K[]): { [P in K]: P } {
  return Object.fromEntries(keys.map((key) => [key, key])) as { [P in K]: P };
}

export const HazardSchema = z.enum(enumOf<Hazard>(HAZARD_KEYS), {
  error: `Hazard must be one of ${HAZARD_KEYS.join(', ')}`,
});

export const QuantityKindSchema = z.enum(enumOf<QuantityKind>(QUANTITY_KINDS), {
  error: `Quantity kind must be one of ${QUANTITY_KINDS.join(', ')}`,
});

const Quantity = obj('Fixed value', {
  value: z.number({ error: typeError('Fixed value', 'a finite number') }),
  unit: z
    .string({ error: typeError('Fixed value unit', 'text') })
    .min(1, 'Fixed value unit must not be empty')
    .max(GUIDE_LIMITS.unitLength),
});

function schemasFor(mode: Mode) {
  const Caution = obj('Caution', {
    id: id('Caution id'),
    hazard: HazardSchema,
    text: text('Caution text', GUIDE_LIMITS.text, mode),
    action: text('Caution action', GUIDE_LIMITS.text, mode),
  });

  const common = {
    id: id('Step id'),
    title: text('Title', GUIDE_LIMITS.stepTitle, mode),
    body: RichBody.optional(),
    cautions: list('Cautions', Caution, 0, GUIDE_LIMITS.cautionsPerStep, mode),
    photoIds: list(
      'Photos',
      z
        .string({ error: typeError('Photo id', 'text') })
        .min(1, 'Photo id must not be empty')
        .max(GUIDE_LIMITS.photoIdLength, 'Photo id is too long'),
      0,
      GUIDE_LIMITS.photosPerStep,
      mode,
    ),
    articleIds: list(
      'Articles',
      z
        .number({ error: typeError('Article id', 'a whole number') })
        .int('Article id must be a whole number')
        .positive('Article id must be positive'),
      0,
      GUIDE_LIMITS.articlesPerStep,
      mode,
    ),
  };

  const Choice = obj('Choice', {
    id: id('Choice id'),
    label: text('Choice label', GUIDE_LIMITS.label, mode),
    next: stepRef('Choice next step', mode),
  });

  const AskStep = obj('Ask step', {
    kind: z.literal('ask'),
    ...common,
    choices: list('Choices', Choice, GUIDE_LIMITS.minChoices, GUIDE_LIMITS.maxChoices, mode),
  });

  const Reading = obj('Reading', {
    label: text('Reading label', GUIDE_LIMITS.label, mode),
    kind: QuantityKindSchema,
    unit: text('Reading unit', GUIDE_LIMITS.unitLength, mode),
  });

  const name = (label: string) => text(label, GUIDE_LIMITS.nameLength, mode);

  const CalculatorRef = obj('Calculator', {
    id: name('Calculator id'),
    /** The calculator input the technician's reading fills; absent when the reading is only recorded. */
    readingInput: name('Reading input').optional(),
    fixedInputs: z
      .record(
        z.string().max(GUIDE_LIMITS.nameLength, 'Fixed input name is too long'),
        z.union([Quantity, z.string().max(GUIDE_LIMITS.nameLength)], { error: 'Fixed input must be a number with a unit, or a choice' }),
        {
          error: typeError('Fixed inputs', 'an object of named values'),
        },
      )
      .refine((inputs) => Object.keys(inputs).length <= GUIDE_LIMITS.fixedInputs, `Fixed inputs: at most ${GUIDE_LIMITS.fixedInputs} allowed`),
    output: name('Calculator output'),
  });

  const bound = (label: string) => z.number({ error: typeError(label, 'a finite number or null') }).nullable();

  const Band = obj('Band', {
    id: id('Band id'),
    label: text('Band label', GUIDE_LIMITS.label, mode),
    min: bound('Band lower limit'),
    max: bound('Band upper limit'),
    minInclusive: z.boolean({ error: typeError('Band lower limit included', 'true or false') }),
    maxInclusive: z.boolean({ error: typeError('Band upper limit included', 'true or false') }),
    next: stepRef('Band next step', mode),
  });

  const MeasureStep = obj('Measure step', {
    kind: z.literal('measure'),
    ...common,
    reading: Reading,
    calculator: CalculatorRef.optional(),
    bandUnit: text('Band unit', GUIDE_LIMITS.unitLength, mode),
    bands: list('Bands', Band, GUIDE_LIMITS.minBands, GUIDE_LIMITS.maxBands, mode),
  });

  const TryStep = obj('Try step', {
    kind: z.literal('try'),
    ...common,
    action: text('Action', GUIDE_LIMITS.text, mode),
    fixedNext: stepRef('Next step when fixed', mode).nullable(),
    notFixedNext: stepRef('Next step when not fixed', mode),
  });

  const Part = obj('Part', {
    name: text('Part name', GUIDE_LIMITS.partName, mode),
    partNumber: z
      .string({ error: typeError('Part number', 'text') })
      .max(GUIDE_LIMITS.partNumber, `Part number must be at most ${GUIDE_LIMITS.partNumber} characters`)
      .optional(),
    quantity: z
      .number({ error: typeError('Part quantity', 'a whole number') })
      .int('Part quantity must be a whole number')
      .min(1, 'Part quantity must be at least 1')
      .max(GUIDE_LIMITS.partQuantity, `Part quantity must be at most ${GUIDE_LIMITS.partQuantity}`),
  });

  const causeCode =
    mode === 'strict'
      ? z.string({ error: typeError('Cause code', 'text') }).regex(CODE_PATTERN, 'Cause code must be 1 to 60 lower-case letters, digits or hyphens')
      : z.union([z.literal(''), z.string().regex(CODE_PATTERN)], { error: 'Cause code must be lower-case letters, digits or hyphens' });

  const FindingStep = obj('Finding step', {
    kind: z.literal('finding'),
    ...common,
    causeCode,
    cause: text('Cause', GUIDE_LIMITS.text, mode),
    remedy: list('Remedy', text('Remedy step', GUIDE_LIMITS.remedyItem, mode), 1, GUIDE_LIMITS.remedyItems, mode),
    parts: list('Parts', Part, 0, GUIDE_LIMITS.parts, mode),
    typicalMinutes: z
      .number({ error: typeError('Typical time', 'a whole number of minutes') })
      .int('Typical time must be a whole number of minutes')
      .min(1, 'Typical time must be at least 1 minute')
      .max(GUIDE_LIMITS.typicalMinutes, 'Typical time must be at most a week')
      .optional(),
  });

  const HandoffStep = obj('Hand-off step', {
    kind: z.literal('handoff'),
    ...common,
    contact: text('Whom to call', GUIDE_LIMITS.label, mode),
    message: text('What to tell them', GUIDE_LIMITS.text, mode),
  });

  const Step = z.discriminatedUnion('kind', [AskStep, MeasureStep, TryStep, FindingStep, HandoffStep], {
    error: (issue: Issue) => (issue.input === undefined ? 'Step is required' : `Step kind must be one of ${STEP_KINDS.join(', ')}`),
  });

  const Content = obj('Guide content', {
    startStepId: stepRef('Start step', mode),
    steps: list('Steps', Step, 1, GUIDE_LIMITS.steps, mode),
  });

  return { Caution, Choice, AskStep, Reading, CalculatorRef, Band, MeasureStep, TryStep, Part, FindingStep, HandoffStep, Step, Content };
}

const strict = schemasFor('strict');
const draft = schemasFor('draft');

export const Caution = strict.Caution;
export const Choice = strict.Choice;
export const AskStep = strict.AskStep;
export const Reading = strict.Reading;
export const CalculatorRef = strict.CalculatorRef;
export const Band = strict.Band;
export const MeasureStep = strict.MeasureStep;
export const TryStep = strict.TryStep;
export const Part = strict.Part;
export const FindingStep = strict.FindingStep;
export const HandoffStep = strict.HandoffStep;
export const Step = strict.Step;
/**
 * A finished guide version's content, shape only: every text filled in and every reference a
 * well-formed id. Graph rules (reachability, cycles, bands, cause codes...) are validateGuide's.
 */
export const GuideContent = strict.Content;

/** What the editor may hold mid-edit: empty text, '' next ids and too few choices are allowed. */
export const GuideDraftContent = draft.Content;
export const DraftStep = draft.Step;

export type Caution = z.infer<typeof Caution>;
export type Choice = z.infer<typeof Choice>;
export type AskStep = z.infer<typeof AskStep>;
export type Reading = z.infer<typeof Reading>;
export type CalculatorRef = z.infer<typeof CalculatorRef>;
export type Band = z.infer<typeof Band>;
export type MeasureStep = z.infer<typeof MeasureStep>;
export type TryStep = z.infer<typeof TryStep>;
export type Part = z.infer<typeof Part>;
export type FindingStep = z.infer<typeof FindingStep>;
export type HandoffStep = z.infer<typeof HandoffStep>;
export type Step = z.infer<typeof Step>;
export type GuideContent = z.infer<typeof GuideContent>;
// The draft types are structurally the same as the strict ones: only the checks differ.
export type DraftStep = z.infer<typeof DraftStep>;
export type GuideDraftContent = z.infer<typeof GuideDraftContent>;

const guideMetaShape = {
  title: text('Guide title', GUIDE_LIMITS.guideTitle, 'strict'),
  symptom: text('Symptom', GUIDE_LIMITS.symptom, 'strict'),
  summary: z
    .string({ error: typeError('Summary', 'text') })
    .max(GUIDE_LIMITS.summary, `Summary must be at most ${GUIDE_LIMITS.summary} characters`)
    .optional(),
  tags: list('Tags', z.string({ error: typeError('Tag', 'text') }).regex(CODE_PATTERN, 'Tag must be lower-case letters, digits or hyphens'), 0, GUIDE_LIMITS.tags, 'strict'),
};
export const GuideMeta = obj('Guide', guideMetaShape);
/** The fields of GuideMeta, for schemas that carry a guide's metadata plus more. */
export const GuideMetaFields = guideMetaShape;
export type GuideMeta = z.infer<typeof GuideMeta>;
