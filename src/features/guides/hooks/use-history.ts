// Undo and redo for the guide editor: snapshots of the draft, typing in one field folded into one step.
import { useCallback, useRef, useState } from 'react';

const LIMIT = 200;
const FOLD_MS = 800;

export function useHistory<T>(initial: T) {
  const [state, setState] = useState({ past: [] as T[], present: initial, future: [] as T[] });
  const last = useRef<{ key: string; at: number } | null>(null);

  /** `key` groups quick successive edits of one field into a single undo step. */
  const set = useCallback((next: T, key?: string) => {
    setState((s) => {
      const now = Date.now();
      const fold = key !== undefined && last.current?.key === key && now - last.current.at < FOLD_MS;
      last.current = key !== undefined ? { key, at: now } : null;
      if (fold) return { ...s, present: next, future: [] };
      return { past: [...s.past, s.present].slice(-LIMIT), present: next, future: [] };
    });
  }, []);

  /** Replaces the present without an undo step (loading from the server, resolving a conflict). */
  const reset = useCallback((next: T) => {
    last.current = null;
    setState({ past: [], present: next, future: [] });
  }, []);

  const undo = useCallback(() => {
    last.current = null;
    setState((s) => (s.past.length ? { past: s.past.slice(0, -1), present: s.past[s.past.length - 1], future: [s.present, ...s.future] } : s));
  }, []);

  const redo = useCallback(() => {
    last.current = null;
    setState((s) => (s.future.length ? { past: [...s.past, s.present], present: s.future[0], future: s.future.slice(1) } : s));
  }, []);

  return { value: state.present, set, reset, undo, redo, canUndo: state.past.length > 0, canRedo: state.future.length > 0 };
}
