// Beadpath's own guide file: how organisations share guides between sites. Export, import with
// every problem reported at its place in the file, and the JSON Schema the docs are built from.
import { z } from 'zod';
import { listCalculators } from '../calculators';
import { CODE_PATTERN, GUIDE_LIMITS, GuideContent, GuideDraftContent, GuideMetaFields, labelledObject, requiredText, type GuideMeta } from './schema';
import { validateGuide, type ValidationContext } from './validate';

export const GUIDE_FILE_FORMAT = 'beadpath-guide';
export const GUIDE_FILE_VERSION = 1;

export const CauseEntry = labelledObject('Cause', {
  code: z.string({ error: 'Cause code must be text' }).regex(CODE_PATTERN, 'Cause code must be 1 to 60 lower-case letters, digits or hyphens'),
  label: requiredText('Cause label', GUIDE_LIMITS.label),
});
export type CauseEntry = z.infer<typeof CauseEntry>;

export const GuideFileGuide = labelledObject('Guide', {
  ...GuideMetaFields,
  /** Definitions of the cause codes the findings use, so the receiving site can map or add them. */
  causes: z.array(CauseEntry, { error: 'Causes must be a list' }).max(GUIDE_LIMITS.causes, `Causes: at most ${GUIDE_LIMITS.causes} allowed`).optional(),
});
export type GuideFileGuide = z.infer<typeof GuideFileGuide>;

function fileSchema<C extends z.ZodType>(content: C) {
  return labelledObject('Guide file', {
    format: z.literal(GUIDE_FILE_FORMAT, { error: `This is not a Beadpath guide file: "format" must be "${GUIDE_FILE_FORMAT}"` }),
    formatVersion: z.literal(GUIDE_FILE_VERSION, {
      error: (issue) =>
        typeof issue.input === 'number' ? `This file is format version ${issue.input}; this Beadpath reads version ${GUIDE_FILE_VERSION}` : `"formatVersion" must be ${GUIDE_FILE_VERSION}`,
    }),
    exportedAt: z.iso.datetime({ error: '"exportedAt" must be a UTC date and time such as 2025-01-31T12:00:00Z' }),
    guide: GuideFileGuide,
    content,
  });
}

export const GuideFile = fileSchema(GuideContent).meta({
  title: 'Beadpath guide file',
  description: 'One troubleshooting guide (its metadata, the causes its findings use and its steps) as exported by Beadpath. See docs/guide-format.md.',
});
export type GuideFile = z.infer<typeof GuideFile>;

// Draft content first, so that empty text and graph problems come from the validator, which
// words them per step, and the strict pass only adds what the validator does not cover.
const GuideFileShape = fileSchema(GuideDraftContent);

export interface FileProblem {
  /** Where in the file, e.g. `content.steps[3].choices[1].next`; '' for the file as a whole. */
  path: string;
  message: string;
}

export type ParseGuideFileResult = { ok: true; file: GuideFile } | { ok: false; problems: FileProblem[] };

const IDENTIFIER = /^[A-Za-z_$][A-Za-z0-9_$]*$/;

/** ['content', 'steps', 3, 'title'] → 'content.steps[3].title'. */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const part of path) {
    if (typeof part === 'number') out += `[${part}]`;
    else if (typeof part === 'string' && IDENTIFIER.test(part)) out += out ? `.${part}` : part;
    else out += `[${JSON.stringify(String(part))}]`;
  }
  return out;
}

function issueProblems(issues: readonly z.core.$ZodIssue[]): FileProblem[] {
  const problems: FileProblem[] = [];
  for (const issue of issues) {
    if (issue.code === 'unrecognized_keys') {
      // One line per unknown field, each at its own path, so an import report points at each.
      for (const key of issue.keys) problems.push({ path: formatPath([...issue.path, key]), message: `Unknown field '${key}'` });
    } else {
      problems.push({ path: formatPath(issue.path), message: issue.message });
    }
  }
  return problems;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/**
 * Reads a guide file (already JSON-parsed). Reports every problem found: the file's shape, then,
 * when the content has a readable shape, every validator error at its path in the file. Findings'
 * cause codes must be defined in the file's `guide.causes` or be in ctx.causeCodes; calculators are
 * checked against Beadpath's own unless ctx says otherwise.
 */
export function parseGuideFile(json: unknown, ctx: ValidationContext = {}): ParseGuideFileResult {
  if (!isRecord(json)) return { ok: false, problems: [{ path: '', message: 'A guide file must be a JSON object' }] };

  const problems: FileProblem[] = [];
  const shape = GuideFileShape.safeParse(json);
  if (!shape.success) problems.push(...issueProblems(shape.error.issues));

  const fileCauses = GuideFileGuide.shape.causes.safeParse(isRecord(json.guide) ? json.guide.causes : undefined);
  const declared = fileCauses.success ? fileCauses.data : undefined;
  if (declared) {
    const seen = new Set<string>();
    declared.forEach((cause, index) => {
      if (seen.has(cause.code)) problems.push({ path: `guide.causes[${index}].code`, message: `Cause code '${cause.code}' is defined twice` });
      seen.add(cause.code);
    });
  }

  const content = GuideDraftContent.safeParse(json.content);
  if (content.success) {
    const causeCodes = declared || ctx.causeCodes ? [...(declared ?? []).map((cause) => cause.code), ...(ctx.causeCodes ?? [])] : undefined;
    const validation = validateGuide(content.data, {
      ...ctx,
      calculators: ctx.calculators ?? listCalculators(),
      ...(causeCodes ? { causeCodes } : {}),
    });
    for (const error of validation.errors) {
      problems.push({ path: error.path ? `content.${error.path}` : 'content', message: error.message });
    }
  }

  const strict = GuideFile.safeParse(json);
  if (strict.success && problems.length === 0) return { ok: true, file: strict.data };
  if (!strict.success) {
    const known = new Set(problems.map((problem) => problem.path));
    for (const problem of issueProblems(strict.error.issues)) {
      if (!known.has(problem.path)) {
        problems.push(problem);
        known.add(problem.path);
      }
    }
  }
  return { ok: false, problems };
}

export interface GuideFileInput {
  guide: GuideMeta & { causes?: CauseEntry[] };
  content: GuideContent;
  /** When the file was made; pass it in so that exporting stays a pure function. */
  exportedAt: Date | string;
}

/**
 * Builds a guide file. The output is plain JSON data (no undefined fields) whose fields follow
 * the schema's order, so parseGuideFile then exportGuideFile gives back an equal file. Content is
 * exported as stored, `html` included; an importing server must rebuild html from doc.
 */
export function exportGuideFile(input: GuideFileInput): GuideFile {
  const exportedAt = typeof input.exportedAt === 'string' ? input.exportedAt : input.exportedAt.toISOString();
  const candidate = {
    format: GUIDE_FILE_FORMAT,
    formatVersion: GUIDE_FILE_VERSION,
    exportedAt,
    guide: input.guide,
    content: input.content,
  };
  // Parsing puts fields in schema order; the JSON round trip drops undefined optional fields.
  const ordered = GuideFileShape.safeParse(candidate);
  return JSON.parse(JSON.stringify(ordered.success ? ordered.data : candidate)) as GuideFile;
}

/** The definitions of the cause codes a guide's findings use, in order of first use. */
export function causesUsedBy(content: GuideContent, causes: readonly { code: string; label: string }[]): CauseEntry[] {
  const byCode = new Map(causes.map((cause) => [cause.code, cause]));
  const used: CauseEntry[] = [];
  const seen = new Set<string>();
  for (const step of content.steps) {
    if (step.kind !== 'finding' || seen.has(step.causeCode)) continue;
    seen.add(step.causeCode);
    const cause = byCode.get(step.causeCode);
    if (cause) used.push({ code: cause.code, label: cause.label });
  }
  return used;
}

/** The JSON Schema of the guide file, as committed in docs/guide-format.schema.json. */
export function guideFileJsonSchema(): Record<string, unknown> {
  return z.toJSONSchema(GuideFile, { target: 'draft-2020-12' }) as Record<string, unknown>;
}
