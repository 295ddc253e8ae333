// "Figures as of …" under every insight, with a refresh on request: organisation-wide figures come
// from summaries refreshed by the job queue, filtered ones straight from the history.
import { Button } from '@/components/ui/button';
import { formatDateTime } from '@/lib/format';
import { useInsightsStatus, useRefreshInsights } from '../api/insights';

export function Freshness({ asOf }: { asOf: string | null | undefined }) {
  const status = useInsightsStatus();
  const refresh = useRefreshInsights();
  const s = status.data;
  const busy = refresh.isPending || Boolean(s?.requestedAt);
  return (
    <div className="flex flex-wrap items-center gap-x-3 gap-y-1 text-sm text-ink-soft no-print" data-testid="freshness">
      <p role="status">
        {asOf ? `Figures as of ${formatDateTime(asOf)}` : 'Figures read just now from the full history'}
        {asOf && s?.changesWaiting ? ' · newer changes are added within about a minute' : ''}
        {busy ? ' · refreshing…' : ''}
      </p>
      <Button variant="quiet" className="min-h-11 px-1" busy={busy} onClick={() => refresh.mutate()}>
        Refresh now
      </Button>
    </div>
  );
}

/** The same line for print, where buttons make no sense. */
export function PrintedAsOf({ asOf }: { asOf: string | null | undefined }) {
  return <p className="hidden text-sm print:block">{asOf ? `Figures as of ${formatDateTime(asOf)}` : `Figures as of ${formatDateTime(new Date())}`}</p>;
}
