// /api/cases (the support desk's cases), /api/notices (in-app notices of hand-offs and
// assignments) and /api/admin/outbox (every e-mail, for admins).
import { originOf } from '../mail/origin';
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import {
  CaseHandoffInput,
  CaseIdParam,
  CaseInput,
  CaseListQuery,
  CaseNoteInput,
  CasePatchInput,
  CaseStatusInput,
  CaseSummaryInput,
  CaseSummaryQuery,
  CaseWalkInput,
  NoticeIdParam,
} from '../../../src/shared/schemas/cases';
import type { Config } from '../../config/env';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { FilesService } from '../files/files.service';
import { createMailService, type MailService } from '../mail/mail.service';
import { outboxRoutes } from '../mail/outbox.routes';
import { createCasesService } from './cases.service';

export interface CasesDeps {
  db: Knex;
  config: Config;
  logger: Logger;
  files: FilesService;
  /** The app's mail service; one of its own is made when none is given. */
  mail?: MailService;
}

export function casesRoutes(deps: CasesDeps): ApiRouter[] {
  const mail = deps.mail ?? createMailService(deps);
  const s = createCasesService({ ...deps, mail });
  const r = new ApiRouter('/api/cases');
  const id = validate('params', CaseIdParam);

  // Everyone may list cases; the service narrows the list to what each role is given.
  r.get('/', 'cases:read', validate('query', CaseListQuery), async (req, res) => {
    res.setHeader('Cache-Control', 'private, no-cache');
    res.json(await s.list(req.user!, res.locals.query));
  });

  r.post('/', 'cases:work', validate('body', CaseInput), async (req, res) => {
    res.status(201).json({ case: await s.create(req.user!, res.locals.body) });
  });

  r.get('/people', 'cases:read', async (req, res) => {
    res.json({ people: await s.people(req.user!) });
  });

  r.get('/:id', 'cases:read', id, async (req, res) => {
    res.setHeader('Cache-Control', 'private, no-cache');
    res.json({ case: await s.get(req.user!, res.locals.params.id) });
  });

  r.patch('/:id', 'cases:work', id, validate('body', CasePatchInput), async (req, res) => {
    res.json({ case: await s.update(req.user!, res.locals.params.id, res.locals.body) });
  });

  // The person a case is assigned to may work on it too; the service checks who that is.
  r.post('/:id/status', 'cases:read', id, validate('body', CaseStatusInput), async (req, res) => {
    res.json({ case: await s.setStatus(req.user!, res.locals.params.id, res.locals.body) });
  });

  r.post('/:id/notes', 'cases:read', id, validate('body', CaseNoteInput), async (req, res) => {
    res.status(201).json({ case: await s.addNote(req.user!, res.locals.params.id, res.locals.body) });
  });

  r.post('/:id/walks', 'cases:work', id, validate('body', CaseWalkInput), async (req, res) => {
    res.status(201).json({ case: await s.linkWalk(req.user!, res.locals.params.id, res.locals.body.walkId) });
  });

  r.post('/:id/handoff', 'cases:work', id, validate('body', CaseHandoffInput), async (req, res) => {
    res.json({ case: await s.handoff(req.user!, res.locals.params.id, res.locals.body, originOf(req)) });
  });

  r.get('/:id/summary', 'cases:work', id, validate('query', CaseSummaryQuery), async (req, res) => {
    res.setHeader('Cache-Control', 'private, no-cache');
    res.json({ preview: await s.summaryPreview(req.user!, res.locals.params.id, res.locals.query.walkId) });
  });

  r.post('/:id/summary', 'cases:work', id, validate('body', CaseSummaryInput), async (req, res) => {
    res.status(201).json({ case: await s.sendSummary(req.user!, res.locals.params.id, res.locals.body) });
  });

  const n = new ApiRouter('/api/notices');
  n.get('/', 'cases:read', async (req, res) => {
    res.setHeader('Cache-Control', 'private, no-cache');
    res.json(await s.notices(req.user!));
  });
  n.post('/:id/read', 'cases:read', validate('params', NoticeIdParam), async (req, res) => {
    await s.readNotice(req.user!, res.locals.params.id);
    res.status(204).end();
  });

  return [r, n, outboxRoutes({ mail })];
}
