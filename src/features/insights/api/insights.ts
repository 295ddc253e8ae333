// Insights endpoints: one key factory and a hook per question, plus the site, line and guide lists
// the filters offer.
import { useEffect, useRef } from 'react';
import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CausesAnswer, DigestPreference, ForecastAnswer, GuidesAnswer, InsightsStatus, ReliabilityAnswer } from '@/shared/schemas/insights';
import { api } from '@/lib/api-client';

export type Params = Record<string, string | undefined>;

const qs = (p: Params) => new URLSearchParams(Object.entries(p).filter(([, v]) => v) as [string, string][]).toString();

export const insightKeys = {
  all: ['insights'] as const,
  causes: (p: Params) => [...insightKeys.all, 'causes', p] as const,
  forecast: (p: Params) => [...insightKeys.all, 'forecast', p] as const,
  guides: (p: Params) => [...insightKeys.all, 'guides', p] as const,
  reliability: (p: Params) => [...insightKeys.all, 'reliability', p] as const,
  choices: () => [...insightKeys.all, 'choices'] as const,
  status: () => ['insights-status'] as const,
  digest: () => ['insights-digest'] as const,
};

/**
 * How fresh the summaries are. Polled while a refresh is asked for or changes wait, and when the
 * refresh time moves every insight is fetched again.
 */
export function useInsightsStatus() {
  const qc = useQueryClient();
  const q = useQuery({
    queryKey: insightKeys.status(),
    queryFn: () => api<InsightsStatus>('/api/insights/status'),
    refetchInterval: (query) => (query.state.data?.requestedAt || query.state.data?.changesWaiting ? 3000 : 60_000),
  });
  const seen = useRef<string | null | undefined>(undefined);
  const refreshedAt = q.data?.refreshedAt;
  useEffect(() => {
    if (refreshedAt === undefined) return;
    if (seen.current !== undefined && seen.current !== refreshedAt) void qc.invalidateQueries({ queryKey: insightKeys.all });
    seen.current = refreshedAt;
  }, [refreshedAt, qc]);
  return q;
}

export function useRefreshInsights() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<InsightsStatus>('/api/insights/refresh', { method: 'POST' }),
    onSuccess: (status) => qc.setQueryData(insightKeys.status(), status),
  });
}

export function useDigestPreference() {
  return useQuery({ queryKey: insightKeys.digest(), queryFn: () => api<DigestPreference>('/api/insights/digest') });
}

export function useSetDigest() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (enabled: boolean) => api<DigestPreference>('/api/insights/digest', { method: 'PUT', body: { enabled } }),
    onSuccess: (pref) => qc.setQueryData(insightKeys.digest(), pref),
  });
}

export function useDigestPreview() {
  return useMutation({ mutationFn: () => api<{ to: string }>('/api/insights/digest/preview', { method: 'POST' }) });
}

export function useCauses(p: Params) {
  return useQuery({ queryKey: insightKeys.causes(p), queryFn: () => api<CausesAnswer>(`/api/insights/causes?${qs(p)}`), placeholderData: keepPreviousData });
}

export function useForecast(p: Params) {
  return useQuery({ queryKey: insightKeys.forecast(p), queryFn: () => api<ForecastAnswer>(`/api/insights/forecast?${qs(p)}`), placeholderData: keepPreviousData });
}

export function forecastCsvHref(p: Params) {
  return `/api/insights/forecast.csv?${qs(p)}`;
}

export function useGuideEffectiveness(p: Params) {
  return useQuery({ queryKey: insightKeys.guides(p), queryFn: () => api<GuidesAnswer>(`/api/insights/guides?${qs(p)}`), placeholderData: keepPreviousData });
}

export function useReliability(p: Params) {
  return useQuery({ queryKey: insightKeys.reliability(p), queryFn: () => api<ReliabilityAnswer>(`/api/insights/reliability?${qs(p)}`), placeholderData: keepPreviousData });
}

export interface FilterChoices {
  sites: { id: number; name: string }[];
  lines: { id: number; name: string; siteId: number }[];
  guides: { id: number; title: string }[];
}

export function useFilterChoices() {
  return useQuery({
    queryKey: insightKeys.choices(),
    queryFn: async (): Promise<FilterChoices> => {
      const [sites, lines, guides] = await Promise.all([
        api<{ sites: { id: number; name: string }[] }>('/api/sites'),
        api<{ lines: { id: number; name: string; siteId: number }[] }>('/api/lines'),
        api<{ guides: { id: number; title: string }[] }>('/api/guides?status=all'),
      ]);
      return { sites: sites.sites, lines: lines.lines, guides: guides.guides };
    },
    staleTime: 60_000,
  });
}
