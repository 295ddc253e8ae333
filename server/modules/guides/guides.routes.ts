// /api/guides (authoring, review, versions, the guide file) and /api/causes (the organisation's
// list of causes that findings carry).
//
// Import takes the guide file as the request body, so it is bound by the app's JSON body limit
// (JSON_BODY_LIMIT, 1 MB unless configured): a 300-step guide with its texts fits well within it.
// A larger body is answered 413 by the app's JSON parser before it reaches this router.
import type { Knex } from 'knex';
import {
  CauseListInput,
  CauseListQuery,
  GuideActionInput,
  GuideApproveInput,
  GuideCompareQuery,
  GuideCreateInput,
  GuideDiscardQuery,
  GuideExportQuery,
  GuideIdParam,
  GuideListQuery,
  GuideRequestChangesInput,
  GuideSaveInput,
  GuideVersionParam,
} from '../../../src/shared/schemas/guides';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { FilesService } from '../files/files.service';
import type { TagsService } from '../tags/tags.service';
import { createCausesService } from './causes.service';
import { validateGuideBody } from './guides.problems';
import { createGuidesService } from './guides.service';

export interface GuidesDeps {
  db: Knex;
  tags: TagsService;
  files: FilesService;
}

export function guidesRoutes(deps: GuidesDeps): ApiRouter[] {
  const causes = createCausesService(deps.db);
  const s = createGuidesService({ ...deps, causes });
  const r = new ApiRouter('/api/guides');
  const id = validate('params', GuideIdParam);
  const action = validate('body', GuideActionInput);

  r.get('/', 'guides:read', validate('query', GuideListQuery), async (req, res) => {
    res.json({ guides: await s.list(req.user!, res.locals.query) });
  });
  r.post('/', 'guides:write', validateGuideBody(GuideCreateInput), async (req, res) => {
    res.status(201).json({ guide: await s.create(req.user!, res.locals.body) });
  });
  // Declared before '/:id' routes; the file is checked by parseGuideFile, which reports every problem.
  r.post('/import', 'guides:write', async (req, res) => {
    res.status(201).json(await s.importFile(req.user!, req.body ?? null));
  });
  r.get('/:id', 'guides:read', id, async (req, res) => {
    res.json({ guide: await s.get(req.user!, res.locals.params.id) });
  });
  r.put('/:id/draft', 'guides:write', id, validateGuideBody(GuideSaveInput), async (req, res) => {
    res.json({ guide: await s.saveDraft(req.user!, res.locals.params.id, res.locals.body) });
  });
  r.post('/:id/draft', 'guides:write', id, async (req, res) => {
    res.status(201).json({ guide: await s.startDraft(req.user!, res.locals.params.id) });
  });
  r.delete('/:id/draft', 'guides:write', id, validate('query', GuideDiscardQuery), async (req, res) => {
    res.json({ guide: await s.discardDraft(req.user!, res.locals.params.id, res.locals.query.baseLockVersion) });
  });
  r.post('/:id/submit', 'guides:write', id, action, async (req, res) => {
    res.json({ guide: await s.submit(req.user!, res.locals.params.id, res.locals.body.baseLockVersion) });
  });
  r.post('/:id/withdraw', 'guides:write', id, action, async (req, res) => {
    res.json({ guide: await s.withdraw(req.user!, res.locals.params.id, res.locals.body.baseLockVersion) });
  });
  r.post('/:id/approve', 'guides:review', id, validate('body', GuideApproveInput), async (req, res) => {
    res.json({ guide: await s.approve(req.user!, res.locals.params.id, res.locals.body) });
  });
  r.post('/:id/request-changes', 'guides:review', id, validate('body', GuideRequestChangesInput), async (req, res) => {
    const { comment, baseLockVersion } = res.locals.body;
    res.json({ guide: await s.requestChanges(req.user!, res.locals.params.id, comment, baseLockVersion) });
  });
  r.post('/:id/retire', 'guides:write', id, async (req, res) => {
    res.json({ guide: await s.retire(req.user!, res.locals.params.id) });
  });
  r.post('/:id/restore', 'guides:write', id, async (req, res) => {
    res.json({ guide: await s.restore(req.user!, res.locals.params.id) });
  });
  r.get('/:id/versions/:number', 'guides:write', validate('params', GuideVersionParam), async (req, res) => {
    res.json({ version: await s.version(req.user!, res.locals.params.id, res.locals.params.number) });
  });
  r.get('/:id/compare', 'guides:write', id, validate('query', GuideCompareQuery), async (req, res) => {
    res.json({ comparison: await s.compare(req.user!, res.locals.params.id, res.locals.query.from, res.locals.query.to) });
  });
  r.get('/:id/export', 'guides:write', id, validate('query', GuideExportQuery), async (req, res) => {
    const { file, filename } = await s.exportFile(req.user!, res.locals.params.id, res.locals.query.version);
    res.setHeader('Content-Disposition', `attachment; filename="${filename}"`);
    res.type('application/json').send(JSON.stringify(file, null, 2));
  });

  const c = new ApiRouter('/api/causes');
  c.get('/', 'signedIn', validate('query', CauseListQuery), async (req, res) => {
    res.json({ causes: await causes.list(req.user!.organisationId, { includeInactive: res.locals.query.includeInactive === '1' }) });
  });
  c.put('/', 'causes:manage', validate('body', CauseListInput), async (req, res) => {
    res.json({ causes: await causes.replace(req.user!.organisationId, res.locals.body.causes, req.user!.id) });
  });

  return [r, c];
}
