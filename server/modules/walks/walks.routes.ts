// /api/walks: start, list, read (with ETag polling for the live view), answer one entry or an
// offline queue, notes, abandon, flags and the printable summary.
import type { Knex } from 'knex';
import { AbandonInput, AnswerBatchInput, AnswerInput, FlagInput, NoteInput, StartWalkInput, WalkIdParam, WalkListQuery } from '../../../src/shared/schemas/walks';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { FilesService } from '../files/files.service';
import { createWalksService } from './walks.service';

export interface WalksDeps {
  db: Knex;
  files: FilesService;
}

/** If-None-Match holds this tag (weak comparison, as for a GET). */
export function tagMatches(header: string | undefined, tag: string): boolean {
  if (!header) return false;
  const bare = (t: string) => t.trim().replace(/^W\//, '');
  return header.split(',').some((t) => t.trim() === '*' || bare(t) === bare(tag));
}

export function walksRoutes(deps: WalksDeps): ApiRouter[] {
  const s = createWalksService(deps);
  const r = new ApiRouter('/api/walks');
  const id = validate('params', WalkIdParam);

  r.post('/', 'walks:run', validate('body', StartWalkInput), async (req, res) => {
    const { walk, created } = await s.start(req.user!, res.locals.body);
    res.status(created ? 201 : 200).json({ walk, created });
  });

  // Listing one's own walks needs walks:run and colleagues' walks need walks:view-others; the
  // service decides from `mine`, because the roles that hold one of them differ.
  r.get('/', 'signedIn', validate('query', WalkListQuery), async (req, res) => {
    res.json({ walks: await s.list(req.user!, res.locals.query) });
  });

  // The live view polls this every few seconds: the tag costs one small query, and an unchanged
  // walk answers 304 without loading the guide or the log.
  r.get('/:id', 'signedIn', id, async (req, res) => {
    const tag = await s.detailTag(req.user!, res.locals.params.id);
    res.setHeader('ETag', tag);
    res.setHeader('Cache-Control', 'private, no-cache');
    if (tagMatches(req.get('If-None-Match'), tag)) {
      res.status(304).end();
      return;
    }
    res.json({ walk: await s.get(req.user!, res.locals.params.id) });
  });

  r.get('/:id/summary', 'signedIn', id, async (req, res) => {
    res.setHeader('Cache-Control', 'private, no-cache');
    res.json({ summary: await s.summary(req.user!, res.locals.params.id) });
  });

  r.post('/:id/answers', 'walks:run', id, validate('body', AnswerInput), async (req, res) => {
    const result = await s.answer(req.user!, res.locals.params.id, res.locals.body);
    res.status(result.duplicate ? 200 : 201).json(result);
  });

  r.post('/:id/answers/batch', 'walks:run', id, validate('body', AnswerBatchInput), async (req, res) => {
    res.json(await s.answerBatch(req.user!, res.locals.params.id, res.locals.body.answers));
  });

  r.post('/:id/notes', 'walks:run', id, validate('body', NoteInput), async (req, res) => {
    const result = await s.addNote(req.user!, res.locals.params.id, res.locals.body);
    res.status(result.duplicate ? 200 : 201).json(result);
  });

  r.post('/:id/abandon', 'walks:run', id, validate('body', AbandonInput), async (req, res) => {
    res.json({ walk: await s.abandon(req.user!, res.locals.params.id, res.locals.body) });
  });

  r.post('/:id/flags', 'guides:flag', id, validate('body', FlagInput), async (req, res) => {
    res.status(201).json({ flag: await s.flag(req.user!, res.locals.params.id, res.locals.body) });
  });

  return [r];
}
