// /api/admin: users of the organisation (admins only).
import { originOf } from '../mail/origin';
import { InviteUserInput, IdParam, UpdateUserInput } from '../../../src/shared/schemas/auth';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { createAdminService } from './admin.service';

export function adminRoutes(deps: { admin: ReturnType<typeof createAdminService> }) {
  const r = new ApiRouter('/api/admin');

  r.get('/users', 'users:manage', async (req, res) => {
    res.json({ users: await deps.admin.listUsers(req.user!.organisationId) });
  });

  r.post('/users', 'users:manage', validate('body', InviteUserInput), async (req, res) => {
    const out = await deps.admin.invite(req.user!.organisationId, res.locals.body, req.user!.id, originOf(req));
    res.status(201).json(out);
  });

  r.patch('/users/:id', 'users:manage', validate('params', IdParam), validate('body', UpdateUserInput), async (req, res) => {
    res.json({ user: await deps.admin.update(req.user!.organisationId, req.user!.id, res.locals.params.id, res.locals.body) });
  });

  r.post('/users/:id/invite', 'users:manage', validate('params', IdParam), async (req, res) => {
    res.json(await deps.admin.reissueInvite(req.user!.organisationId, res.locals.params.id, req.user!.id, originOf(req)));
  });

  return r;
}
