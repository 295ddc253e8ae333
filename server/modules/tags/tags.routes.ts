// /api/tags for everyone signed in; /api/admin/tags to edit the lists.
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import { TagListInput, type TagsService } from './tags.service';

export function tagsRoutes(deps: { tags: TagsService }) {
  const r = new ApiRouter('/api/tags');
  r.get('/', 'signedIn', async (req, res) => {
    res.json({ tags: await deps.tags.list(req.user!.organisationId) });
  });
  return r;
}

export function adminTagsRoutes(deps: { tags: TagsService }) {
  const r = new ApiRouter('/api/admin/tags');
  r.get('/', 'tags:manage', async (req, res) => {
    res.json({ tags: await deps.tags.list(req.user!.organisationId, { includeInactive: true }) });
  });
  r.put('/', 'tags:manage', validate('body', TagListInput), async (req, res) => {
    res.json({ tags: await deps.tags.replace(req.user!.organisationId, res.locals.body.tags, req.user!.id) });
  });
  return r;
}
