// Where links in messages point: PUBLIC_ORIGIN when configured, else the origin of the request
// that caused the message (kept for the request's duration so services need not pass it along).
import { AsyncLocalStorage } from 'node:async_hooks';
import type { Request, RequestHandler } from 'express';

const current = new AsyncLocalStorage<{ origin: string }>();

export function originOf(req: Request): string {
  return `${req.protocol}://${req.get('host') ?? 'localhost'}`;
}

/** Mounted after the session middleware, whose store callbacks would otherwise lose the context. */
export function requestOriginContext(): RequestHandler {
  return (req, _res, next) => current.run({ origin: originOf(req) }, next);
}

export function linkOrigin(config: { PUBLIC_ORIGIN?: string; PORT: number }): string {
  if (config.PUBLIC_ORIGIN) return new URL(config.PUBLIC_ORIGIN).origin;
  return current.getStore()?.origin ?? `http://localhost:${config.PORT}`;
}
