// /api/guides and /api/causes.
import type { Knex } from 'knex';
import { ApiRouter } from '../../lib/routes';
import type { FilesService } from '../files/files.service';
import type { TagsService } from '../tags/tags.service';

export interface GuidesDeps {
  db: Knex;
  tags: TagsService;
  files: FilesService;
}

export function guidesRoutes(_deps: GuidesDeps): ApiRouter[] {
  return [new ApiRouter('/api/guides'), new ApiRouter('/api/causes')];
}
