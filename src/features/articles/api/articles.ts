// Article endpoints: one key factory, fetchers and hooks.
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ArticleDetail, ArticleRevisionView, ArticleSummary } from '@/shared/schemas/articles';
import { api } from '@/lib/api-client';

export interface ArticleFilters {
  status?: string;
  tag?: string;
  q?: string;
  mine?: '1';
}

export const articleKeys = {
  all: ['articles'] as const,
  list: (f: ArticleFilters) => [...articleKeys.all, 'list', f] as const,
  detail: (id: number) => [...articleKeys.all, 'detail', id] as const,
  revisions: (id: number) => [...articleKeys.all, 'revisions', id] as const,
  compare: (id: number, from: number, to: number) => [...articleKeys.all, 'compare', id, from, to] as const,
};

export { useTags, type TagView } from '@/lib/tags';

export function articlesQuery(f: ArticleFilters) {
  const p = new URLSearchParams(Object.entries(f).filter(([, v]) => v) as [string, string][]);
  return queryOptions({
    queryKey: articleKeys.list(f),
    queryFn: () => api<{ articles: ArticleSummary[] }>(`/api/articles?${p}`).then((r) => r.articles),
  });
}

export function useArticles(f: ArticleFilters) {
  return useQuery(articlesQuery(f));
}

export function articleQuery(id: number) {
  return queryOptions({ queryKey: articleKeys.detail(id), queryFn: () => api<{ article: ArticleDetail }>(`/api/articles/${id}`).then((r) => r.article) });
}

export function useArticle(id: number, enabled = true) {
  return useQuery({ ...articleQuery(id), enabled: enabled && id > 0 });
}

export interface SaveBody {
  title: string;
  summary: string;
  body: unknown;
  tags: string[];
  keywords: string[];
}

export function useCreateArticle() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (b: SaveBody) => api<{ article: ArticleDetail }>('/api/articles', { method: 'POST', body: b }).then((r) => r.article),
    onSuccess: (a) => {
      qc.setQueryData(articleKeys.detail(a.id), a);
      qc.invalidateQueries({ queryKey: [...articleKeys.all, 'list'] });
    },
    meta: { inlineErrors: true },
  });
}

export function saveArticle(id: number, b: SaveBody & { baseVersion: number; autosave: boolean }) {
  return api<{ article: ArticleDetail }>(`/api/articles/${id}`, { method: 'PUT', body: b }).then((r) => r.article);
}

type Action = 'submit' | 'withdraw' | 'approve' | 'request-changes' | 'archive' | 'unarchive';

export function useArticleAction(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ action, comment }: { action: Action; comment?: string }) =>
      api<{ article: ArticleDetail }>(`/api/articles/${id}/${action}`, { method: 'POST', body: comment !== undefined ? { comment } : {} }).then((r) => r.article),
    onSuccess: (a) => {
      qc.setQueryData(articleKeys.detail(id), a);
      qc.invalidateQueries({ queryKey: [...articleKeys.all, 'list'] });
    },
  });
}

export interface RevisionListItem {
  number: number;
  title: string;
  note: string | null;
  authorName: string | null;
  createdAt: string;
  updatedAt: string;
  published: boolean;
}

export function useRevisions(id: number) {
  return useQuery({ queryKey: articleKeys.revisions(id), queryFn: () => api<{ revisions: RevisionListItem[] }>(`/api/articles/${id}/revisions`).then((r) => r.revisions) });
}

export interface Chunk {
  value: string;
  change: 'added' | 'removed' | 'same';
}
export interface Comparison {
  from: number;
  to: number;
  title: Chunk[];
  summary: Chunk[];
  body: Chunk[];
  tags: { added: string[]; removed: string[] };
}

export function useComparison(id: number, from: number, to: number, enabled: boolean) {
  return useQuery({
    queryKey: articleKeys.compare(id, from, to),
    queryFn: () => api<{ comparison: Comparison }>(`/api/articles/${id}/compare?from=${from}&to=${to}`).then((r) => r.comparison),
    enabled,
  });
}

export function useRevision(id: number, number: number | null) {
  return useQuery({
    queryKey: [...articleKeys.all, 'revision', id, number],
    queryFn: () => api<{ revision: ArticleRevisionView }>(`/api/articles/${id}/revisions/${number}`).then((r) => r.revision),
    enabled: number !== null,
  });
}

export function useRestoreRevision(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ number, baseVersion }: { number: number; baseVersion: number }) =>
      api<{ article: ArticleDetail }>(`/api/articles/${id}/revisions/${number}/restore`, { method: 'POST', body: { baseVersion } }).then((r) => r.article),
    onSuccess: (a) => {
      qc.setQueryData(articleKeys.detail(id), a);
      qc.invalidateQueries({ queryKey: articleKeys.revisions(id) });
    },
  });
}

export { uploadFile, type UploadedFile } from '@/lib/uploads';
