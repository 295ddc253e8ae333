// Central error handler: every failure leaves the API in one shape, internals never leak.
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import type { ApiErrorBody } from '../../src/shared/errors';
import { AppError } from './app-error';
import { zodFields } from './validate';

export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new AppError('not_found', `No API route ${req.method} ${req.path}`));
};

function isDatabaseDown(err: unknown): boolean {
  const e = err as { code?: string; message?: string };
  return (
    ['ECONNREFUSED', 'ECONNRESET', '57P01', '57P03', '08006', '08001', '08003'].includes(e?.code ?? '') ||
    // A connection that broke mid-transaction refuses its ROLLBACK or COMMIT with "... is not queryable".
    /Knex: Timeout acquiring a connection|Connection terminated|is not queryable/i.test(e?.message ?? '')
  );
}

export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const requestId = String(req.id ?? '');
  let status = 500;
  let body: ApiErrorBody['error'];
  const e = err as { type?: string; status?: number; statusCode?: number; code?: string; message?: string };

  if (err instanceof AppError) {
    status = err.status;
    body = { code: err.code, message: err.message, fields: err.fields, details: err.details };
  } else if (err instanceof ZodError) {
    status = 400;
    body = { code: 'invalid_input', message: 'Some fields are not valid', fields: zodFields(err) };
  } else if (e?.type === 'entity.parse.failed') {
    status = 400;
    body = { code: 'invalid_input', message: 'The request body is not valid JSON' };
  } else if (e?.type === 'entity.too.large' || e?.code === 'LIMIT_FILE_SIZE') {
    status = 413;
    body = { code: 'payload_too_large', message: 'The request is too large' };
  } else if (e?.type === 'charset.unsupported' || e?.type === 'encoding.unsupported') {
    status = 415;
    body = { code: 'unsupported_media_type', message: 'Send the body as UTF-8 JSON' };
  } else if (isDatabaseDown(err)) {
    status = 503;
    body = { code: 'unavailable', message: 'The database is not reachable right now. Try again in a moment.' };
    req.log?.warn({ err }, 'database unavailable');
  } else {
    req.log?.error({ err }, 'unhandled error');
    body = { code: 'internal', message: 'Something went wrong on the server. It has been logged.' };
  }
  if (res.headersSent) return;
  if (!body.fields) delete body.fields;
  if (!body.details) delete body.details;
  res.status(status).json({ error: { ...body, requestId } } satisfies ApiErrorBody);
};
