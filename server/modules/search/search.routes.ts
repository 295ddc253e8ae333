// /api/search and /api/admin/search.
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import type { Config } from '../../config/env';
import { ApiRouter } from '../../lib/routes';

export interface SearchDeps {
  db: Knex;
  config: Config;
  logger: Logger;
}

export function searchRoutes(_deps: SearchDeps): ApiRouter[] {
  return [new ApiRouter('/api/search'), new ApiRouter('/api/admin/search')];
}
