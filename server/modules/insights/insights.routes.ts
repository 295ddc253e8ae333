// /api/insights: recurring causes, the service forecast (also as CSV), guide effectiveness and
// reliability per component, for managers, admins and authors; how fresh the summaries are and a
// refresh on request; the weekly digest's switch and a preview sent to oneself.
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import { CausesQuery, DigestPreferenceInput, ForecastQuery, GuidesQuery, ReliabilityQuery } from '../../../src/shared/schemas/insights';
import type { Config } from '../../config/env';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { MailService } from '../mail/mail.service';
import { createInsightsService } from './insights.service';
import { forecastCsv } from './insights.csv';
import { createInsightsDigest, createInsightsJobs } from './insights.jobs';

export interface InsightsDeps {
  db: Knex;
  logger: Logger;
  config: Config;
  mail: MailService;
}

/** The service, its background jobs (started by the caller) and the routes. */
export function createInsightsModule(deps: InsightsDeps) {
  const service = createInsightsService({ db: deps.db });
  const digest = createInsightsDigest({ db: deps.db, config: deps.config, mail: deps.mail, insights: service });
  const jobs = createInsightsJobs({ db: deps.db, config: deps.config, logger: deps.logger, insights: service, digest });
  return { service, digest, jobs, routers: insightsRoutes({ service, digest, jobs }) };
}

function insightsRoutes(m: { service: ReturnType<typeof createInsightsService>; digest: ReturnType<typeof createInsightsDigest>; jobs: ReturnType<typeof createInsightsJobs> }): ApiRouter[] {
  const s = m.service;
  const r = new ApiRouter('/api/insights');
  r.get('/causes', 'insights:read', validate('query', CausesQuery), async (req, res) => {
    res.json(await s.causes(req.user!, res.locals.query));
  });
  r.get('/forecast', 'insights:read', validate('query', ForecastQuery), async (req, res) => {
    res.json(await s.forecast(req.user!, res.locals.query));
  });
  r.get('/forecast.csv', 'insights:read', validate('query', ForecastQuery), async (req, res) => {
    const answer = await s.forecast(req.user!, res.locals.query);
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="service-forecast-${answer.today}-${answer.days}d.csv"`);
    res.setHeader('Cache-Control', 'private, no-cache');
    res.send(forecastCsv(answer));
  });
  r.get('/guides', 'insights:read', validate('query', GuidesQuery), async (req, res) => {
    res.json(await s.guides(req.user!, res.locals.query));
  });
  r.get('/reliability', 'insights:read', validate('query', ReliabilityQuery), async (req, res) => {
    res.json(await s.reliability(req.user!, res.locals.query));
  });
  r.get('/status', 'insights:read', async (req, res) => {
    res.json(await s.status(req.user!.organisationId));
  });
  r.post('/refresh', 'insights:read', async (req, res) => {
    await m.jobs.requestRefresh(req.user!.organisationId);
    res.status(202).json(await s.status(req.user!.organisationId));
  });
  r.get('/digest', 'insights:read', async (req, res) => {
    res.json(await m.digest.preference(req.user!));
  });
  r.put('/digest', 'insights:read', validate('body', DigestPreferenceInput), async (req, res) => {
    res.json(await m.digest.setPreference(req.user!, res.locals.body.enabled));
  });
  r.post('/digest/preview', 'insights:read', async (req, res) => {
    res.status(202).json(await m.digest.preview(req.user!));
  });
  return [r];
}
