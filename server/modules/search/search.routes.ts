// /api/search for everyone signed in, /api/admin/search for the engine's state, synonyms and rebuilds.
// Starting the routes starts the module's sync job; stopSearch(db) (createApp's close hook) ends it.
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import { SearchQuery, SynonymsInput } from '../../../src/shared/schemas/search';
import type { Config } from '../../config/env';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import { createSearchService } from './search.service';
import { registerSync } from './search.sync';

export { stopSearch, syncSearch } from './search.sync';

export interface SearchDeps {
  db: Knex;
  config: Config;
  logger: Logger;
}

export function searchRoutes(deps: SearchDeps): ApiRouter[] {
  const s = createSearchService(deps);
  registerSync(deps.db, s.sync);
  s.sync.start();

  const r = new ApiRouter('/api/search');
  r.get('/', 'search:use', validate('query', SearchQuery), async (req, res) => {
    const result = await s.search(req.user!, res.locals.query);
    res.setHeader('X-Search-Engine', result.engine);
    res.setHeader('Cache-Control', 'no-store');
    res.json(result);
  });

  const a = new ApiRouter('/api/admin/search');
  a.get('/', 'search:admin', async (req, res) => {
    res.json({ status: await s.status(req.user!) });
  });
  a.get('/synonyms', 'search:admin', async (req, res) => {
    res.json({ groups: await s.synonyms(req.user!.organisationId) });
  });
  a.put('/synonyms', 'search:admin', validate('body', SynonymsInput), async (req, res) => {
    const groups = await s.replaceSynonyms(
      req.user!.organisationId,
      res.locals.body.groups.map((g: { terms: string[] }) => g.terms),
    );
    res.json({ groups });
  });
  a.post('/reindex', 'search:admin', async (req, res) => {
    res.status(202).json(await s.reindex(req.user!.organisationId));
  });
  return [r, a];
}
