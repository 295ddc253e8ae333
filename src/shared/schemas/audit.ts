// The audit log as the API shows it: filters for the list and the shape of one event.
import { z } from 'zod';

const day = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date like 2026-12-31');

export const AuditListQuery = z.object({
  action: z.string().trim().max(60).optional(),
  entityKind: z.string().trim().max(60).optional(),
  entityId: z.string().trim().max(60).optional(),
  userId: z.coerce.number({ error: 'User id must be a number' }).int().positive().max(2_147_483_647).optional(),
  from: day.optional(),
  /** Inclusive: the whole of this day. */
  to: day.optional(),
  page: z.coerce.number({ error: 'Page must be a number' }).int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number({ error: 'Page size must be a number' }).int().min(1).max(200).default(50),
});
export type AuditListQuery = z.output<typeof AuditListQuery>;

export interface AuditEventView {
  id: number;
  userId: number | null;
  userName: string | null;
  userEmail: string | null;
  action: string;
  entityKind: string;
  entityId: string | null;
  before: unknown;
  after: unknown;
  at: string;
}

export interface AuditPage {
  events: AuditEventView[];
  total: number;
  page: number;
  pageSize: number;
}
