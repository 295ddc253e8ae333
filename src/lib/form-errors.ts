// Turns a shared zod schema's result, or an API error, into per-field messages for a form.
import type { ZodType } from 'zod';
import { ApiError } from './api-client';

export function clientFieldErrors(schema: ZodType, value: unknown): Record<string, string> | null {
  const res = schema.safeParse(value);
  if (res.success) return null;
  const fields: Record<string, string> = {};
  for (const i of res.error.issues) {
    const key = i.path.map(String).join('.') || '_';
    fields[key] ??= i.message;
  }
  return fields;
}

export function serverFieldErrors(err: unknown): Record<string, string> {
  return err instanceof ApiError ? err.fields : {};
}
