// /api/cases and /api/admin/outbox.
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import type { Config } from '../../config/env';
import { ApiRouter } from '../../lib/routes';
import type { FilesService } from '../files/files.service';

export interface CasesDeps {
  db: Knex;
  config: Config;
  logger: Logger;
  files: FilesService;
}

export function casesRoutes(_deps: CasesDeps): ApiRouter[] {
  return [new ApiRouter('/api/cases'), new ApiRouter('/api/admin/outbox')];
}
