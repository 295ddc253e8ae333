// Every registered applicator by site and line, filtered and searched, with the exports and, for
// those who manage them, the ways in: add, sites and lines, import, labels.
import { useState, type FormEvent } from 'react';
import { Link, useSearchParams } from 'react-router';
import { APPLICATOR_STATUS_LABELS, APPLICATOR_STATUSES, ACTUATION_LABELS } from '@/shared/schemas/assets';
import { useCan } from '@/lib/auth';
import { Button, ButtonLink, buttonClass } from '@/components/ui/button';
import { EmptyState, ListSkeleton, Notice } from '@/components/ui/feedback';
import { SelectField, TextField } from '@/components/ui/field';
import { PageHeader } from '@/components/ui/page';
import { errorMessage } from '@/lib/api-client';
import { useApplicators, useLines, useSites } from '../api/assets';
import { cycles, longDate } from '../utils/format';
import { StatusChip } from './status-chip';
import { DownloadButton } from '@/components/ui/download-button';

export function ExportLinks({ links }: { links: [string, string][] }) {
  return (
    <details className="relative">
      <summary className={buttonClass('secondary', 'cursor-pointer list-none')}>Export CSV</summary>
      <ul className="absolute right-0 z-20 mt-1 w-64 rounded-md border border-rule bg-paper-raised p-1 shadow-lg">
        {links.map(([label, href]) => (
          <li key={href}>
            <DownloadButton
              href={href}
              fileName={href.split('/').filter(Boolean).slice(1).join('-')}
              className="flex min-h-11 w-full items-center rounded px-3 text-left font-semibold hover:bg-paper-sunk disabled:cursor-wait"
            >
              {label}
            </DownloadButton>
          </li>
        ))}
      </ul>
    </details>
  );
}

export function ApplicatorListPage() {
  const manage = useCan('assets:manage');
  const [params, setParams] = useSearchParams();
  const filters = { siteId: params.get('siteId') ?? '', lineId: params.get('lineId') ?? '', status: params.get('status') ?? 'in-use', q: params.get('q') ?? '' };
  const [q, setQ] = useState(filters.q);
  const filtered = Boolean(filters.siteId || filters.lineId || filters.status !== 'in-use');
  const [filtersOpen, setFiltersOpen] = useState(filtered);
  const list = useApplicators(filters);
  const sites = useSites();
  const lines = useLines();
  const set = (patch: Record<string, string>) => {
    const next = new URLSearchParams(params);
    for (const [k, v] of Object.entries(patch))
      if (v) next.set(k, v);
      else next.delete(k);
    setParams(next, { replace: true });
  };
  const search = (e: FormEvent) => {
    e.preventDefault();
    set({ q: q.trim() });
  };
  const siteLines = (lines.data ?? []).filter((l) => !filters.siteId || String(l.siteId) === filters.siteId);
  const noSites = sites.data && sites.data.length === 0;

  return (
    <div>
      <PageHeader
        title="Applicators"
        lead="Every registered valve by site and line: its specs, counter, service history and the walks run on it. Scan a valve’s label to open its page."
        actions={
          <>
            {manage ? <ButtonLink to="new">Add applicator</ButtonLink> : null}
            <ButtonLink to="sites" variant="secondary">
              Sites and lines
            </ButtonLink>
            {manage ? (
              <ButtonLink to="import" variant="secondary">
                Import CSV
              </ButtonLink>
            ) : null}
            {manage ? (
              <ButtonLink to="labels" variant="secondary">
                Print labels
              </ButtonLink>
            ) : null}
            <ExportLinks
              links={[
                ['Applicators', '/api/applicators/export.csv'],
                ['Counter readings', '/api/applicators/readings/export.csv'],
                ['Service events', '/api/applicators/service-events/export.csv'],
              ]}
            />
          </>
        }
      />

      <form onSubmit={search} className="mb-4 grid gap-3 sm:grid-cols-2 lg:grid-cols-[2fr_1fr_1fr_1fr]" role="search">
        <TextField
          label="Search tag, fluid, line or site"
          value={q}
          onChange={(e) => setQ(e.target.value)}
          onBlur={() => q.trim() !== filters.q && set({ q: q.trim() })}
          type="search"
          enterKeyHint="search"
        />
        <Button variant="quiet" className="justify-start sm:hidden" aria-expanded={filtersOpen} onClick={() => setFiltersOpen((o) => !o)}>
          {filtersOpen ? 'Hide filters' : `Filter by site, line or status${filtered ? ' (on)' : ''}`}
        </Button>
        <div className={`${filtersOpen ? 'grid' : 'hidden'} gap-3 sm:contents`}>
          <SelectField label="Site" value={filters.siteId} onChange={(e) => set({ siteId: e.target.value, lineId: '' })}>
            <option value="">All sites</option>
            {(sites.data ?? []).map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </SelectField>
          <SelectField label="Line" value={filters.lineId} onChange={(e) => set({ lineId: e.target.value })}>
            <option value="">All lines</option>
            {siteLines.map((l) => (
              <option key={l.id} value={l.id}>
                {filters.siteId ? l.name : `${l.siteName} · ${l.name}`}
              </option>
            ))}
          </SelectField>
          <SelectField label="Status" value={filters.status} onChange={(e) => set({ status: e.target.value })}>
            <option value="in-use">Not retired</option>
            <option value="all">All</option>
            {APPLICATOR_STATUSES.map((s) => (
              <option key={s} value={s}>
                {APPLICATOR_STATUS_LABELS[s]}
              </option>
            ))}
          </SelectField>
        </div>
      </form>

      {list.isPending ? (
        <ListSkeleton label="Loading applicators" />
      ) : list.isError ? (
        <Notice tone="error" title="The applicators could not be loaded">
          {errorMessage(list.error)}
        </Notice>
      ) : list.data.applicators.length === 0 ? (
        noSites ? (
          <EmptyState title="No applicators registered yet">
            {manage ? (
              <p>
                Start with a{' '}
                <Link className="font-semibold text-amber-deep underline" to="sites">
                  site and a line
                </Link>
                , then add applicators one by one or{' '}
                <Link className="font-semibold text-amber-deep underline" to="import">
                  import them from a CSV file
                </Link>
                .
              </p>
            ) : (
              <p>An admin or author registers the plant’s valves here. Until then, walks take the valve’s tag as typed text.</p>
            )}
          </EmptyState>
        ) : (
          <EmptyState title="No applicator matches">
            <p>Try another search, or show all statuses.</p>
          </EmptyState>
        )
      ) : (
        <>
          <p className="mb-2 text-sm text-ink-soft">
            {list.data.total > list.data.applicators.length
              ? `Showing the first ${list.data.applicators.length} of ${list.data.total}; narrow the search to see the rest.`
              : `${list.data.total} applicator${list.data.total === 1 ? '' : 's'}`}
          </p>
          <div className="hidden border-b border-rule px-3 pb-2 text-sm font-semibold text-ink-soft md:grid md:grid-cols-[9rem_minmax(0,1.4fr)_minmax(0,1fr)_11rem_9rem] md:gap-3">
            <span>Tag</span>
            <span>Site · line</span>
            <span>Valve and fluid</span>
            <span>Last counter reading</span>
            <span>Last service</span>
          </div>
          <ul className="divide-y divide-rule rounded-lg border border-rule bg-paper-raised md:rounded-t-none md:border-t-0">
            {list.data.applicators.map((a) => (
              <li key={a.id}>
                <Link to={String(a.id)} className="block px-3 py-3 hover:bg-paper-sunk md:grid md:grid-cols-[9rem_minmax(0,1.4fr)_minmax(0,1fr)_11rem_9rem] md:items-center md:gap-3">
                  <span className="flex items-center gap-2">
                    <span className="text-lg font-semibold text-amber-deep underline-offset-4">{a.tag}</span>
                    {a.status !== 'running' ? (
                      <span className="md:hidden">
                        <StatusChip status={a.status} />
                      </span>
                    ) : null}
                  </span>
                  <span className="block text-ink">
                    {a.siteName} · {a.lineName}
                    {a.status !== 'running' ? (
                      <span className="ml-2 hidden md:inline">
                        <StatusChip status={a.status} />
                      </span>
                    ) : null}
                  </span>
                  <span className="block text-sm text-ink-soft">
                    {ACTUATION_LABELS[a.actuation]}
                    {a.fluidName ? ` · ${a.fluidName}` : ''}
                  </span>
                  <span className="tabular block text-sm">
                    <span className="text-ink-soft md:hidden">Counter: </span>
                    {a.lastCount !== null ? `${cycles(a.lastCount)} (${longDate(a.lastReadingOn)})` : 'No reading yet'}
                  </span>
                  <span className="block text-sm">
                    <span className="text-ink-soft md:hidden">Last service: </span>
                    {a.lastServiceOn ? longDate(a.lastServiceOn) : 'None recorded'}
                  </span>
                </Link>
              </li>
            ))}
          </ul>
        </>
      )}
    </div>
  );
}
