// Asset endpoints: one key factory, fetchers and hooks for sites, lines, the organisation's own
// fields, applicators with their readings and service events, and CSV imports.
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ApplicatorDetail, ApplicatorListItem, FieldView, ImportKind, ImportMode, ImportPreview, ImportResult, LineView, SiteView } from '@/shared/schemas/assets';
import { api, ApiError } from '@/lib/api-client';

export interface ApplicatorFilters {
  siteId?: string;
  lineId?: string;
  status?: string;
  q?: string;
}

export const assetKeys = {
  all: ['assets'] as const,
  sites: () => [...assetKeys.all, 'sites'] as const,
  lines: () => [...assetKeys.all, 'lines'] as const,
  fields: () => [...assetKeys.all, 'fields'] as const,
  lists: () => [...assetKeys.all, 'list'] as const,
  list: (f: ApplicatorFilters) => [...assetKeys.lists(), f] as const,
  detail: (id: number) => [...assetKeys.all, 'detail', id] as const,
  guides: () => [...assetKeys.all, 'guides'] as const,
  causes: () => [...assetKeys.all, 'causes'] as const,
};

export function useSites() {
  return useQuery({ queryKey: assetKeys.sites(), queryFn: () => api<{ sites: SiteView[] }>('/api/sites').then((r) => r.sites) });
}

export function useLines() {
  return useQuery({ queryKey: assetKeys.lines(), queryFn: () => api<{ lines: LineView[] }>('/api/lines').then((r) => r.lines) });
}

export function useFields() {
  return useQuery({ queryKey: assetKeys.fields(), queryFn: () => api<{ fields: FieldView[] }>('/api/applicators/fields').then((r) => r.fields) });
}

export function applicatorsQuery(f: ApplicatorFilters) {
  const p = new URLSearchParams(Object.entries(f).filter(([, v]) => v) as [string, string][]);
  return queryOptions({
    queryKey: assetKeys.list(f),
    queryFn: () => api<{ applicators: ApplicatorListItem[]; total: number }>(`/api/applicators?${p}`),
  });
}

export function useApplicators(f: ApplicatorFilters) {
  return useQuery(applicatorsQuery(f));
}

export function useApplicator(id: number) {
  return useQuery({
    queryKey: assetKeys.detail(id),
    queryFn: () => api<{ applicator: ApplicatorDetail }>(`/api/applicators/${id}`).then((r) => r.applicator),
    enabled: id > 0,
    retry: (count, err) => !(err instanceof ApiError && err.status < 500) && count < 2,
  });
}

/** Published guides, for the "what are you seeing?" chips that start a walk on this applicator. */
export function useWalkableGuides() {
  return useQuery({
    queryKey: assetKeys.guides(),
    queryFn: () =>
      api<{ guides: { id: number; symptom: string; title: string; tags: string[]; status: string; publishedVersion: number | null }[] }>('/api/guides').then((r) =>
        r.guides.filter((g) => g.publishedVersion && g.status === 'active'),
      ),
    staleTime: 5 * 60_000,
  });
}

export function useCauses() {
  return useQuery({
    queryKey: assetKeys.causes(),
    queryFn: () => api<{ causes: { code: string; label: string; active: boolean }[] }>('/api/causes').then((r) => r.causes),
    staleTime: 5 * 60_000,
  });
}

/** Saves through one endpoint and refreshes every asset list and page. */
function useAssetMutation<TBody, TResult>(fn: (b: TBody) => Promise<TResult>, opts: { inline?: boolean; onDone?: (r: TResult) => void } = {}) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: (r) => {
      opts.onDone?.(r);
      return qc.invalidateQueries({ queryKey: assetKeys.all });
    },
    meta: opts.inline === false ? undefined : { inlineErrors: true },
  });
}

export function useSaveSite() {
  return useAssetMutation((b: { id?: number; name: string; address: string; contact: string }) =>
    api<{ site: SiteView }>(b.id ? `/api/sites/${b.id}` : '/api/sites', { method: b.id ? 'PUT' : 'POST', body: { name: b.name, address: b.address, contact: b.contact } }).then((r) => r.site),
  );
}

export function useSaveLine() {
  return useAssetMutation((b: { id?: number; siteId: number; name: string; area: string; contact: string }) =>
    api<{ line: LineView }>(b.id ? `/api/lines/${b.id}` : '/api/lines', { method: b.id ? 'PUT' : 'POST', body: { siteId: b.siteId, name: b.name, area: b.area, contact: b.contact } }).then(
      (r) => r.line,
    ),
  );
}

export function useSaveField() {
  return useAssetMutation((b: { id?: number; name: string; type: string; unit: string }) =>
    api<{ field: FieldView }>(b.id ? `/api/applicators/fields/${b.id}` : '/api/applicators/fields', { method: b.id ? 'PUT' : 'POST', body: { name: b.name, type: b.type, unit: b.unit || null } }).then(
      (r) => r.field,
    ),
  );
}

export function useRemove() {
  return useAssetMutation((path: string) => api<void>(path, { method: 'DELETE' }), { inline: false });
}

export function useSaveApplicator(id?: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: Record<string, unknown>) =>
      api<{ applicator: ApplicatorDetail }>(id ? `/api/applicators/${id}` : '/api/applicators', { method: id ? 'PUT' : 'POST', body }).then((r) => r.applicator),
    onSuccess: (a) => {
      qc.setQueryData(assetKeys.detail(a.id), a);
      return qc.invalidateQueries({ queryKey: assetKeys.lists() });
    },
    meta: { inlineErrors: true },
  });
}

/** Readings and service events answer with the whole page, which replaces the cached one. */
function useApplicatorPost(id: number, suffix: string, method: 'POST' | 'DELETE' = 'POST') {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (vars: { body?: Record<string, unknown>; sub?: number }) =>
      api<{ applicator: ApplicatorDetail }>(`/api/applicators/${id}/${suffix}${vars.sub ? `/${vars.sub}` : ''}`, { method, body: vars.body }).then((r) => r.applicator),
    onSuccess: (a) => {
      qc.setQueryData(assetKeys.detail(id), a);
      return qc.invalidateQueries({ queryKey: assetKeys.lists() });
    },
    meta: method === 'POST' ? { inlineErrors: true } : undefined,
  });
}

export const useAddReading = (id: number) => useApplicatorPost(id, 'readings');
export const useRemoveReading = (id: number) => useApplicatorPost(id, 'readings', 'DELETE');
export const useAddServiceEvent = (id: number) => useApplicatorPost(id, 'service-events');
export const useRemoveServiceEvent = (id: number) => useApplicatorPost(id, 'service-events', 'DELETE');

/** Sends the file itself as text/csv: big files stay within the API's limits and nothing re-encodes it. */
// Sent with upload progress: a 40 MB file on a slow link takes a while.
async function postCsv<T>(path: string, csv: string, onProgress?: (fraction: number) => void): Promise<T> {
  try {
    // Loaded on use: pages that only read applicators do not carry the upload code.
    const { sendWithProgress } = await import('@/lib/uploads');
    return await sendWithProgress<T>('POST', path, csv, { onProgress, headers: { 'Content-Type': 'text/csv; charset=utf-8' } });
  } catch (err) {
    if (err instanceof ApiError && err.status === 0) throw new ApiError(0, 'network', 'The file could not be sent: no connection. Try again when you are back online.');
    throw err;
  }
}

export function usePreviewImport() {
  return useMutation({
    mutationFn: (v: { kind: ImportKind; csv: string; onProgress?: (fraction: number) => void }) =>
      postCsv<{ preview: ImportPreview }>(`/api/applicators/import/${v.kind}/preview`, v.csv, v.onProgress).then((r) => r.preview),
    meta: { inlineErrors: true },
  });
}

export function useCommitImport() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { kind: ImportKind; csv: string; mode: ImportMode; onProgress?: (fraction: number) => void }) =>
      postCsv<{ result: ImportResult }>(`/api/applicators/import/${v.kind}?mode=${v.mode}`, v.csv, v.onProgress).then((r) => r.result),
    onSuccess: () => qc.invalidateQueries({ queryKey: assetKeys.all }),
    meta: { inlineErrors: true },
  });
}
