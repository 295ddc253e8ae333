// The case queue: counts per status, filters, server-side sorting and paging. The filters live in
// the address so a count on the home page can link straight to its slice.
import { useMemo, useState, type ReactNode } from 'react';
import { Link, useSearchParams } from 'react-router';
import { createColumnHelper, rowPaginationFeature, rowSortingFeature, tableFeatures, useTable, type PaginationState, type SortingState, type Updater } from '@tanstack/react-table';
import { CASE_AGES, CASE_AGE_LABELS, CASE_SORTS, CASE_STATUSES, CASE_STATUS_LABELS, OPEN_CASE_STATUSES, type CaseListItem } from '@/shared/schemas/cases';
import { useCan, useMe } from '@/lib/auth';
import { ButtonLink, Button } from '@/components/ui/button';
import { EmptyState, ListSkeleton, Notice } from '@/components/ui/feedback';
import { inputClass } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page';
import { errorMessage } from '@/lib/api-client';
import { useCasePeople, useCases } from '../api/cases';
import { PriorityBadge, StatusBadge, ago, callerOf, placeOf, when } from './case-bits';

const features = tableFeatures({ rowSortingFeature, rowPaginationFeature });
const helper = createColumnHelper<typeof features, CaseListItem>();
const SORTABLE = new Set<string>(CASE_SORTS);

const columns = helper.columns([
  helper.accessor('id', {
    id: 'id',
    header: 'Case',
    enableSorting: false,
    cell: (info) => (
      <Link to={`/cases/${info.getValue()}`} className="font-semibold text-amber-deep underline tabular">
        {info.getValue()}
      </Link>
    ),
  }),
  helper.accessor((c) => callerOf(c), {
    id: 'caller',
    header: 'Caller',
    cell: (info) => (
      <span>
        <span className="font-semibold">{info.getValue()}</span>
        {info.row.original.callerName && info.row.original.callerCompany ? <span className="block text-sm text-ink-soft">{info.row.original.callerCompany}</span> : null}
      </span>
    ),
  }),
  helper.accessor((c) => placeOf(c), { id: 'site', header: 'Where', cell: (info) => <span className="text-sm">{info.getValue()}</span> }),
  helper.accessor('symptom', { id: 'symptom', header: 'What they see', enableSorting: false, cell: (info) => <span className="line-clamp-3 block min-w-48">{info.getValue()}</span> }),
  helper.accessor('priority', { id: 'priority', header: 'Priority', sortDescFirst: true, cell: (info) => <PriorityBadge priority={info.getValue()} /> }),
  helper.accessor('status', { id: 'status', header: 'Status', cell: (info) => <StatusBadge status={info.getValue()} /> }),
  helper.accessor((c) => c.assignee?.name ?? '', { id: 'assignee', header: 'Assigned to', cell: (info) => info.getValue() || <span className="text-ink-soft">Nobody yet</span> }),
  helper.accessor('createdAt', {
    id: 'created',
    header: 'Waiting',
    cell: (info) => (
      <span className="tabular whitespace-nowrap" title={when(info.getValue())}>
        {ago(info.getValue())}
      </span>
    ),
  }),
]);

const emptyRows: CaseListItem[] = [];

function apply<T>(updater: Updater<T>, current: T): T {
  return typeof updater === 'function' ? (updater as (old: T) => T)(current) : updater;
}

export function CaseListPage() {
  const [params, setParams] = useSearchParams();
  const canWork = useCan('cases:work');
  const { data: me } = useMe();
  const people = useCasePeople();
  const [siteDraft, setSiteDraft] = useState(params.get('site') ?? '');
  const [qDraft, setQDraft] = useState(params.get('q') ?? '');
  const [showFilters, setShowFilters] = useState(false);

  const status = params.get('status') ?? 'open';
  const filters = {
    status,
    assignee: params.get('assignee') ?? undefined,
    site: params.get('site') ?? undefined,
    age: params.get('age') ?? undefined,
    q: params.get('q') ?? undefined,
    sort: params.get('sort') ?? 'created',
    dir: (params.get('dir') === 'desc' ? 'desc' : 'asc') as 'asc' | 'desc',
    page: Math.max(1, Number(params.get('page') ?? 1) || 1),
    pageSize: Number(params.get('pageSize') ?? 25) || 25,
  };
  const list = useCases(filters, { poll: true });

  const set = (patch: Record<string, string | null>, keepPage = false) => {
    const next = new URLSearchParams(params);
    for (const [k, v] of Object.entries(patch)) {
      if (v === null || v === '') next.delete(k);
      else next.set(k, v);
    }
    if (!keepPage) next.delete('page');
    setParams(next, { replace: true });
  };

  const sorting: SortingState = useMemo(() => [{ id: filters.sort, desc: filters.dir === 'desc' }], [filters.sort, filters.dir]);
  const pagination: PaginationState = useMemo(() => ({ pageIndex: filters.page - 1, pageSize: filters.pageSize }), [filters.page, filters.pageSize]);

  const table = useTable({
    features,
    columns,
    data: list.data?.cases ?? emptyRows,
    rowCount: list.data?.total ?? 0,
    manualSorting: true,
    manualPagination: true,
    enableSortingRemoval: false,
    enableMultiSort: false,
    state: { sorting, pagination },
    onSortingChange: (u) => {
      const next = apply(u, sorting)[0];
      if (next && SORTABLE.has(next.id)) set({ sort: next.id, dir: next.desc ? 'desc' : 'asc' });
    },
    onPaginationChange: (u) => {
      const next = apply(u, pagination);
      set({ page: String(next.pageIndex + 1), pageSize: String(next.pageSize) }, next.pageSize === pagination.pageSize);
    },
    getRowId: (row) => String(row.id),
  });

  const counts = list.data?.counts;
  const openCount = counts ? OPEN_CASE_STATUSES.reduce((n, s) => n + counts[s], 0) : null;
  const chip = (value: string, label: string, count: number | null | undefined) => (
    <button
      key={value}
      type="button"
      aria-pressed={status === value}
      onClick={() => set({ status: value === 'open' ? null : value })}
      className={`inline-flex min-h-11 shrink-0 items-center gap-2 rounded-full border px-4 font-semibold ${status === value ? 'border-amber bg-amber-wash text-amber-deep' : 'border-rule-strong bg-paper-raised text-ink hover:bg-paper-sunk'}`}
    >
      {label}
      <span className="tabular rounded-full bg-paper-sunk px-2 text-sm text-ink">{count ?? '–'}</span>
    </button>
  );

  const activeFilters = [filters.assignee, filters.site, filters.age, filters.q].filter(Boolean).length;
  const total = list.data?.total ?? 0;
  const from = total ? (filters.page - 1) * filters.pageSize + 1 : 0;
  const to = Math.min(total, filters.page * filters.pageSize);
  const rows = table.getRowModel().rows;
  const headerGroup = table.getHeaderGroups()[0];

  return (
    <div>
      <PageHeader
        title="Cases"
        lead={canWork ? 'Calls from the plants. The oldest waiting case comes first.' : 'Cases handed to you or assigned to you, and what the support desk did so far.'}
        actions={
          canWork ? (
            <ButtonLink to="/cases/new" className="!min-h-12 text-lg">
              <Icon.phone /> Log a call
            </ButtonLink>
          ) : null
        }
      />

      <div className="-mx-4 mb-4 flex gap-2 overflow-x-auto px-4 pb-1 sm:mx-0 sm:flex-wrap sm:overflow-visible sm:px-0" role="group" aria-label="Cases by status">
        {chip('open', 'All open', openCount)}
        {CASE_STATUSES.map((s) => chip(s, CASE_STATUS_LABELS[s], counts?.[s]))}
        {chip('all', 'Every case', counts ? Object.values(counts).reduce((a, b) => a + b, 0) : null)}
      </div>

      <button
        type="button"
        className="mb-3 inline-flex min-h-11 items-center gap-2 font-semibold text-amber-deep underline md:hidden"
        aria-expanded={showFilters}
        onClick={() => setShowFilters((v) => !v)}
      >
        {showFilters ? 'Hide filters' : `Filters and order${activeFilters ? ` (${activeFilters} on)` : ''}`}
      </button>
      <form
        className={`mb-4 ${showFilters ? 'grid' : 'hidden'} gap-3 rounded-lg border border-rule bg-paper-raised p-3 sm:grid-cols-2 md:grid lg:grid-cols-4`}
        onSubmit={(e) => {
          e.preventDefault();
          set({ q: qDraft.trim(), site: siteDraft.trim() });
        }}
      >
        <label className="text-sm font-semibold">
          Search
          <input
            className={`${inputClass} mt-1 font-normal`}
            value={qDraft}
            onChange={(e) => setQDraft(e.target.value)}
            onBlur={() => set({ q: qDraft.trim() })}
            placeholder="Caller, company, symptom or case number"
          />
        </label>
        <label className="text-sm font-semibold">
          Site
          <input className={`${inputClass} mt-1 font-normal`} value={siteDraft} onChange={(e) => setSiteDraft(e.target.value)} onBlur={() => set({ site: siteDraft.trim() })} placeholder="Any site" />
        </label>
        <label className="text-sm font-semibold">
          Assigned to
          <select className={`${inputClass} mt-1 font-normal`} value={filters.assignee ?? ''} onChange={(e) => set({ assignee: e.target.value })}>
            <option value="">Anyone</option>
            <option value="me">Me{me ? ` (${me.user.name})` : ''}</option>
            <option value="none">Nobody yet</option>
            {(people.data ?? [])
              .filter((p) => p.id !== me?.user.id)
              .map((p) => (
                <option key={p.id} value={p.id}>
                  {p.name}
                </option>
              ))}
          </select>
        </label>
        <label className="text-sm font-semibold">
          Age
          <select className={`${inputClass} mt-1 font-normal`} value={filters.age ?? ''} onChange={(e) => set({ age: e.target.value })}>
            <option value="">Any age</option>
            {CASE_AGES.map((a) => (
              <option key={a} value={a}>
                {CASE_AGE_LABELS[a]}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm font-semibold md:hidden">
          Order
          <select
            className={`${inputClass} mt-1 font-normal`}
            value={`${filters.sort}:${filters.dir}`}
            onChange={(e) => set({ sort: e.target.value.split(':')[0], dir: e.target.value.split(':')[1] })}
          >
            <option value="created:asc">Waiting longest first</option>
            <option value="created:desc">Newest first</option>
            <option value="priority:desc">Most urgent first</option>
            <option value="updated:desc">Changed most recently</option>
            <option value="caller:asc">Caller, A to Z</option>
            <option value="site:asc">Site, A to Z</option>
          </select>
        </label>
        <button type="submit" className="sr-only">
          Apply filters
        </button>
      </form>

      {list.isPending ? (
        <ListSkeleton label="Loading cases" />
      ) : list.isError ? (
        <Notice tone="error" title="The cases could not be loaded">
          {errorMessage(list.error)} Reload the page to try again.
        </Notice>
      ) : rows.length === 0 ? (
        <EmptyState title={status === 'open' && !filters.q && !filters.site && !filters.assignee && !filters.age ? 'No open case' : 'No case matches these filters'}>
          {canWork ? 'When a plant calls, log the call to start a case.' : 'Cases handed to you appear here, and on your home page.'}
        </EmptyState>
      ) : (
        <>
          <div className="hidden overflow-x-auto rounded-lg border border-rule bg-paper-raised md:block">
            <table className="w-full border-collapse text-left">
              <thead className="border-b border-rule bg-paper-sunk text-sm">
                <tr>
                  {headerGroup.headers.map((header) => {
                    const sorted = header.column.getIsSorted();
                    const canSort = header.column.getCanSort();
                    const label: ReactNode = <table.FlexRender header={header} />;
                    return (
                      <th key={header.id} scope="col" aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined} className="whitespace-nowrap px-3 py-2 font-semibold">
                        {canSort ? (
                          <button type="button" onClick={header.column.getToggleSortingHandler()} className="inline-flex min-h-9 items-center gap-1 hover:underline">
                            {label}
                            <span aria-hidden className="text-ink-soft">
                              {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}
                            </span>
                          </button>
                        ) : (
                          label
                        )}
                      </th>
                    );
                  })}
                </tr>
              </thead>
              <tbody>
                {rows.map((row) => (
                  <tr key={row.id} className="border-b border-rule last:border-0 hover:bg-paper-sunk/60" data-case={row.original.id}>
                    {row.getAllCells().map((cell) => (
                      <td key={cell.id} className="px-3 py-2 align-top">
                        <table.FlexRender cell={cell} />
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>

          <ul className="space-y-2 md:hidden" aria-label="Cases">
            {rows.map((row) => {
              const c = row.original;
              return (
                <li key={row.id}>
                  <Link to={`/cases/${c.id}`} className="block rounded-lg border border-rule bg-paper-raised p-3 active:bg-paper-sunk" data-case={c.id}>
                    <div className="flex items-start justify-between gap-2">
                      <span className="font-semibold">
                        {c.id} · {callerOf(c)}
                      </span>
                      <StatusBadge status={c.status} />
                    </div>
                    <p className="mt-1">{c.symptom}</p>
                    <p className="mt-1 flex flex-wrap items-center gap-x-3 text-sm text-ink-soft">
                      <span>{placeOf(c)}</span>
                      <span className="tabular">waiting {ago(c.createdAt)}</span>
                      {c.priority !== 'normal' ? <PriorityBadge priority={c.priority} /> : null}
                    </p>
                  </Link>
                </li>
              );
            })}
          </ul>

          <div className="mt-3 flex flex-wrap items-center justify-between gap-3">
            <p className="text-sm text-ink-soft tabular" aria-live="polite">
              {from}–{to} of {total}
            </p>
            <div className="flex flex-wrap items-center gap-2">
              <label className="flex items-center gap-2 text-sm">
                Per page
                <select className={`${inputClass} !w-auto`} value={filters.pageSize} onChange={(e) => table.setPageSize(Number(e.target.value))}>
                  {[10, 25, 50, 100].map((n) => (
                    <option key={n} value={n}>
                      {n}
                    </option>
                  ))}
                </select>
              </label>
              <Button variant="secondary" disabled={!table.getCanPreviousPage()} onClick={() => table.previousPage()}>
                Previous
              </Button>
              <Button variant="secondary" disabled={!table.getCanNextPage()} onClick={() => table.nextPage()}>
                Next
              </Button>
            </div>
          </div>
        </>
      )}
    </div>
  );
}
