// /api/sites, /api/lines, /api/applicators.
import type { Knex } from 'knex';
import { ApiRouter } from '../../lib/routes';
import type { FilesService } from '../files/files.service';

export interface AssetsDeps {
  db: Knex;
  files: FilesService;
}

export function assetsRoutes(_deps: AssetsDeps): ApiRouter[] {
  return [new ApiRouter('/api/sites'), new ApiRouter('/api/lines'), new ApiRouter('/api/applicators')];
}
