// The API reads a page is certain to make first, by its address. The server names them in the page
// it sends (as preload hints, so the phone asks for them while the app's code is still arriving)
// and the app starts them with its session check; either way the page's first view waits for one
// round trip, not a chain of them. Only plain GETs of a signed-in user's own data belong here.

/** Session check: every signed-in page needs it before it can draw anything. */
export const ME_PATH = '/api/auth/me';

const WALK_PAGE = /^\/walks\/(\d+)\/?$/;

/** The id of the walk a walk-runner address opens, or null for any other address. */
export function walkIdOf(pathname: string): number | null {
  const m = WALK_PAGE.exec(pathname);
  return m ? Number(m[1]) : null;
}

/** API paths to read at once for this page address, the session check first. */
export function earlyReads(pathname: string): string[] {
  const walkId = walkIdOf(pathname);
  return walkId === null ? [ME_PATH] : [ME_PATH, `/api/walks/${walkId}`];
}
