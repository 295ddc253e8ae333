// The phone runner's engine: the server's answer log plus what waits on this device, replayed
// with the same path logic the server uses, so the walk moves on at once with or without signal.
// Entries go to the server in order and are accepted once each (their ids are idempotency keys).
// The calculators load only for a walk whose log has a reading for a Measure step that uses one;
// until they arrive the runner is not ready, rather than show a path the server would not.
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { WalkAnswer } from '@/shared/walks/answers';
import { WITHOUT_CALCULATORS, canAnswer, logNeedsCalculators, replayPath, type StepCalculators, type WalkState } from '@/shared/walks/walk-path-core';
import type { GuideContent } from '@/shared/guides/schema';
import type { BatchRejectedDetails, WalkDetail } from '@/shared/schemas/walks';
import { ApiError } from '@/lib/api-client';
import { sendBatch, sendNote, walkKeys } from '../api/walks';
import { enqueue, newClientId, onQueueChange, pending, remove, type QueuedEntry } from '../utils/offline-queue';

export type SyncState = 'saved' | 'sending' | 'waiting' | 'error';

// Distributive, so each kind of entry keeps its own fields.
type Without<T, K extends PropertyKey> = T extends unknown ? Omit<T, K> : never;
export type NewAnswer = Without<WalkAnswer, 'id' | 'answeredAt'>;

let calculatorsLoad: Promise<StepCalculators> | undefined;
let calculatorsLoaded: StepCalculators | null = null;

/** The calculators with the path logic's binding, fetched once per page load. */
function loadStepCalculators(): Promise<StepCalculators> {
  calculatorsLoad ??= import('@/shared/walks/walk-path').then(
    (m) => (calculatorsLoaded = m.STEP_CALCULATORS),
    (err: unknown) => {
      calculatorsLoad = undefined;
      throw err;
    },
  );
  return calculatorsLoad;
}

/** Stands in for the walk while the calculators load; the runner shows a loading state then. */
const LOADING: WalkState = { path: [], current: null, at: null, ended: null, unacknowledged: [], acknowledged: {}, problems: [] };

export function useWalkRunner(walk: WalkDetail) {
  const qc = useQueryClient();
  const [queue, setQueue] = useState<QueuedEntry[]>([]);
  const [sync, setSync] = useState<SyncState>('saved');
  const [error, setError] = useState<string | null>(null);
  const flushing = useRef(false);
  // Set when an entry arrives while a send is under way, so that send goes round once more.
  const again = useRef(false);
  const content = walk.guide.content as GuideContent;

  const reload = useCallback(async () => setQueue(await pending(walk.id)), [walk.id]);
  useEffect(() => {
    void reload();
    return onQueueChange(() => void reload());
  }, [reload]);

  const serverIds = useMemo(() => new Set(walk.answers.map((a) => a.id)), [walk.answers]);
  const log: WalkAnswer[] = useMemo(() => {
    const local = queue.filter((q) => q.type === 'answer' && !serverIds.has(q.id)).map((q) => q.body as unknown as WalkAnswer);
    return [...(walk.answers as WalkAnswer[]), ...local];
  }, [walk.answers, queue, serverIds]);
  const needsCalculators = useMemo(() => logNeedsCalculators(content, log), [content, log]);
  const [calculators, setCalculators] = useState<StepCalculators | null>(() => calculatorsLoaded);
  const [loadAttempt, setLoadAttempt] = useState(0);
  useEffect(() => {
    if (!needsCalculators || calculators) return;
    let live = true;
    let retry: ReturnType<typeof setTimeout> | undefined;
    loadStepCalculators().then(
      (loaded) => {
        if (live) setCalculators(loaded);
      },
      // Offline with no cached copy: try again in a while (the service worker normally has it).
      () => {
        if (live) retry = setTimeout(() => setLoadAttempt((n) => n + 1), 3000);
      },
    );
    return () => {
      live = false;
      clearTimeout(retry);
    };
  }, [needsCalculators, calculators, loadAttempt]);
  const ready = !needsCalculators || calculators !== null;
  const state = useMemo(() => (ready ? replayPath(calculators ?? WITHOUT_CALCULATORS, content, log) : LOADING), [ready, calculators, content, log]);

  const flush = useCallback(async (): Promise<void> => {
    if (flushing.current) {
      again.current = true;
      return;
    }
    flushing.current = true;
    try {
      const items = await pending(walk.id);
      const answers = items.filter((i) => i.type === 'answer');
      const notes = items.filter((i) => i.type === 'note');
      if (!items.length) {
        setSync('saved');
        return;
      }
      setSync('sending');
      if (answers.length) {
        try {
          const res = await sendBatch(
            walk.id,
            answers.map((a) => a.body),
          );
          // The server's copy takes the entries over before the device copy goes, so the walk never
          // flickers back a step between the two.
          qc.setQueryData<WalkDetail>(walkKeys.detail(walk.id), (old) => {
            if (!old) return old;
            const known = new Set(old.answers.map((a) => a.id));
            const added = answers.filter((a) => !known.has(a.id)).map((a, k) => ({ ...(a.body as unknown as WalkAnswer), seq: old.answerCount + k + 1, receivedAt: new Date().toISOString() }));
            return { ...old, ...res.walk, answers: [...old.answers, ...added] as WalkDetail['answers'], state: res.state };
          });
          for (const a of answers) await remove(a.id);
        } catch (err) {
          if (err instanceof ApiError && err.status > 0 && err.details && 'index' in err.details) {
            // The server refused one entry: the ones before it are stored; this and later ones
            // no longer fit the walk as the server has it, so they are dropped with a message.
            const d = err.details as unknown as BatchRejectedDetails;
            for (const a of answers) await remove(a.id);
            setError(`One answer could not be saved: ${d.reason}. The walk shows what the server has.`);
          } else if (err instanceof ApiError && err.status > 0 && err.status < 500) {
            for (const a of answers) await remove(a.id);
            setError(err.message);
          } else {
            throw err;
          }
        }
      }
      for (const n of notes) {
        await sendNote(walk.id, n.body);
        await remove(n.id);
      }
      await qc.invalidateQueries({ queryKey: walkKeys.detail(walk.id) });
      setSync('saved');
    } catch {
      setSync('waiting');
      again.current = false;
    } finally {
      flushing.current = false;
    }
    if (again.current) {
      again.current = false;
      await flush();
    }
  }, [walk.id, qc]);

  // Send on start, when the connection returns, and every 15 s while anything waits.
  useEffect(() => {
    void flush();
    const online = () => void flush();
    window.addEventListener('online', online);
    return () => window.removeEventListener('online', online);
  }, [flush]);
  useEffect(() => {
    if (!queue.length) return;
    const t = setInterval(() => void flush(), 15_000);
    return () => clearInterval(t);
  }, [queue.length, flush]);

  const answer = useCallback(
    async (partial: NewAnswer): Promise<string | null> => {
      const entry = { ...partial, id: newClientId(), answeredAt: new Date().toISOString() } as WalkAnswer;
      let using = calculators ?? WITHOUT_CALCULATORS;
      if (!calculators && logNeedsCalculators(content, [...log, entry])) {
        const loaded = await loadStepCalculators().catch(() => null);
        if (!loaded) return 'The calculators could not be loaded; check the connection and try again.';
        // Set before the entry is queued, so the walk does not show its loading state in between.
        setCalculators(loaded);
        using = loaded;
      }
      const check = canAnswer(using, content, log, entry);
      if (!check.ok) return check.message;
      await enqueue({ id: entry.id, walkId: walk.id, type: 'answer', body: entry as unknown as Record<string, unknown>, queuedAt: Date.now() });
      setError(null);
      void flush();
      return null;
    },
    [calculators, content, log, walk.id, flush],
  );

  const addNote = useCallback(
    async (stepId: string, text: string, fileIds: string[]) => {
      const id = newClientId();
      await enqueue({ id, walkId: walk.id, type: 'note', body: { clientId: id, stepId, text, fileIds }, queuedAt: Date.now() });
      void flush();
    },
    [walk.id, flush],
  );

  const waiting = queue.filter((q) => !serverIds.has(q.id)).length;
  return { state, ready, log, answer, addNote, sync: waiting ? (sync === 'sending' ? 'sending' : 'waiting') : sync, waiting, error, clearError: () => setError(null), flush };
}
