// Validates body, query or params with a shared zod schema and hands the handler typed values.
import type { RequestHandler } from 'express';
import { z, type ZodError, type ZodType } from 'zod';
import { AppError } from './app-error';

export function zodFields(err: ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of err.issues) {
    const key = issue.path.map(String).join('.') || '_';
    if (!fields[key]) fields[key] = issue.message;
  }
  return fields;
}

export function parse<S extends ZodType>(schema: S, value: unknown, what = 'Some fields are not valid'): z.output<S> {
  const res = schema.safeParse(value);
  if (!res.success) {
    const fields = zodFields(res.error);
    const first = Object.entries(fields)[0];
    throw AppError.invalid(first ? `${what}: ${first[1]}` : what, fields);
  }
  return res.data;
}

type Part = 'body' | 'query' | 'params';

/** Stores the parsed value in res.locals[part] (req.query is a getter in Express 5). */
export function validate<S extends ZodType>(part: Part, schema: S): RequestHandler {
  return (req, res, next) => {
    const value = part === 'body' && req.body === undefined ? {} : req[part];
    res.locals[part] = parse(schema, value);
    next();
  };
}
