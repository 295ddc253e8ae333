// The search box in every page's header: "/" focuses it, results appear as you type, Enter opens
// the full results page.
import { useEffect, useId, useLayoutEffect, useRef, useState } from 'react';
import { useLocation, useNavigate } from 'react-router';
import { paths } from '@/lib/paths';
import { isSearchShortcut, searchBoxArrived } from '@/lib/search-shortcut';
import { errorMessage } from '@/lib/api-client';
import { Icon } from '@/components/ui/icons';
import { useSearch } from '../api/search';
import { useDebouncedValue } from '../hooks/use-debounced-value';
import { CorrectedNote, GroupedResults, NothingFound } from './search-results';

export function HeaderSearch() {
  const [text, setText] = useState('');
  const [open, setOpen] = useState(false);
  const input = useRef<HTMLInputElement>(null);
  const box = useRef<HTMLDivElement>(null);
  const panelId = useId();
  const navigate = useNavigate();
  const location = useLocation();
  const q = useDebouncedValue(text.trim(), 200);
  const results = useSearch({ q, limit: 8 }, open);

  // A "/" pressed while this box was still loading, and what was typed after it.
  useLayoutEffect(() => {
    const { typed, gone } = searchBoxArrived();
    if (typed !== null) {
      setText(typed);
      setOpen(true);
      input.current?.focus();
    }
    return gone;
  }, []);

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (!isSearchShortcut(e)) return;
      e.preventDefault();
      input.current?.focus();
      setOpen(true);
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);

  // Moving to another page closes the results (not the box's first render, which may open them).
  const shownAt = useRef(location.pathname + location.search);
  useEffect(() => {
    const at = location.pathname + location.search;
    if (shownAt.current === at) return;
    shownAt.current = at;
    setOpen(false);
  }, [location.pathname, location.search]);

  useEffect(() => {
    if (!open) return;
    const onPointer = (e: PointerEvent) => {
      if (box.current && !box.current.contains(e.target as Node)) setOpen(false);
    };
    document.addEventListener('pointerdown', onPointer);
    return () => document.removeEventListener('pointerdown', onPointer);
  }, [open]);

  const close = () => {
    setOpen(false);
    setText('');
  };
  const showPanel = open && text.trim().length > 0;
  // On wide screens the navigation needs the room: the box is an icon until it is used.
  const expanded = open || text.length > 0;

  return (
    <div ref={box} className="relative min-w-0 flex-1 md:w-11 md:flex-none">
      <form
        className={`md:absolute md:right-0 md:top-1/2 md:-translate-y-1/2 ${expanded ? 'md:z-40 md:w-[26rem]' : 'md:w-11'}`}
        role="search"
        onSubmit={(e) => {
          e.preventDefault();
          if (!text.trim()) return;
          navigate(`${paths.search}?q=${encodeURIComponent(text.trim())}`);
          close();
        }}
      >
        <label className="relative block">
          <span className="sr-only">Search guides and articles</span>
          <Icon.search className="pointer-events-none absolute left-2 top-1/2 size-5 -translate-y-1/2 text-ink-faint" aria-hidden />
          <input
            ref={input}
            type="search"
            value={text}
            onChange={(e) => {
              setText(e.target.value);
              setOpen(true);
            }}
            onFocus={() => setOpen(true)}
            onKeyDown={(e) => {
              if (e.key === 'Escape') {
                setOpen(false);
                input.current?.blur();
              }
            }}
            placeholder="Search"
            title="Search guides and articles (press / to jump here)"
            autoComplete="off"
            enterKeyHint="search"
            role="combobox"
            aria-autocomplete="list"
            aria-controls={showPanel ? panelId : undefined}
            aria-expanded={showPanel}
            maxLength={200}
            className="block min-h-11 w-full rounded-md border border-rule-strong bg-paper-raised pl-8 pr-1 text-base placeholder:text-ink-faint focus:border-amber"
          />
        </label>
      </form>
      {showPanel ? (
        <div
          id={panelId}
          aria-live="polite"
          className="fixed inset-x-2 top-16 z-40 max-h-[70dvh] overflow-y-auto rounded-lg border border-rule-strong bg-paper-raised p-3 shadow-xl md:absolute md:inset-x-auto md:right-0 md:top-full md:mt-2 md:w-[30rem]"
        >
          {results.isError ? (
            <p className="text-sm font-semibold text-danger">{errorMessage(results.error)}</p>
          ) : !results.data || (!results.data.results.length && (q !== text.trim() || results.isFetching)) ? (
            <p className="text-sm text-ink-soft" role="status">
              Searching…
            </p>
          ) : results.data.results.length ? (
            <div className={`space-y-2 transition-opacity ${q !== text.trim() || results.isPlaceholderData ? 'opacity-70' : ''}`}>
              <CorrectedNote data={results.data} />
              <GroupedResults data={results.data} compact onNavigate={close} />
              <button
                type="button"
                className="min-h-11 w-full rounded-md text-left font-semibold text-amber-deep underline-offset-4 hover:underline"
                onClick={() => {
                  navigate(`${paths.search}?q=${encodeURIComponent(text.trim())}`);
                  close();
                }}
              >
                All results for “{text.trim()}”
              </button>
            </div>
          ) : (
            <NothingFound query={text.trim()} suggestions={results.data.suggestions} onPick={(s) => setText(s)} />
          )}
        </div>
      ) : null}
    </div>
  );
}
