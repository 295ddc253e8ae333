// Data a page will certainly ask for, requested while the app is still starting (alongside the
// session check and the page's code) instead of after the page has rendered once. Each early answer
// is handed out once, and only while it is fresh; later reads go through TanStack Query as usual.
// The server hints the same reads in the page it sends (src/shared/early-reads.ts), and these
// requests take over the hinted responses.
import { apiPlainGet } from './api-client';

/** An early answer older than this is not handed out: the page reads afresh. */
const FRESH_MS = 15_000;

const early = new Map<string, { at: number; answer: Promise<unknown> }>();

/**
 * Starts a GET now. A failure is never reported here and is forgotten, so the page asks again in
 * the usual way (after signing in, say, when the early read was refused).
 */
export function fetchEarly(path: string): void {
  if (early.has(path)) return;
  const answer = apiPlainGet<unknown>(path);
  const entry = { at: Date.now(), answer };
  answer.catch(() => {
    if (early.get(path) === entry) early.delete(path);
  });
  early.set(path, entry);
}

/** The early answer for this path, once, or undefined when none was started or it is stale. */
export function takeEarly<T>(path: string): Promise<T> | undefined {
  const entry = early.get(path);
  early.delete(path);
  return entry && Date.now() - entry.at < FRESH_MS ? (entry.answer as Promise<T>) : undefined;
}

/** Drops every early answer: signing in or out makes them someone else's. */
export function forgetEarly(): void {
  early.clear();
}
