// The signed-in user and their permissions, from GET /api/auth/me; sign-in and sign-out.
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { can, type Permission, type Role } from '@/shared/permissions';
import type { SessionUser } from '@/shared/schemas/auth';
import { ME_PATH } from '@/shared/early-reads';
import { api } from './api-client';
import { forgetEarly, takeEarly } from './early-fetch';

export interface Me {
  user: SessionUser;
  permissions: Permission[];
}

export const authKeys = {
  me: ['auth', 'me'] as const,
};

export const meQuery = queryOptions({
  queryKey: authKeys.me,
  queryFn: async (): Promise<Me | null> => {
    // Started with the app (src/app/router.tsx) when the page was opened; afterwards read afresh.
    const me = await (takeEarly<Me | { user: null }>(ME_PATH) ?? api<Me | { user: null }>(ME_PATH));
    return me.user ? (me as Me) : null;
  },
  staleTime: 60_000,
  meta: { quiet: true },
});

export function useMe() {
  return useQuery(meQuery);
}

export function useCan(permission: Permission): boolean {
  const { data } = useMe();
  return can(data?.user.roles, permission);
}

// The service worker keeps API answers and photos for offline use (see vite.config.ts); on a shared
// phone the next person must not read the last one's copies.
function forgetOfflineCopies() {
  if (typeof caches === 'undefined') return;
  for (const name of ['beadpath-api', 'beadpath-files']) void caches.delete(name).catch(() => false);
}

export function useLogin() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: { email: string; password: string }) => api<Me>('/api/auth/login', { method: 'POST', body: input }),
    onSuccess: (me) => {
      forgetOfflineCopies();
      forgetEarly();
      qc.clear();
      qc.setQueryData(authKeys.me, me);
    },
    meta: { inlineErrors: true },
  });
}

export function useLogout() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<void>('/api/auth/logout', { method: 'POST' }),
    onSuccess: () => {
      forgetOfflineCopies();
      forgetEarly();
      qc.clear();
      qc.setQueryData(authKeys.me, null);
    },
  });
}

const ACTIVE_ROLE_KEY = 'beadpath.activeRole';

export function activeRole(user: SessionUser): Role {
  const stored = localStorage.getItem(ACTIVE_ROLE_KEY) as Role | null;
  return stored && user.roles.includes(stored) ? stored : user.roles[0];
}

export function setActiveRole(role: Role) {
  localStorage.setItem(ACTIVE_ROLE_KEY, role);
}
