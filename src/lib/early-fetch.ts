// Data a page will certainly ask for, requested while the app is still starting (alongside the
// session check and the page's code) instead of after the page has rendered once. Each early answer
// is handed out once; later reads go through TanStack Query as usual.
import { api } from './api-client';

const early = new Map<string, Promise<unknown>>();

/**
 * Starts a GET now. A failure is never reported here and is forgotten, so the page asks again in
 * the usual way (after signing in, say, when the early read was refused).
 */
export function fetchEarly(path: string): void {
  if (early.has(path)) return;
  const p = api<unknown>(path);
  p.catch(() => {
    if (early.get(path) === p) early.delete(path);
  });
  early.set(path, p);
}

/** The early answer for this path, once, or undefined when none was started. */
export function takeEarly<T>(path: string): Promise<T> | undefined {
  const p = early.get(path) as Promise<T> | undefined;
  early.delete(path);
  return p;
}
