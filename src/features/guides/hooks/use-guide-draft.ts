// The guide editor's state: the draft (meta and steps) with undo and redo, autosave after a pause,
// a copy on this device until the server has it, and the conflict when someone else saved first.
import { useCallback, useEffect, useRef, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { GuideDraftContent } from '@/shared/guides';
import type { GuideDetail, GuideMetaInput } from '@/shared/schemas/guides';
import { ApiError } from '@/lib/api-client';
import { guideKeys, saveDraft } from '../api/guides';
import { useHistory } from './use-history';

export interface GuideDraft {
  meta: GuideMetaInput;
  content: GuideDraftContent;
}

export type GuideSaveStatus = 'saved' | 'dirty' | 'saving' | 'offline' | 'error' | 'conflict';

const backupKey = (id: number) => `beadpath.guide-draft.${id}`;
export const GUIDE_AUTOSAVE_MS = 2500;

export function draftOf(g: GuideDetail): GuideDraft | null {
  const v = g.draft ?? g.published;
  if (!v) return null;
  return { meta: { title: v.meta.title, symptom: v.meta.symptom, summary: v.meta.summary, tags: v.meta.tags }, content: v.content };
}

export function useGuideDraft(guide: GuideDetail) {
  const qc = useQueryClient();
  const history = useHistory<GuideDraft>(draftOf(guide)!);
  const [status, setStatus] = useState<GuideSaveStatus>('saved');
  const [message, setMessage] = useState<string | null>(null);
  const [conflict, setConflict] = useState<{ lockVersion: number; draft: GuideDraft; byName: string | null } | null>(null);
  const lock = useRef<number>(guide.lockVersion ?? 1);
  const saved = useRef(JSON.stringify(history.value));
  const latest = useRef(history.value);
  latest.current = history.value;
  const busy = useRef(false);

  const change = useCallback(
    (next: GuideDraft, key?: string) => {
      history.set(next, key);
      localStorage.setItem(backupKey(guide.id), JSON.stringify({ draft: next, baseLockVersion: lock.current, at: Date.now() }));
    },
    [history, guide.id],
  );

  // Undo and redo change the draft too, so dirtiness follows the value, not the last action.
  useEffect(() => {
    const dirty = JSON.stringify(history.value) !== saved.current;
    setStatus((s) => (s === 'conflict' || s === 'saving' ? s : dirty ? (s === 'offline' ? 'offline' : 'dirty') : 'saved'));
  }, [history.value]);

  const save = useCallback(
    async (force?: number) => {
      if (busy.current) return;
      busy.current = true;
      const draft = latest.current;
      setStatus('saving');
      try {
        const g = await saveDraft(guide.id, { ...draft, baseLockVersion: force ?? lock.current });
        lock.current = g.lockVersion ?? lock.current;
        saved.current = JSON.stringify(draft);
        qc.setQueryData(guideKeys.detail(guide.id), g);
        void qc.invalidateQueries({ queryKey: [...guideKeys.all, 'compare', guide.id] });
        setMessage(null);
        const same = JSON.stringify(latest.current) === saved.current;
        if (same) localStorage.removeItem(backupKey(guide.id));
        setStatus(same ? 'saved' : 'dirty');
      } catch (err) {
        if (err instanceof ApiError && err.status === 409 && err.details?.current) {
          const cur = err.details.current as { lockVersion: number; draft?: { meta: GuideDraft['meta']; content: GuideDraftContent; updatedByName?: string | null } } & Partial<GuideDetail>;
          const d = cur.draft;
          if (d) setConflict({ lockVersion: cur.lockVersion, draft: { meta: d.meta, content: d.content }, byName: d.updatedByName ?? null });
          setStatus('conflict');
        } else if (err instanceof ApiError && err.status === 0) {
          setStatus('offline');
          setMessage('No connection: your changes are kept on this device and saved when the connection returns.');
        } else {
          setStatus('error');
          setMessage(err instanceof Error ? err.message : 'The draft could not be saved');
        }
      } finally {
        busy.current = false;
      }
    },
    [guide.id, qc],
  );

  useEffect(() => {
    if (status !== 'dirty' && status !== 'offline') return;
    const t = setTimeout(() => void save(), status === 'offline' ? 10_000 : GUIDE_AUTOSAVE_MS);
    return () => clearTimeout(t);
  }, [history.value, status, save]);

  const unsaved = status !== 'saved';
  useEffect(() => {
    if (!unsaved) return;
    const warn = (e: BeforeUnloadEvent) => e.preventDefault();
    window.addEventListener('beforeunload', warn);
    return () => window.removeEventListener('beforeunload', warn);
  }, [unsaved]);

  const resolve = useCallback(
    async (choice: 'mine' | 'theirs') => {
      if (!conflict) return;
      const c = conflict;
      setConflict(null);
      if (choice === 'theirs') {
        lock.current = c.lockVersion;
        saved.current = JSON.stringify(c.draft);
        history.reset(c.draft);
        localStorage.removeItem(backupKey(guide.id));
        setStatus('saved');
      } else {
        lock.current = c.lockVersion;
        await save(c.lockVersion);
      }
    },
    [conflict, history, save, guide.id],
  );

  return { ...history, change, save, status, message, conflict, resolve, unsaved, lockVersion: () => lock.current };
}

export function readGuideBackup(id: number): { draft: GuideDraft; baseLockVersion: number; at: number } | null {
  try {
    return JSON.parse(localStorage.getItem(backupKey(id)) ?? 'null');
  } catch {
    return null;
  }
}
export function clearGuideBackup(id: number) {
  localStorage.removeItem(backupKey(id));
}
