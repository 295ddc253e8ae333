// Organisation settings and tag lists (admins).
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

import type { OrgSettings, SettingsPatch } from '@/shared/schemas/settings';

export type { OrgSettings };
export interface AdminTag {
  group: 'actuation' | 'component' | 'fluid';
  slug: string;
  label: string;
  active: boolean;
}

export const settingsKeys = { settings: ['admin', 'settings'] as const, tags: ['admin', 'tags'] as const };

export function useSettings() {
  return useQuery({ queryKey: settingsKeys.settings, queryFn: () => api<{ settings: OrgSettings }>('/api/admin/settings').then((r) => r.settings) });
}

export function useSaveSettings() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (patch: SettingsPatch) => api<{ settings: OrgSettings }>('/api/admin/settings', { method: 'PATCH', body: patch }).then((r) => r.settings),
    onSuccess: (s) => {
      qc.setQueryData(settingsKeys.settings, s);
      qc.invalidateQueries({ queryKey: ['insights'] });
    },
  });
}

export function useAdminTags() {
  return useQuery({ queryKey: settingsKeys.tags, queryFn: () => api<{ tags: AdminTag[] }>('/api/admin/tags').then((r) => r.tags) });
}

export function useSaveTags() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (tags: AdminTag[]) => api<{ tags: AdminTag[] }>('/api/admin/tags', { method: 'PUT', body: { tags } }).then((r) => r.tags),
    onSuccess: (t) => {
      qc.setQueryData(settingsKeys.tags, t);
      qc.invalidateQueries({ queryKey: ['tags'] });
    },
  });
}

export interface AdminCause {
  code: string;
  label: string;
  component: string | null;
  active: boolean;
}

export function useAdminCauses() {
  return useQuery({ queryKey: ['causes', 'all'], queryFn: () => api<{ causes: AdminCause[] }>('/api/causes?includeInactive=1').then((r) => r.causes) });
}

export function useSaveCauses() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (causes: AdminCause[]) =>
      api<{ causes: AdminCause[] }>('/api/causes', { method: 'PUT', body: { causes: causes.filter((c) => c.active).map(({ code, label, component }) => ({ code, label, component })) } }).then(
        (r) => r.causes,
      ),
    onSuccess: (c) => {
      qc.setQueryData(['causes', 'all'], c);
      qc.invalidateQueries({ queryKey: ['causes'] });
    },
  });
}
