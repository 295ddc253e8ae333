// Guide endpoints: key factory, fetchers and hooks.
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { GuideDraftContent } from '@/shared/guides';
import type { CauseView, GuideComparison, GuideDetail, GuideImportResult, GuideListItem, GuideMetaInput } from '@/shared/schemas/guides';
import { api } from '@/lib/api-client';

export interface GuideFilters {
  status?: string;
  tag?: string;
  q?: string;
  symptom?: string;
}

export const guideKeys = {
  all: ['guides'] as const,
  list: (f: GuideFilters) => [...guideKeys.all, 'list', f] as const,
  detail: (id: number) => [...guideKeys.all, 'detail', id] as const,
  compare: (id: number, from: string, to: string) => [...guideKeys.all, 'compare', id, from, to] as const,
  causes: ['causes'] as const,
};

export function guidesQuery(f: GuideFilters) {
  const p = new URLSearchParams(Object.entries(f).filter(([, v]) => v) as [string, string][]);
  return queryOptions({ queryKey: guideKeys.list(f), queryFn: () => api<{ guides: GuideListItem[] }>(`/api/guides?${p}`).then((r) => r.guides) });
}

export function useGuides(f: GuideFilters) {
  return useQuery(guidesQuery(f));
}

export function useGuide(id: number, enabled = true) {
  return useQuery({ queryKey: guideKeys.detail(id), queryFn: () => api<{ guide: GuideDetail }>(`/api/guides/${id}`).then((r) => r.guide), enabled: enabled && id > 0 });
}

export function useCauses() {
  return useQuery({ queryKey: guideKeys.causes, queryFn: () => api<{ causes: CauseView[] }>('/api/causes').then((r) => r.causes), staleTime: 5 * 60_000 });
}

export function useCreateGuide() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: GuideMetaInput & { content?: GuideDraftContent }) => api<{ guide: GuideDetail }>('/api/guides', { method: 'POST', body: input }).then((r) => r.guide),
    onSuccess: (g) => {
      qc.setQueryData(guideKeys.detail(g.id), g);
      qc.invalidateQueries({ queryKey: [...guideKeys.all, 'list'] });
    },
    meta: { inlineErrors: true },
  });
}

export function saveDraft(id: number, body: { meta: GuideMetaInput; content: GuideDraftContent; baseLockVersion: number }) {
  return api<{ guide: GuideDetail }>(`/api/guides/${id}/draft`, { method: 'PUT', body }).then((r) => r.guide);
}

type Action = 'submit' | 'withdraw' | 'approve' | 'request-changes' | 'retire' | 'restore' | 'draft';

export function useGuideAction(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ action, comment, baseLockVersion }: { action: Action; comment?: string; baseLockVersion?: number }) =>
      api<{ guide: GuideDetail }>(`/api/guides/${id}/${action}`, { method: 'POST', body: { ...(comment !== undefined ? { comment } : {}), ...(baseLockVersion ? { baseLockVersion } : {}) } }).then(
        (r) => r.guide,
      ),
    onSuccess: (g) => {
      qc.setQueryData(guideKeys.detail(id), g);
      qc.invalidateQueries({ queryKey: [...guideKeys.all, 'list'] });
    },
  });
}

export function useDiscardDraft(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<{ guide: GuideDetail }>(`/api/guides/${id}/draft`, { method: 'DELETE' }).then((r) => r.guide),
    onSuccess: (g) => qc.setQueryData(guideKeys.detail(id), g),
  });
}

export function useGuideComparison(id: number, from: string, to: string, enabled: boolean) {
  return useQuery({
    queryKey: guideKeys.compare(id, from, to),
    queryFn: () => api<{ comparison: GuideComparison }>(`/api/guides/${id}/compare?from=${from}&to=${to}`).then((r) => r.comparison),
    enabled,
  });
}

export function useImportGuide() {
  const qc = useQueryClient();
  return useMutation({
    // Sent with upload progress: a guide file with many steps is large on a slow link.
    // Loaded on use: pages that only read guides (home among them) do not carry the upload code.
    mutationFn: async (v: { file: object; onProgress?: (fraction: number) => void }) =>
      (await import('@/lib/uploads')).sendWithProgress<GuideImportResult>('POST', '/api/guides/import', v.file, { onProgress: v.onProgress }),
    onSuccess: () => qc.invalidateQueries({ queryKey: [...guideKeys.all, 'list'] }),
    meta: { inlineErrors: true },
  });
}

/** Published articles an author can link from a step. */
export function usePublishedArticles() {
  return useQuery({
    queryKey: ['articles', 'list', { status: 'published' }],
    queryFn: () => api<{ articles: { id: number; title: string }[] }>('/api/articles?status=published').then((r) => r.articles),
    staleTime: 60_000,
  });
}

export interface GuideWalkOutcome {
  id: number;
  userName: string | null;
  outcome: string | null;
  outcomeNote: string | null;
  causeCode: string | null;
  endedAt: string | null;
  line: string | null;
  versionNumber: number;
}

/** Ended walks of a guide, for its authors to see where it did not lead to a fix. */
export function useGuideWalkOutcomes(guideId: number, enabled: boolean) {
  return useQuery({
    queryKey: ['walks', 'list', { guideId: String(guideId), status: 'ended' }],
    queryFn: () => api<{ walks: GuideWalkOutcome[] }>(`/api/walks?guideId=${guideId}&status=ended&mine=0`).then((r) => r.walks),
    enabled,
  });
}
