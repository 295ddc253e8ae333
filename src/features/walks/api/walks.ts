// Walk endpoints: key factory, fetchers and hooks. Answers do not go through here directly but
// through the device queue (use-walk-runner), so that nothing is lost without a connection.
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { BatchResult, NoteResult, WalkDetail, WalkListItem, WalkSummary } from '@/shared/schemas/walks';
import { api } from '@/lib/api-client';
import { takeEarly } from '@/lib/early-fetch';
import type { ApplicatorSpecs } from '@/shared/walks';

export const walkKeys = {
  all: ['walks'] as const,
  list: (f: Record<string, string>) => [...walkKeys.all, 'list', f] as const,
  detail: (id: number) => [...walkKeys.all, 'detail', id] as const,
  summary: (id: number) => [...walkKeys.all, 'summary', id] as const,
};

export function useWalks(f: { mine?: '1'; status?: string; guideId?: string }, opts: { enabled?: boolean } = {}) {
  const p = new URLSearchParams(Object.entries(f).filter(([, v]) => v) as [string, string][]);
  return useQuery({ queryKey: walkKeys.list(f as Record<string, string>), queryFn: () => api<{ walks: WalkListItem[] }>(`/api/walks?${p}`).then((r) => r.walks), enabled: opts.enabled ?? true });
}

export function useWalk(id: number, opts: { poll?: boolean } = {}) {
  return useQuery({
    queryKey: walkKeys.detail(id),
    // The first read may already be on its way (started with the app when a walk's address is opened).
    queryFn: () => (takeEarly<{ walk: WalkDetail }>(`/api/walks/${id}`) ?? api<{ walk: WalkDetail }>(`/api/walks/${id}`)).then((r) => r.walk),
    refetchInterval: opts.poll ? 3000 : false,
    enabled: id > 0,
  });
}

export function useWalkSummary(id: number) {
  return useQuery({ queryKey: walkKeys.summary(id), queryFn: () => api<{ summary: WalkSummary }>(`/api/walks/${id}/summary`).then((r) => r.summary) });
}

export function useStartWalk() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (b: { guideId: number; site?: string; line?: string; applicator?: string; clientId: string }) =>
      api<{ walk: WalkDetail }>('/api/walks', { method: 'POST', body: b }).then((r) => r.walk),
    onSuccess: (w) => {
      qc.setQueryData(walkKeys.detail(w.id), w);
      qc.invalidateQueries({ queryKey: [...walkKeys.all, 'list'] });
    },
  });
}

export function sendBatch(id: number, answers: unknown[]) {
  return api<BatchResult>(`/api/walks/${id}/answers/batch`, { method: 'POST', body: { answers } });
}

export function sendNote(id: number, note: Record<string, unknown>) {
  return api<NoteResult>(`/api/walks/${id}/notes`, { method: 'POST', body: note });
}

export function useAbandonWalk(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (reason?: string) => api<unknown>(`/api/walks/${id}/abandon`, { method: 'POST', body: reason ? { reason } : {} }),
    onSuccess: () => qc.invalidateQueries({ queryKey: walkKeys.all }),
  });
}

export function useFlagStep(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (b: { stepId: string; comment: string }) => api<unknown>(`/api/walks/${id}/flags`, { method: 'POST', body: b }),
    onSuccess: () => qc.invalidateQueries({ queryKey: walkKeys.detail(id) }),
    meta: { inlineErrors: true },
  });
}

/** The specs of the walk's applicator, for prefilling calculator inputs. */
export function useWalkApplicator(applicatorId: number | null) {
  return useQuery({
    queryKey: ['applicators', 'detail', applicatorId],
    queryFn: () => api<{ applicator: ApplicatorSpecs & { tag: string } }>(`/api/applicators/${applicatorId}`).then((r) => r.applicator),
    enabled: Boolean(applicatorId),
    staleTime: 300_000,
    meta: { quiet: true },
  });
}
