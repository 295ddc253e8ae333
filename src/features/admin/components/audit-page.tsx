// Admin: who changed what and when, newest first, with the summary before and after each change.
// Read-only: the log cannot be edited from here or anywhere else.
import { useState } from 'react';
import { errorMessage } from '@/lib/api-client';
import { Button } from '@/components/ui/button';
import { EmptyState, ListSkeleton, Notice } from '@/components/ui/feedback';
import { SelectField, TextField } from '@/components/ui/field';
import { Card, PageHeader } from '@/components/ui/page';
import { useAuditLog, type AuditFilters } from '../api/audit';
import { formatDateTime } from '@/lib/format';

const KINDS = ['guide', 'article', 'user', 'organisation', 'tags', 'causes', 'sites', 'lines', 'fields', 'applicators', 'readings'];

function Summary({ value }: { value: unknown }) {
  if (value === null || value === undefined) return <span className="text-ink-faint">—</span>;
  const entries: [string, unknown][] = typeof value === 'object' && !Array.isArray(value) ? Object.entries(value as Record<string, unknown>) : [['', value]];
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-2 text-sm">
      {entries.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="text-ink-soft">{k}</dt>
          <dd className="break-words">{Array.isArray(v) ? v.join(', ') : typeof v === 'object' && v !== null ? JSON.stringify(v) : String(v)}</dd>
        </div>
      ))}
    </dl>
  );
}

export function AuditPage() {
  const [filters, setFilters] = useState<AuditFilters>({ page: 1 });
  const log = useAuditLog(filters);
  const set = (patch: Partial<AuditFilters>) => setFilters({ ...filters, ...patch, page: patch.page ?? 1 });
  const pages = log.data ? Math.max(1, Math.ceil(log.data.total / log.data.pageSize)) : 1;
  return (
    <div className="space-y-4">
      <PageHeader title="Audit log" lead="Changes to guides, articles, users, roles, settings and lists, and guide exports and imports: who, when, and what it was before and after." />
      <Card>
        <form className="grid gap-3 sm:grid-cols-4" onSubmit={(e) => e.preventDefault()}>
          <SelectField label="What" value={filters.entityKind ?? ''} onChange={(e) => set({ entityKind: e.target.value || undefined })}>
            <option value="">Everything</option>
            {KINDS.map((k) => (
              <option key={k} value={k}>
                {k}
              </option>
            ))}
          </SelectField>
          <TextField label="Action (e.g. guide.retire)" value={filters.action ?? ''} onChange={(e) => set({ action: e.target.value.trim() || undefined })} />
          <TextField label="From" type="date" value={filters.from ?? ''} onChange={(e) => set({ from: e.target.value || undefined })} />
          <TextField label="To" type="date" value={filters.to ?? ''} onChange={(e) => set({ to: e.target.value || undefined })} />
        </form>
      </Card>
      {log.isPending ? (
        <ListSkeleton label="Loading the audit log" rows={8} />
      ) : log.isError ? (
        <Notice tone="error" title="The audit log could not be loaded">
          {errorMessage(log.error)}
        </Notice>
      ) : log.data.events.length === 0 ? (
        <EmptyState title="Nothing recorded for these filters">
          Widen the dates or clear a filter. Sign-ins, changes to people, guides, articles, applicators and settings, and exports are all recorded here.
        </EmptyState>
      ) : (
        <Card className="overflow-x-auto">
          <table className="w-full text-left">
            <thead className="text-sm text-ink-soft">
              <tr>
                <th className="p-2">When</th>
                <th className="p-2">Who</th>
                <th className="p-2">Action</th>
                <th className="p-2">Before</th>
                <th className="p-2">After</th>
              </tr>
            </thead>
            <tbody>
              {log.data.events.map((e) => (
                <tr key={e.id} className="border-t border-rule align-top">
                  <td className="whitespace-nowrap p-2 text-sm">{formatDateTime(e.at)}</td>
                  <td className="p-2 text-sm">{e.userName ?? e.userEmail ?? 'Someone since removed'}</td>
                  <td className="p-2 text-sm">
                    <code>{e.action}</code>
                    {e.entityId ? (
                      <span className="text-ink-soft">
                        {' '}
                        · {e.entityKind} {e.entityId}
                      </span>
                    ) : null}
                  </td>
                  <td className="p-2">
                    <Summary value={e.before} />
                  </td>
                  <td className="p-2">
                    <Summary value={e.after} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <div className="mt-3 flex items-center justify-between gap-2">
            <Button variant="secondary" disabled={filters.page <= 1} onClick={() => set({ page: filters.page - 1 })}>
              Newer
            </Button>
            <span className="text-sm text-ink-soft">
              Page {filters.page} of {pages} · {log.data.total} events
            </span>
            <Button variant="secondary" disabled={filters.page >= pages} onClick={() => set({ page: filters.page + 1 })}>
              Older
            </Button>
          </div>
        </Card>
      )}
    </div>
  );
}
