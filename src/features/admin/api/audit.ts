// The audit log (admins): one paged, filtered list.
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import type { AuditPage } from '@/shared/schemas/audit';
import { api } from '@/lib/api-client';

export interface AuditFilters {
  action?: string;
  entityKind?: string;
  from?: string;
  to?: string;
  page: number;
}

export const auditKeys = { all: ['admin', 'audit'] as const, list: (f: AuditFilters) => ['admin', 'audit', f] as const };

export function useAuditLog(filters: AuditFilters) {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(filters)) if (v !== undefined && v !== '') params.set(k, String(v));
  return useQuery({ queryKey: auditKeys.list(filters), queryFn: () => api<AuditPage>(`/api/admin/audit?${params}`), placeholderData: keepPreviousData });
}
