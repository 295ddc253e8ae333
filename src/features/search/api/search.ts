// Search endpoints: the query every search box uses (cancelled when superseded) and the admin's
// engine status, synonyms and rebuild.
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { SearchAdminStatus, SearchResponse } from '@/shared/schemas/search';
import { api } from '@/lib/api-client';

export interface SearchParams {
  q: string;
  kind?: 'all' | 'guide' | 'article';
  actuation?: string;
  component?: string;
  fluid?: string;
  limit?: number;
}

export const searchKeys = {
  all: ['search'] as const,
  results: (p: SearchParams) => [...searchKeys.all, 'results', p] as const,
  status: () => [...searchKeys.all, 'status'] as const,
  synonyms: () => [...searchKeys.all, 'synonyms'] as const,
};

function toQueryString(p: SearchParams) {
  const entries = Object.entries(p).filter(([, v]) => v !== undefined && v !== '' && v !== 'all');
  return new URLSearchParams(entries.map(([k, v]) => [k, String(v)])).toString();
}

export function searchQuery(p: SearchParams) {
  return queryOptions({
    queryKey: searchKeys.results(p),
    // Passing the signal lets TanStack Query abort a request the moment a newer keystroke replaces it.
    queryFn: ({ signal }) => api<SearchResponse>(`/api/search?${toQueryString(p)}`, { signal }),
    staleTime: 15_000,
    // Errors are shown beside the box; a toast per keystroke would bury the page.
    meta: { quiet: true },
  });
}

/** Results as you type: the previous answer stays on screen until the next one arrives. */
export function useSearch(p: SearchParams, enabled = true) {
  return useQuery({ ...searchQuery(p), enabled: enabled && (p.q.trim().length > 0 || Boolean(p.actuation || p.component || p.fluid)), placeholderData: keepPreviousData });
}

/** The engine's state, every 5 s, or every `pollMs` while a rebuild is being followed. */
export function useSearchStatus(pollMs = 5000) {
  return useQuery({
    queryKey: searchKeys.status(),
    queryFn: () => api<{ status: SearchAdminStatus }>('/api/admin/search').then((r) => r.status),
    refetchInterval: pollMs,
  });
}

export function useSynonyms() {
  return useQuery({ queryKey: searchKeys.synonyms(), queryFn: () => api<{ groups: string[][] }>('/api/admin/search/synonyms').then((r) => r.groups) });
}

export function useSaveSynonyms() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (groups: string[][]) => api<{ groups: string[][] }>('/api/admin/search/synonyms', { method: 'PUT', body: { groups: groups.map((terms) => ({ terms })) } }).then((r) => r.groups),
    onSuccess: (groups) => {
      qc.setQueryData(searchKeys.synonyms(), groups);
      qc.invalidateQueries({ queryKey: [...searchKeys.all, 'results'] });
    },
    meta: { inlineErrors: true },
  });
}

export function useReindex() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<{ queued: number }>('/api/admin/search/reindex', { method: 'POST', body: {} }),
    onSuccess: () => qc.invalidateQueries({ queryKey: searchKeys.status() }),
  });
}
