// /api/admin/audit: the organisation's audit log, newest first, filtered and paged. Read-only by design.
import type { Knex } from 'knex';
import { AuditListQuery, type AuditPage } from '../../../src/shared/schemas/audit';
import { auditRepository } from '../../lib/audit';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';

export function auditRoutes(deps: { db: Knex }) {
  const r = new ApiRouter('/api/admin/audit');
  r.get('/', 'audit:read', validate('query', AuditListQuery), async (req, res) => {
    const q = res.locals.query as AuditListQuery;
    // "to" names a whole day, so the bound is the start of the next one.
    const to = q.to ? new Date(Date.parse(`${q.to}T00:00:00Z`) + 86_400_000).toISOString() : undefined;
    const out = await auditRepository.list(deps.db, req.user!.organisationId, { ...q, to });
    const page: AuditPage = { ...out, page: q.page, pageSize: q.pageSize };
    res.json(page);
  });
  return r;
}
