// Search results grouped by kind, with the matched words marked, one tap to walk a guide, and a
// "nothing found" that offers something to try.
import { Fragment, type ReactNode } from 'react';
import { Link } from 'react-router';
import type { SearchHit, SearchResponse } from '@/shared/schemas/search';
import { useCan } from '@/lib/auth';
import { paths } from '@/lib/paths';
import { ButtonLink } from '@/components/ui/button';
import { Icon } from '@/components/ui/icons';

const ENTITIES: Record<string, string> = { '&amp;': '&', '&lt;': '<', '&gt;': '>', '&quot;': '"', '&#39;': "'" };
const unescape = (s: string) => s.replace(/&(?:amp|lt|gt|quot|#39);/g, (e) => ENTITIES[e]);

/**
 * Renders the server's snippet markup as React text: <mark> becomes a highlight and everything
 * else stays text, so no markup from content can ever reach the page.
 */
export function MarkedText({ html }: { html: string }) {
  const parts = html.split(/(<mark>|<\/mark>)/);
  let marked = false;
  const out: ReactNode[] = [];
  parts.forEach((p, i) => {
    if (p === '<mark>') marked = true;
    else if (p === '</mark>') marked = false;
    else if (p)
      out.push(
        marked ? (
          <mark key={i} className="rounded-sm bg-amber-wash px-0.5 font-semibold text-ink">
            {unescape(p)}
          </mark>
        ) : (
          <Fragment key={i}>{unescape(p)}</Fragment>
        ),
      );
  });
  return <>{out}</>;
}

export function ResultItem({ hit, compact = false, onNavigate }: { hit: SearchHit; compact?: boolean; onNavigate?: () => void }) {
  const canWalk = useCan('walks:run');
  const href = hit.kind === 'guide' ? paths.guide(hit.id) : paths.article(hit.id);
  return (
    <li className={`flex flex-wrap items-start gap-x-3 gap-y-2 ${compact ? 'py-2' : 'rounded-lg border border-rule bg-paper-raised p-3 sm:p-4'}`} data-kind={hit.kind}>
      <div className="min-w-0 flex-1 basis-56">
        <Link to={href} onClick={onNavigate} className="inline-flex min-h-11 items-center font-semibold text-ink underline-offset-4 hover:underline">
          <span>
            <MarkedText html={hit.titleHtml} />
          </span>
        </Link>
        {hit.kind === 'guide' && hit.symptom ? <p className="text-sm font-semibold text-amber-deep">{hit.symptom}</p> : null}
        {hit.step ? <p className="text-sm text-ink-soft">Step: {hit.step.title}</p> : null}
        {hit.snippetHtml ? (
          <p className={`mt-1 text-ink-soft ${compact ? 'line-clamp-2 text-sm' : ''}`}>
            <MarkedText html={hit.snippetHtml} />
          </p>
        ) : null}
      </div>
      {hit.kind === 'guide' && canWalk ? (
        <ButtonLink to={paths.guideWalk(hit.id)} onClick={onNavigate} className="shrink-0" aria-label={`Start walk: ${hit.title}`}>
          <Icon.guide /> Start walk
        </ButtonLink>
      ) : null}
    </li>
  );
}

const GROUP_LABELS = { guide: 'Guides', article: 'Articles' } as const;

/** Guides first for symptom-like queries; otherwise the group of the best result first. */
export function groupHits(data: SearchResponse) {
  const guides = data.results.filter((h) => h.kind === 'guide');
  const articles = data.results.filter((h) => h.kind === 'article');
  const guidesFirst = data.guidesFirst || data.results[0]?.kind !== 'article';
  const groups = [
    { kind: 'guide' as const, hits: guides },
    { kind: 'article' as const, hits: articles },
  ];
  return (guidesFirst ? groups : groups.reverse()).filter((g) => g.hits.length);
}

export function GroupedResults({ data, compact = false, onNavigate }: { data: SearchResponse; compact?: boolean; onNavigate?: () => void }) {
  return (
    <div className="space-y-4">
      {groupHits(data).map((g) => (
        <section key={g.kind} aria-label={GROUP_LABELS[g.kind]}>
          <h2 className={compact ? 'text-xs font-semibold uppercase tracking-wide text-ink-soft' : 'mb-2 text-lg font-semibold'}>
            {GROUP_LABELS[g.kind]} <span className="font-normal text-ink-soft">({g.hits.length})</span>
          </h2>
          <ul className={compact ? 'divide-y divide-rule' : 'space-y-2'}>
            {g.hits.map((h) => (
              <ResultItem key={`${h.kind}-${h.id}`} hit={h} compact={compact} onNavigate={onNavigate} />
            ))}
          </ul>
        </section>
      ))}
    </div>
  );
}

export function NothingFound({ query, suggestions, onPick }: { query: string; suggestions: string[]; onPick: (s: string) => void }) {
  return (
    <div className="rounded-lg border border-dashed border-rule-strong bg-paper-raised p-4" role="status">
      <p className="font-serif text-lg font-semibold">Nothing found for “{query}”</p>
      <p className="mt-1 text-ink-soft">Try the words you would say out loud on the line: what you see, where, and when.</p>
      {suggestions.length ? (
        <>
          <p className="mt-3 text-sm font-semibold">Try one of these</p>
          <ul className="mt-1 flex flex-wrap gap-2">
            {suggestions.map((s) => (
              <li key={s}>
                <button type="button" onClick={() => onPick(s)} className="min-h-11 rounded-full border border-amber-line bg-paper px-4 text-left hover:bg-amber-wash">
                  {s}
                </button>
              </li>
            ))}
          </ul>
        </>
      ) : null}
    </div>
  );
}

export function CorrectedNote({ data }: { data: SearchResponse }) {
  if (!data.corrected || !data.results.length) return null;
  return (
    <p className="text-sm text-ink-soft">
      Showing results for <span className="font-semibold text-ink">{data.corrected}</span>
    </p>
  );
}
