// Starting a walk: where the technician is (optional, prefilled from the last walk), then go. Opened
// from an applicator's page (?applicatorId=), the registered valve stands in for the three fields.
import { useState, type FormEvent } from 'react';
import { Link, useNavigate, useParams, useSearchParams } from 'react-router';
import { useQuery } from '@tanstack/react-query';
import { api, errorMessage } from '@/lib/api-client';
import { Button } from '@/components/ui/button';
import { LoadingBlock, Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { newClientId } from '../utils/offline-queue';
import { useStartWalk } from '../api/walks';

const LAST_PLACE = 'beadpath.last-place';

export function WalkStartPage() {
  const guideId = Number(useParams().id);
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const start = useStartWalk();
  const guide = useQuery({
    queryKey: ['guides', 'detail', guideId],
    queryFn: () => api<{ guide: { id: number; status: string; published: { meta: { title: string; symptom: string } } | null } }>(`/api/guides/${guideId}`).then((r) => r.guide),
  });
  const last = JSON.parse(localStorage.getItem(LAST_PLACE) ?? '{}') as { site?: string; line?: string };
  const [site, setSite] = useState(params.get('site') ?? last.site ?? '');
  const [line, setLine] = useState(params.get('line') ?? last.line ?? '');
  const [applicator, setApplicator] = useState(params.get('applicator') ?? '');
  const [clientId] = useState(newClientId);
  const applicatorId = Number(params.get('applicatorId')) || null;
  const registered = useQuery({
    queryKey: ['walks', 'applicator', applicatorId],
    queryFn: () => api<{ applicator: { id: number; tag: string; siteName: string; lineName: string } }>(`/api/applicators/${applicatorId}`).then((r) => r.applicator),
    enabled: applicatorId !== null,
    retry: false,
    meta: { quiet: true },
  });
  const onApplicator = applicatorId !== null && registered.isSuccess;

  function submit(e: FormEvent) {
    e.preventDefault();
    if (onApplicator) {
      // The server fills site, line and tag from the record; the body type of useStartWalk is structural.
      const body = { guideId, clientId, applicatorId };
      start.mutate(body, { onSuccess: (w) => navigate(`/walks/${w.id}`, { replace: true }) });
      return;
    }
    localStorage.setItem(LAST_PLACE, JSON.stringify({ site, line }));
    start.mutate({ guideId, site: site || undefined, line: line || undefined, applicator: applicator || undefined, clientId }, { onSuccess: (w) => navigate(`/walks/${w.id}`, { replace: true }) });
  }

  if (guide.isPending || (applicatorId !== null && registered.isPending)) return <LoadingBlock />;
  if (guide.isError || !guide.data.published)
    return (
      <Notice tone="error" title="This guide cannot be walked">
        {guide.isError ? errorMessage(guide.error) : 'It has no published version yet.'}
      </Notice>
    );
  return (
    <form onSubmit={submit} className="mx-auto flex min-h-[70dvh] max-w-md flex-col">
      <Link to={`/guides/${guideId}`} className="inline-flex min-h-11 items-center text-sm font-semibold text-amber-deep underline">
        About this guide
      </Link>
      <p className="mt-3 font-semibold text-amber-deep">{guide.data.published.meta.symptom}</p>
      <h1 className="text-2xl font-semibold">{guide.data.published.meta.title}</h1>
      {onApplicator ? (
        <div className="mt-4 rounded-md border-2 border-fixed bg-fixed-wash p-3" data-applicator={registered.data.id}>
          <p className="text-sm font-semibold text-fixed">Recorded on</p>
          <p className="text-xl font-semibold">{registered.data.tag}</p>
          <p>
            {registered.data.siteName} · {registered.data.lineName}
          </p>
        </div>
      ) : (
        <>
          {applicatorId !== null ? (
            <div className="mt-3">
              <Notice tone="warn" title="The scanned applicator was not found">
                {errorMessage(registered.error)} Type where you are instead.
              </Notice>
            </div>
          ) : null}
          <p className="mt-2 text-ink-soft">Where are you? All optional: it helps the next person and the manager.</p>
          <div className="mt-4 space-y-4">
            <TextField label="Site" value={site} onChange={(e) => setSite(e.target.value)} autoComplete="off" />
            <TextField label="Line" value={line} onChange={(e) => setLine(e.target.value)} autoComplete="off" />
            <TextField label="Valve (tag on the label)" value={applicator} onChange={(e) => setApplicator(e.target.value)} autoComplete="off" />
          </div>
        </>
      )}
      {start.isError ? (
        <div className="mt-4">
          <Notice tone="error" title={errorMessage(start.error)} />
        </div>
      ) : null}
      <div className="mt-auto pt-6">
        <Button type="submit" className="w-full !min-h-14 text-lg" busy={start.isPending}>
          Start walk
        </Button>
      </div>
    </form>
  );
}
