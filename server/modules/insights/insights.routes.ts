// /api/insights: recurring causes, the service forecast (also as CSV), guide effectiveness and
// reliability per component, for managers, admins and authors.
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import { CausesQuery, ForecastQuery, GuidesQuery, ReliabilityQuery } from '../../../src/shared/schemas/insights';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import { createInsightsService } from './insights.service';
import { forecastCsv } from './insights.csv';

export interface InsightsDeps {
  db: Knex;
  logger: Logger;
}

export function insightsRoutes(deps: InsightsDeps): ApiRouter[] {
  const s = createInsightsService({ db: deps.db });
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
  return [r];
}
