// Walking a guide for the caller: find the guide by what they see, start the walk through the
// walks API with the case's place, link it to the case, and open the runner.
import { useState } from 'react';
import { useNavigate } from 'react-router';
import { useQueryClient } from '@tanstack/react-query';
import type { CaseDetail } from '@/shared/schemas/cases';
import { errorMessage } from '@/lib/api-client';
import { Notice, Skeleton } from '@/components/ui/feedback';
import { inputClass } from '@/components/ui/field';
import { startWalkForCaller, useLinkWalk, usePublishedGuides } from '../api/cases';

const COMMON = new Set(['the', 'and', 'from', 'after', 'with', 'when', 'that', 'this', 'out', 'not', 'are', 'but', 'for', 'into', 'our', 'its', 'too', 'getting', 'gets']);

/** Word stems good enough to match "drools" with "drool" and "closing" with "closes". */
function stems(s: string): string[] {
  return s
    .toLowerCase()
    .split(/[^a-z0-9]+/)
    .filter((w) => w.length > 2 && !COMMON.has(w))
    .map((w) => w.slice(0, Math.max(4, w.length - 3)));
}

export function WalkWithCaller({ kase }: { kase: CaseDetail }) {
  const guides = usePublishedGuides();
  const link = useLinkWalk(kase.id);
  const qc = useQueryClient();
  const navigate = useNavigate();
  const [q, setQ] = useState('');
  const [busy, setBusy] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);

  // Guides whose symptom shares words with what was typed (or with the case) come first.
  const wanted = stems(q || kase.symptom);
  const ranked = (guides.data ?? [])
    .map((g) => {
      const own = stems(`${g.symptom} ${g.title}`);
      return { g, score: wanted.filter((w) => own.some((o) => o.startsWith(w) || w.startsWith(o))).length };
    })
    .filter((x) => !q || x.score > 0)
    .sort((a, b) => b.score - a.score || a.g.symptom.localeCompare(b.g.symptom))
    .map((x) => x.g);

  async function start(guideId: number) {
    setBusy(guideId);
    setError(null);
    try {
      const walk = await startWalkForCaller({ guideId, site: kase.site, line: kase.line, applicator: kase.applicator, clientId: crypto.randomUUID() });
      await link.mutateAsync(walk.id);
      qc.invalidateQueries({ queryKey: ['walks'] });
      navigate(`/walks/${walk.id}`);
    } catch (err) {
      setError(`The walk could not be started for this case: ${errorMessage(err)}`);
    } finally {
      setBusy(null);
    }
  }

  return (
    <section aria-labelledby="walk-heading" className="rounded-lg border-2 border-amber-line bg-paper-raised p-4">
      <h2 id="walk-heading" className="text-lg font-semibold">
        Walk a guide with the caller
      </h2>
      <p className="mt-1 text-sm text-ink-soft">You read each step to the caller and enter their answers. The walk is kept with this case.</p>
      <label htmlFor="guide-search" className="mt-3 block text-sm font-semibold">
        What does the caller see?
      </label>
      <input id="guide-search" className={`${inputClass} mt-1`} value={q} onChange={(e) => setQ(e.target.value)} placeholder={kase.symptom} autoComplete="off" />
      {error ? (
        <div className="mt-3">
          <Notice tone="error" title={error} />
        </div>
      ) : null}
      {guides.isPending ? (
        <Skeleton className="mt-3 h-12 w-full" />
      ) : ranked.length === 0 ? (
        <p className="mt-3 text-ink-soft">{guides.data?.length ? 'No guide starts from that; try other words.' : 'No guide has been published yet.'}</p>
      ) : (
        <ul className="mt-3 space-y-2">
          {ranked.slice(0, 6).map((g) => (
            <li key={g.id}>
              <button
                type="button"
                disabled={busy !== null}
                onClick={() => void start(g.id)}
                className="flex min-h-14 w-full items-center justify-between gap-3 rounded-lg border border-rule-strong bg-paper px-4 text-left hover:bg-amber-wash disabled:opacity-60"
              >
                <span>
                  <span className="block font-semibold">{g.symptom}</span>
                  <span className="block text-sm text-ink-soft">{g.title}</span>
                </span>
                <span className="shrink-0 font-semibold text-amber-deep">{busy === g.id ? 'Starting…' : 'Start walk'}</span>
              </button>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
