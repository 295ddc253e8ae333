// "/" puts the typing into the header's search box from anywhere but a field. The box's code loads
// once the page's first view is up; a "/" pressed before that is kept here, with what is typed
// after it, and handed to the box when it arrives, so no keystroke is lost.

/** True when the keystroke is the search shortcut: "/" alone, not while typing in a field. */
export function isSearchShortcut(e: KeyboardEvent): boolean {
  return e.key === '/' && !e.ctrlKey && !e.metaKey && !e.altKey && !typingInAField(e.target);
}

export function typingInAField(target: EventTarget | null): boolean {
  const el = target as HTMLElement | null;
  return Boolean(el?.closest?.('input, textarea, select, [contenteditable=""], [contenteditable="true"]'));
}

/** Keystrokes after an early "/" are held for the box this long at most (it may never come, offline). */
const HOLD_MS = 3000;

let early: { typed: string; at: number } | null = null;
let boxThere = false;

/**
 * While the search box is not there: on "/", calls `wanted` (so the box loads now) and keeps what is
 * typed next until the box takes it. Returns the function that stops listening.
 */
export function listenForEarlySearch(wanted: () => void): () => void {
  const onKey = (e: KeyboardEvent) => {
    if (boxThere) return;
    if (!early) {
      if (!isSearchShortcut(e)) return;
      e.preventDefault();
      early = { typed: '', at: Date.now() };
      wanted();
      return;
    }
    if (e.key === 'Escape' || Date.now() - early.at > HOLD_MS) {
      early = null;
      return;
    }
    if (typingInAField(e.target) || e.ctrlKey || e.metaKey || e.altKey) return;
    if (e.key === 'Backspace') early.typed = early.typed.slice(0, -1);
    else if (e.key.length === 1) early.typed += e.key;
    else return;
    e.preventDefault();
  };
  window.addEventListener('keydown', onKey);
  return () => window.removeEventListener('keydown', onKey);
}

/**
 * Called by the search box as it mounts: from now on it handles "/" itself. Returns what was typed
 * after an early "/" (null when there was none) and the function to call as the box unmounts.
 */
export function searchBoxArrived(): { typed: string | null; gone: () => void } {
  boxThere = true;
  const typed = early?.typed ?? null;
  early = null;
  return { typed, gone: () => (boxThere = false) };
}
