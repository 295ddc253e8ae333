// /api/articles: list, read, write, review, revisions.
import {
  ArticleCreateInput,
  ArticleIdParam,
  ArticleListQuery,
  ArticleSaveInput,
  CompareQuery,
  RequestChangesInput,
  RestoreInput,
  ReviewInput,
  RevisionParam,
} from '../../../src/shared/schemas/articles';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { ArticlesService } from './articles.service';

export function articlesRoutes(deps: { articles: ArticlesService }) {
  const s = deps.articles;
  const r = new ApiRouter('/api/articles');
  const id = validate('params', ArticleIdParam);

  r.get('/', 'articles:read', validate('query', ArticleListQuery), async (req, res) => {
    res.json({ articles: await s.list(req.user!, res.locals.query) });
  });
  r.post('/', 'articles:write', validate('body', ArticleCreateInput), async (req, res) => {
    res.status(201).json({ article: await s.create(req.user!, res.locals.body) });
  });
  r.get('/:id', 'articles:read', id, async (req, res) => {
    res.json({ article: await s.get(req.user!, res.locals.params.id) });
  });
  r.put('/:id', 'articles:write', id, validate('body', ArticleSaveInput), async (req, res) => {
    res.json({ article: await s.save(req.user!, res.locals.params.id, res.locals.body) });
  });
  r.post('/:id/submit', 'articles:write', id, async (req, res) => {
    res.json({ article: await s.submit(req.user!, res.locals.params.id) });
  });
  r.post('/:id/withdraw', 'articles:write', id, async (req, res) => {
    res.json({ article: await s.withdraw(req.user!, res.locals.params.id) });
  });
  r.post('/:id/approve', 'articles:review', id, validate('body', ReviewInput), async (req, res) => {
    res.json({ article: await s.approve(req.user!, res.locals.params.id, res.locals.body.comment) });
  });
  r.post('/:id/request-changes', 'articles:review', id, validate('body', RequestChangesInput), async (req, res) => {
    res.json({ article: await s.requestChanges(req.user!, res.locals.params.id, res.locals.body.comment) });
  });
  r.post('/:id/archive', 'articles:write', id, async (req, res) => {
    res.json({ article: await s.archive(req.user!, res.locals.params.id) });
  });
  r.post('/:id/unarchive', 'articles:write', id, async (req, res) => {
    res.json({ article: await s.unarchive(req.user!, res.locals.params.id) });
  });
  r.get('/:id/revisions', 'articles:write', id, async (req, res) => {
    res.json({ revisions: await s.revisions(req.user!, res.locals.params.id) });
  });
  r.get('/:id/revisions/:number', 'articles:write', validate('params', RevisionParam), async (req, res) => {
    res.json({ revision: await s.revision(req.user!, res.locals.params.id, res.locals.params.number) });
  });
  r.post('/:id/revisions/:number/restore', 'articles:write', validate('params', RevisionParam), validate('body', RestoreInput), async (req, res) => {
    res.json({ article: await s.restore(req.user!, res.locals.params.id, res.locals.params.number, res.locals.body.baseVersion) });
  });
  r.get('/:id/compare', 'articles:write', id, validate('query', CompareQuery), async (req, res) => {
    res.json({ comparison: await s.compare(req.user!, res.locals.params.id, res.locals.query.from, res.locals.query.to) });
  });
  return r;
}
