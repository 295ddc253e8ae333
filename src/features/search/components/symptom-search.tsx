// Home page: the technician types what they see, in their own words and spelling, and gets the
// matching guides with one tap to start a walk.
import { useId, useState } from 'react';
import { Link } from 'react-router';
import { errorMessage } from '@/lib/api-client';
import { paths } from '@/lib/paths';
import { Icon } from '@/components/ui/icons';
import { useSearch } from '../api/search';
import { useDebouncedValue } from '../hooks/use-debounced-value';
import { ResultItem } from './search-results';

export function SymptomSearch() {
  const [text, setText] = useState('');
  const id = useId();
  const q = useDebouncedValue(text.trim(), 200);
  const results = useSearch({ q, kind: 'guide', limit: 5 });
  const settled = q === text.trim() && !results.isFetching;

  return (
    <section aria-label="Symptom search" className="space-y-3">
      <form role="search" onSubmit={(e) => e.preventDefault()}>
        <label htmlFor={id} className="mb-1 block font-serif text-lg font-semibold">
          Describe what you see
        </label>
        <div className="relative">
          <Icon.search className="pointer-events-none absolute left-3 top-1/2 size-6 -translate-y-1/2 text-ink-faint" aria-hidden />
          <input
            id={id}
            type="search"
            value={text}
            onChange={(e) => setText(e.target.value)}
            placeholder="e.g. drips after shutoff"
            autoComplete="off"
            enterKeyHint="search"
            maxLength={200}
            className="block min-h-14 w-full rounded-2xl border-2 border-amber-line bg-paper-raised pl-12 pr-4 text-lg placeholder:text-ink-faint focus:border-amber"
          />
        </div>
      </form>
      {text.trim() ? (
        <div aria-live="polite">
          {results.isError ? (
            <p className="font-semibold text-danger">{errorMessage(results.error)}</p>
          ) : !results.data ? (
            <p className="text-ink-soft" role="status">
              Looking for guides…
            </p>
          ) : results.data.results.length ? (
            <div className={results.isPlaceholderData ? 'opacity-70' : ''}>
              {results.data.corrected ? (
                <p className="mb-1 text-sm text-ink-soft">
                  Guides for <span className="font-semibold text-ink">{results.data.corrected}</span>
                </p>
              ) : null}
              <ul className="space-y-2" aria-label="Matching guides">
                {results.data.results.map((h) => (
                  <ResultItem key={h.id} hit={h} />
                ))}
              </ul>
            </div>
          ) : settled ? (
            <div className="rounded-lg border border-dashed border-rule-strong bg-paper-raised p-4" role="status">
              <p className="font-semibold">No guide matches “{text.trim()}”.</p>
              {results.data.suggestions.length ? (
                <p className="mt-1 text-ink-soft">
                  Try:{' '}
                  {results.data.suggestions.slice(0, 3).map((s, i) => (
                    <span key={s}>
                      {i ? ', ' : ''}
                      <button type="button" className="min-h-11 font-semibold text-amber-deep underline" onClick={() => setText(s)}>
                        {s}
                      </button>
                    </span>
                  ))}
                </p>
              ) : null}
              <Link to={`${paths.search}?q=${encodeURIComponent(text.trim())}`} className="mt-1 inline-flex min-h-11 items-center font-semibold text-amber-deep underline">
                Search articles too
              </Link>
            </div>
          ) : (
            <p className="text-ink-soft" role="status">
              Looking for guides…
            </p>
          )}
        </div>
      ) : null}
    </section>
  );
}
