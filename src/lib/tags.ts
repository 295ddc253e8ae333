// The organisation's tag lists, used by articles, guides and search filters.
import { useQuery } from '@tanstack/react-query';
import { api } from './api-client';

export interface TagView {
  group: 'actuation' | 'component' | 'fluid';
  slug: string;
  label: string;
  active: boolean;
}

export const tagKeys = { list: ['tags'] as const };

export function useTags() {
  return useQuery({ queryKey: tagKeys.list, queryFn: () => api<{ tags: TagView[] }>('/api/tags').then((r) => r.tags), staleTime: 5 * 60_000 });
}
