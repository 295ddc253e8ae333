// Work that can wait until the page's first view is on screen (the header's search box, lists a
// later step will need, the offline worker): started when the browser is next idle, so a phone on
// poor signal spends its first seconds on what the technician is looking at.
import { useEffect, useState } from 'react';

/** How long to wait for an idle moment before starting anyway. */
const AT_MOST_MS = 2000;

/** Runs `fn` once the browser is idle after the current work (or after AT_MOST_MS). */
export function whenIdle(fn: () => void): () => void {
  if (typeof window.requestIdleCallback === 'function') {
    const id = window.requestIdleCallback(fn, { timeout: AT_MOST_MS });
    return () => window.cancelIdleCallback(id);
  }
  const t = window.setTimeout(fn, 200);
  return () => window.clearTimeout(t);
}

/** False on the first render, true once the browser has been idle after it. */
export function useAfterFirstView(): boolean {
  const [ready, setReady] = useState(false);
  useEffect(() => (ready ? undefined : whenIdle(() => setReady(true))), [ready]);
  return ready;
}
