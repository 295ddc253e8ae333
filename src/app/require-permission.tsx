// Hides a page the user's roles do not open (the server refuses its data anyway).
import type { ReactNode } from 'react';
import type { Permission } from '@/shared/permissions';
import { useCan } from '@/lib/auth';
import { Forbidden } from '@/components/errors/route-error';

export function RequirePermission({ permission, children }: { permission: Permission; children: ReactNode }) {
  return useCan(permission) ? <>{children}</> : <Forbidden />;
}
