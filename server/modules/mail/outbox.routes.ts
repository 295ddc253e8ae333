// /api/admin/outbox: every message Beadpath sent or tried to send, for admins.
import { OutboxIdParam, OutboxListQuery } from '../../../src/shared/schemas/cases';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { MailService } from './mail.service';

export function outboxRoutes(deps: { mail: MailService }): ApiRouter {
  const r = new ApiRouter('/api/admin/outbox');
  const id = validate('params', OutboxIdParam);

  r.get('/', 'mail:outbox', validate('query', OutboxListQuery), async (req, res) => {
    res.setHeader('Cache-Control', 'private, no-cache');
    res.json(await deps.mail.outbox(req.user!.organisationId, res.locals.query));
  });

  r.get('/:id', 'mail:outbox', id, async (req, res) => {
    res.setHeader('Cache-Control', 'private, no-cache');
    res.json({ message: await deps.mail.message(req.user!.organisationId, res.locals.params.id) });
  });

  r.post('/:id/resend', 'mail:outbox', id, async (req, res) => {
    res.json({ message: await deps.mail.resend(req.user!.organisationId, res.locals.params.id) });
  });

  return r;
}
