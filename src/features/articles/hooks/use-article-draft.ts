// The editor's memory: what the author typed, autosave after a pause, one save at a time, a copy
// on this device until the server has it, and the conflict when someone else saved first.
import { useCallback, useEffect, useRef, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { ArticleDetail, ArticleRevisionView } from '@/shared/schemas/articles';
import type { TipTapNode } from '@/shared/rich-text/extensions';
import { ApiError, api } from '@/lib/api-client';
import { articleKeys, saveArticle } from '../api/articles';

export interface DraftFields {
  title: string;
  summary: string;
  tags: string[];
  keywords: string;
  body: TipTapNode;
}

export type SaveStatus = 'saved' | 'dirty' | 'saving' | 'offline' | 'error' | 'conflict';

export interface Conflict {
  version: number;
  revision: ArticleRevisionView;
}

export const AUTOSAVE_IDLE_MS = 3000;

const backupKey = (id: number | 'new') => `beadpath.article-draft.${id}`;

export interface Backup extends DraftFields {
  baseVersion: number | null;
  savedAt: string;
}

export function readBackup(id: number | 'new'): Backup | null {
  try {
    return JSON.parse(localStorage.getItem(backupKey(id)) ?? 'null');
  } catch {
    return null;
  }
}

function toBody(f: DraftFields) {
  return {
    title: f.title,
    summary: f.summary,
    tags: f.tags,
    keywords: f.keywords
      .split(',')
      .map((k) => k.trim())
      .filter(Boolean),
    body: f.body,
  };
}

export function fieldsFrom(a: ArticleDetail): DraftFields {
  const r = a.head!;
  return { title: r.title, summary: r.summary, tags: r.tags, keywords: r.keywords.join(', '), body: r.body as TipTapNode };
}

export function useArticleDraft(opts: { id: number | null; initial: DraftFields; version: number | null; onCreated: (a: ArticleDetail) => void }) {
  const qc = useQueryClient();
  const [fields, setFields] = useState<DraftFields>(opts.initial);
  const [status, setStatus] = useState<SaveStatus>('saved');
  const [message, setMessage] = useState<string | null>(null);
  const [fieldErrors, setFieldErrors] = useState<Record<string, string>>({});
  const [conflict, setConflict] = useState<Conflict | null>(null);
  const [lastSavedAt, setLastSavedAt] = useState<Date | null>(null);
  const version = useRef<number | null>(opts.version);
  const id = useRef<number | null>(opts.id);
  const latest = useRef(fields);
  const inFlight = useRef<Promise<void> | null>(null);
  const again = useRef(false);
  latest.current = fields;

  const update = useCallback((patch: Partial<DraftFields>) => {
    setFields((f) => {
      const next = { ...f, ...patch };
      localStorage.setItem(backupKey(id.current ?? 'new'), JSON.stringify({ ...next, baseVersion: version.current, savedAt: new Date().toISOString() } satisfies Backup));
      return next;
    });
    setStatus((s) => (s === 'conflict' ? s : 'dirty'));
  }, []);

  const save = useCallback(
    async (autosave: boolean, overrideVersion?: number): Promise<void> => {
      if (inFlight.current) {
        again.current = true;
        return inFlight.current;
      }
      const f = latest.current;
      if (!f.title.trim()) {
        setStatus('error');
        setFieldErrors({ title: 'Title is required before the draft can be saved' });
        return;
      }
      setStatus('saving');
      const run = (async () => {
        try {
          let a: ArticleDetail;
          if (id.current === null) {
            a = await api<{ article: ArticleDetail }>('/api/articles', { method: 'POST', body: toBody(f) }).then((r) => r.article);
            localStorage.removeItem(backupKey('new'));
            id.current = a.id;
            opts.onCreated(a);
          } else {
            a = await saveArticle(id.current, { ...toBody(f), baseVersion: overrideVersion ?? version.current!, autosave });
          }
          version.current = a.version;
          qc.setQueryData(articleKeys.detail(a.id), a);
          qc.invalidateQueries({ queryKey: [...articleKeys.all, 'list'] });
          setFieldErrors({});
          setMessage(null);
          setLastSavedAt(new Date());
          // Typing that happened during the save is still unsaved.
          const unchanged = JSON.stringify(latest.current) === JSON.stringify(f);
          if (unchanged) localStorage.removeItem(backupKey(a.id));
          setStatus(unchanged ? 'saved' : 'dirty');
        } catch (err) {
          if (err instanceof ApiError && err.status === 409 && err.details?.current) {
            setConflict(err.details.current as Conflict);
            setStatus('conflict');
          } else if (err instanceof ApiError && err.status === 0) {
            setStatus('offline');
            setMessage('No connection: your text is kept on this device and will be saved when the connection returns.');
          } else {
            setStatus('error');
            setMessage(err instanceof Error ? err.message : 'The draft could not be saved');
            setFieldErrors(err instanceof ApiError ? Object.fromEntries(Object.entries(err.fields).map(([k, v]) => [k.split('.')[0], v])) : {});
          }
        } finally {
          inFlight.current = null;
        }
      })();
      inFlight.current = run;
      await run;
      if (again.current) {
        again.current = false;
        await save(autosave);
      }
    },
    [opts, qc],
  );

  // Autosave after a pause in typing; retry every so often while offline.
  useEffect(() => {
    if (status !== 'dirty' && status !== 'offline') return;
    const t = setTimeout(() => void save(true), status === 'offline' ? 10_000 : AUTOSAVE_IDLE_MS);
    return () => clearTimeout(t);
  }, [fields, status, save]);

  useEffect(() => {
    const onOnline = () => status === 'offline' && void save(true);
    window.addEventListener('online', onOnline);
    return () => window.removeEventListener('online', onOnline);
  }, [status, save]);

  const unsaved = status === 'dirty' || status === 'saving' || status === 'offline' || status === 'error' || status === 'conflict';
  useEffect(() => {
    if (!unsaved) return;
    const warn = (e: BeforeUnloadEvent) => {
      e.preventDefault();
    };
    window.addEventListener('beforeunload', warn);
    return () => window.removeEventListener('beforeunload', warn);
  }, [unsaved]);

  const resolveConflict = useCallback(
    async (choice: 'mine' | 'theirs' | 'both') => {
      if (!conflict) return;
      const theirs = conflict.revision;
      setConflict(null);
      if (choice === 'theirs') {
        const next: DraftFields = { title: theirs.title, summary: theirs.summary, tags: theirs.tags, keywords: theirs.keywords.join(', '), body: theirs.body as TipTapNode };
        version.current = conflict.version;
        setFields(next);
        latest.current = next;
        localStorage.removeItem(backupKey(id.current ?? 'new'));
        setStatus('saved');
        return;
      }
      if (choice === 'both') {
        const mine = latest.current;
        const merged: DraftFields = {
          ...mine,
          title: theirs.title,
          tags: [...new Set([...theirs.tags, ...mine.tags])],
          body: {
            type: 'doc',
            content: [
              ...((theirs.body as TipTapNode).content ?? []),
              { type: 'horizontalRule' },
              { type: 'heading', attrs: { level: 2 }, content: [{ type: 'text', text: 'My version, kept from an editing conflict' }] },
              ...(mine.body.content ?? []),
            ],
          },
        };
        setFields(merged);
        latest.current = merged;
      }
      version.current = conflict.version;
      await save(false, conflict.version);
    },
    [conflict, save],
  );

  return { fields, update, save, status, message, fieldErrors, conflict, resolveConflict, lastSavedAt, unsaved, articleId: id };
}
