// Cross-site request forgery guard: a state-changing API call must come from our own origin.
// Browsers send Origin (or at least Referer) on such requests; a cross-site page cannot forge them.
import type { RequestHandler } from 'express';
import { AppError } from './app-error';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

export function sameOriginGuard(publicOrigin?: string): RequestHandler {
  return (req, _res, next) => {
    if (SAFE.has(req.method)) return next();
    const host = req.headers.host;
    const allowed = new Set<string>();
    if (publicOrigin) allowed.add(new URL(publicOrigin).origin);
    if (host) {
      allowed.add(`http://${host}`);
      allowed.add(`https://${host}`);
    }
    const origin = req.headers.origin;
    const referer = req.headers.referer;
    let source: string | undefined;
    if (origin && origin !== 'null') source = origin;
    else if (referer) {
      try {
        source = new URL(referer).origin;
      } catch {
        source = undefined;
      }
    }
    if (!source || !allowed.has(source)) {
      return next(AppError.forbidden('This request did not come from a Beadpath page (missing or foreign Origin header), so it was refused.'));
    }
    next();
  };
}
