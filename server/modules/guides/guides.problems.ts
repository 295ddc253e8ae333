// Turns problems in a guide (from zod, the validator or the file reader) into the API's 400 shape:
// fields keyed by their path in the request, e.g. `content.steps[2].bands`, and a message that
// names the step, so the editor can put each problem next to the step it belongs to.
import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { formatPath } from '../../../src/shared/guides/export';
import { GUIDE_LIMITS } from '../../../src/shared/guides/schema';
import { AppError } from '../../lib/app-error';

export interface PathProblem {
  path: string;
  message: string;
}

function plural(n: number, word: string) {
  return `${n.toLocaleString('en')} ${word}${n === 1 ? '' : 's'}`;
}

/** The first message per path as `fields`; every problem in `details.problems`. */
export function problemsError(intro: string, problems: readonly PathProblem[], extra: Record<string, unknown> = {}): AppError {
  const fields: Record<string, string> = {};
  for (const p of problems) fields[p.path || '_'] ??= p.message;
  const first = problems[0];
  const message = problems.length === 1 ? `${intro}: ${first.message}` : `${intro}: ${plural(problems.length, 'problem')}, the first: ${first.message}`;
  return new AppError('invalid_input', message, fields, { problems, ...extra });
}

function stepLabel(raw: unknown, index: number): string {
  const steps = (raw as { content?: { steps?: unknown } })?.content?.steps;
  const step = Array.isArray(steps) ? (steps[index] as { id?: unknown } | undefined) : undefined;
  const id = typeof step?.id === 'string' && step.id ? ` ('${step.id.slice(0, 40)}')` : '';
  return `Step ${index + 1}${id}`;
}

/**
 * zod issues as path problems; messages of issues inside a step start with which step it is.
 * `prefix` places the issues in the request when the schema checked only part of it.
 */
export function zodProblems(issues: readonly z.core.$ZodIssue[], raw: unknown, prefix: PropertyKey[] = []): PathProblem[] {
  const problems: PathProblem[] = [];
  for (const issue of issues) {
    const at = [...prefix, ...issue.path];
    const keys = issue.code === 'unrecognized_keys' ? issue.keys.map((k) => [...at, k]) : [at];
    for (const path of keys) {
      const inStep = path[0] === 'content' && path[1] === 'steps' && typeof path[2] === 'number';
      const message = issue.code === 'unrecognized_keys' ? `Unknown field '${String(path[path.length - 1])}'` : issue.message;
      problems.push({ path: formatPath(path), message: inStep ? `${stepLabel(raw, path[2] as number)}: ${message}` : message });
    }
  }
  return problems;
}

/**
 * Like validate('body', ...) for bodies that carry guide content. An oversized guide is refused
 * before zod walks thousands of steps, with one message that says what the limit is.
 */
export function validateGuideBody<S extends z.ZodType>(schema: S): RequestHandler {
  return (req, res, next) => {
    const raw: unknown = req.body ?? {};
    const steps = (raw as { content?: { steps?: unknown } })?.content?.steps;
    if (Array.isArray(steps) && steps.length > GUIDE_LIMITS.steps) {
      const message = `The guide has ${plural(steps.length, 'step')}; at most ${GUIDE_LIMITS.steps} are allowed. Split it into several guides.`;
      return next(problemsError('The guide is too large', [{ path: 'content.steps', message }]));
    }
    const parsed = schema.safeParse(raw);
    if (!parsed.success) return next(problemsError('Some fields are not valid', zodProblems(parsed.error.issues, raw)));
    res.locals.body = parsed.data;
    next();
  };
}
