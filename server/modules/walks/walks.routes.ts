// /api/walks.
import type { Knex } from 'knex';
import { ApiRouter } from '../../lib/routes';
import type { FilesService } from '../files/files.service';

export interface WalksDeps {
  db: Knex;
  files: FilesService;
}

export function walksRoutes(_deps: WalksDeps): ApiRouter[] {
  return [new ApiRouter('/api/walks')];
}
