// /api/insights.
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import { ApiRouter } from '../../lib/routes';

export interface InsightsDeps {
  db: Knex;
  logger: Logger;
}

export function insightsRoutes(_deps: InsightsDeps): ApiRouter[] {
  return [new ApiRouter('/api/insights')];
}
