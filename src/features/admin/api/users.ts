// Admin user endpoints: list, invite, update, new invitation link.
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Role } from '@/shared/permissions';
import { api } from '@/lib/api-client';

export interface AdminUser {
  id: number;
  email: string;
  name: string;
  roles: Role[];
  active: boolean;
  invitePending: boolean;
  inviteExpiresAt: string | null;
  lastSignInAt: string | null;
  createdAt: string;
}

export const userKeys = {
  all: ['admin', 'users'] as const,
  list: () => [...userKeys.all, 'list'] as const,
};

export const usersQuery = queryOptions({
  queryKey: userKeys.list(),
  queryFn: () => api<{ users: AdminUser[] }>('/api/admin/users').then((r) => r.users),
});

export function useUsers() {
  return useQuery(usersQuery);
}

export function useInviteUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: { name: string; email: string; roles: Role[] }) => api<{ user: AdminUser; inviteToken: string }>('/api/admin/users', { method: 'POST', body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: userKeys.all }),
    meta: { inlineErrors: true },
  });
}

export function useUpdateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...patch }: { id: number; roles?: Role[]; active?: boolean; name?: string }) => api<{ user: AdminUser }>(`/api/admin/users/${id}`, { method: 'PATCH', body: patch }),
    onSettled: () => qc.invalidateQueries({ queryKey: userKeys.all }),
  });
}

export function useReissueInvite() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api<{ user: AdminUser; inviteToken: string }>(`/api/admin/users/${id}/invite`, { method: 'POST' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: userKeys.all }),
  });
}
