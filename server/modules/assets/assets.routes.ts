// /api/sites, /api/lines, /api/applicators: sites and lines, the organisation's own fields,
// applicators with their counter readings and service events, CSV import, export and templates.
import express, { type RequestHandler, type Response } from 'express';
import type { Knex } from 'knex';
import {
  ApplicatorInput,
  ApplicatorListQuery,
  AssetIdParam,
  FieldInput,
  ImportBody,
  ImportKindParam,
  ImportModeQuery,
  LineInput,
  LineListQuery,
  ReadingInput,
  ReadingParam,
  ServiceEventInput,
  ServiceEventParam,
  SiteInput,
  type ImportKind,
} from '../../../src/shared/schemas/assets';
import { AppError } from '../../lib/app-error';
import { ApiRouter } from '../../lib/routes';
import { parse, validate } from '../../lib/validate';
import type { FilesService } from '../files/files.service';
import { createAssetsImport } from './assets.import';
import { assetsRepository } from './assets.repository';
import { createAssetsService } from './assets.service';

export interface AssetsDeps {
  db: Knex;
  files: FilesService;
}

/** A 100,000-row applicator file is about 20 MB; the API's JSON limit is far smaller. */
const CSV_BODY_LIMIT_MB = 40;

const textBody = express.text({ type: ['text/csv', 'text/plain', 'application/csv'], limit: `${CSV_BODY_LIMIT_MB}mb` });
const csvBody: RequestHandler = (req, res, next) =>
  textBody(req, res, (err: unknown) => {
    const e = err as { type?: string } | undefined;
    if (e?.type === 'entity.too.large') {
      return next(
        new AppError('payload_too_large', `The file is larger than ${CSV_BODY_LIMIT_MB} MB. Split it into smaller files and import them one after the other.`, {
          file: `At most ${CSV_BODY_LIMIT_MB} MB`,
        }),
      );
    }
    next(err);
  });

/** The file either as the body itself (text/csv, mode in the query) or as JSON { csv, mode }. */
function importInput(body: unknown, query: unknown) {
  if (typeof body === 'string') return { csv: body, mode: parse(ImportModeQuery, query).mode };
  return parse(ImportBody, body);
}

function sendCsv(res: Response, name: string, text: string) {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="${name}"`);
  res.setHeader('Cache-Control', 'private, no-cache');
  res.send(text);
}

const stamp = () => new Date().toISOString().slice(0, 10);

export function assetsRoutes(deps: AssetsDeps): ApiRouter[] {
  const s = createAssetsService(deps);
  const imports = createAssetsImport(deps);
  const id = validate('params', AssetIdParam);

  const sites = new ApiRouter('/api/sites');
  sites.get('/', 'assets:read', async (req, res) => {
    res.json({ sites: await s.listSites(req.user!) });
  });
  sites.get('/export.csv', 'assets:read', async (req, res) => {
    sendCsv(res, `sites-${stamp()}.csv`, await imports.export(req.user!, 'sites'));
  });
  sites.post('/', 'assets:manage', validate('body', SiteInput), async (req, res) => {
    res.status(201).json({ site: await s.createSite(req.user!, res.locals.body) });
  });
  sites.put('/:id', 'assets:manage', id, validate('body', SiteInput), async (req, res) => {
    res.json({ site: await s.updateSite(req.user!, res.locals.params.id, res.locals.body) });
  });
  sites.delete('/:id', 'assets:manage', id, async (req, res) => {
    await s.removeSite(req.user!, res.locals.params.id);
    res.status(204).end();
  });

  const lines = new ApiRouter('/api/lines');
  lines.get('/', 'assets:read', validate('query', LineListQuery), async (req, res) => {
    res.json({ lines: await s.listLines(req.user!, res.locals.query.siteId) });
  });
  lines.get('/export.csv', 'assets:read', async (req, res) => {
    sendCsv(res, `lines-${stamp()}.csv`, await imports.export(req.user!, 'lines'));
  });
  lines.post('/', 'assets:manage', validate('body', LineInput), async (req, res) => {
    res.status(201).json({ line: await s.createLine(req.user!, res.locals.body) });
  });
  lines.put('/:id', 'assets:manage', id, validate('body', LineInput), async (req, res) => {
    res.json({ line: await s.updateLine(req.user!, res.locals.params.id, res.locals.body) });
  });
  lines.delete('/:id', 'assets:manage', id, async (req, res) => {
    await s.removeLine(req.user!, res.locals.params.id);
    res.status(204).end();
  });

  // Fixed paths are declared before '/:id' so 'fields' or 'export.csv' are never read as an id.
  const a = new ApiRouter('/api/applicators');
  a.get('/', 'assets:read', validate('query', ApplicatorListQuery), async (req, res) => {
    const { items, total } = await s.listApplicators(req.user!, res.locals.query);
    res.json({ applicators: items, total });
  });
  a.get('/export.csv', 'assets:read', async (req, res) => {
    sendCsv(res, `applicators-${stamp()}.csv`, await imports.export(req.user!, 'applicators'));
  });
  a.get('/readings/export.csv', 'assets:read', async (req, res) => {
    sendCsv(res, `counter-readings-${stamp()}.csv`, await imports.export(req.user!, 'readings'));
  });
  a.get('/service-events/export.csv', 'assets:read', async (req, res) => {
    sendCsv(res, `service-events-${stamp()}.csv`, await imports.export(req.user!, 'service-events'));
  });

  a.get('/fields', 'assets:read', async (req, res) => {
    res.json({ fields: await s.listFields(req.user!) });
  });
  a.get('/fields/export.csv', 'assets:read', async (req, res) => {
    sendCsv(res, `applicator-fields-${stamp()}.csv`, await imports.export(req.user!, 'fields'));
  });
  a.post('/fields', 'assets:manage', validate('body', FieldInput), async (req, res) => {
    res.status(201).json({ field: await s.createField(req.user!, res.locals.body) });
  });
  a.put('/fields/:id', 'assets:manage', id, validate('body', FieldInput), async (req, res) => {
    res.json({ field: await s.updateField(req.user!, res.locals.params.id, res.locals.body) });
  });
  a.delete('/fields/:id', 'assets:manage', id, async (req, res) => {
    await s.removeField(req.user!, res.locals.params.id);
    res.status(204).end();
  });

  const kind = validate('params', ImportKindParam);
  a.get('/import/:kind/template', 'assets:manage', kind, async (req, res) => {
    const k = res.locals.params.kind as ImportKind;
    const fields = k === 'applicators' ? await assetsRepository.fields(deps.db, req.user!.organisationId) : [];
    sendCsv(res, `beadpath-${k}-template.csv`, imports.template(k, fields));
  });
  a.post('/import/:kind/preview', 'assets:manage', kind, csvBody, async (req, res) => {
    const { csv } = importInput(req.body, req.query);
    res.json({ preview: await imports.preview(req.user!, res.locals.params.kind, csv) });
  });
  a.post('/import/:kind', 'assets:manage', kind, csvBody, async (req, res) => {
    const { csv, mode } = importInput(req.body, req.query);
    res.status(201).json({ result: await imports.commit(req.user!, res.locals.params.kind, csv, mode) });
  });

  a.post('/', 'assets:manage', validate('body', ApplicatorInput), async (req, res) => {
    res.status(201).json({ applicator: await s.createApplicator(req.user!, res.locals.body) });
  });
  a.get('/:id', 'assets:read', id, async (req, res) => {
    res.setHeader('Cache-Control', 'private, no-cache');
    res.json({ applicator: await s.get(req.user!, res.locals.params.id) });
  });
  a.put('/:id', 'assets:manage', id, validate('body', ApplicatorInput), async (req, res) => {
    res.json({ applicator: await s.updateApplicator(req.user!, res.locals.params.id, res.locals.body) });
  });
  a.post('/:id/readings', 'assets:record', id, validate('body', ReadingInput), async (req, res) => {
    res.status(201).json({ applicator: await s.addReading(req.user!, res.locals.params.id, res.locals.body) });
  });
  a.delete('/:id/readings/:readingId', 'assets:manage', validate('params', ReadingParam), async (req, res) => {
    res.json({ applicator: await s.removeReading(req.user!, res.locals.params.id, res.locals.params.readingId) });
  });
  a.post('/:id/service-events', 'assets:record', id, validate('body', ServiceEventInput), async (req, res) => {
    res.status(201).json({ applicator: await s.addServiceEvent(req.user!, res.locals.params.id, res.locals.body) });
  });
  a.delete('/:id/service-events/:eventId', 'assets:manage', validate('params', ServiceEventParam), async (req, res) => {
    res.json({ applicator: await s.removeServiceEvent(req.user!, res.locals.params.id, res.locals.params.eventId) });
  });

  return [sites, lines, a];
}
