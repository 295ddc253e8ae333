// /api/files: upload one file (multipart field "file"), and fetch a stored variant.
import type { RequestHandler } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { AppError } from '../../lib/app-error';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import { ACCEPTED, type FilesService } from './files.service';

export function filesRoutes(deps: { files: FilesService; limitMb: number }) {
  const r = new ApiRouter('/api/files');
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: deps.limitMb * 1024 * 1024, files: 1, fields: 5 } });

  const single: RequestHandler = (req, res, next) =>
    upload.single('file')(req, res, (err: unknown) => {
      const e = err as { code?: string } | undefined;
      if (e?.code === 'LIMIT_FILE_SIZE')
        return next(new AppError('payload_too_large', `The file is larger than ${deps.limitMb} MB. Make the photo smaller or split the document.`, { file: `At most ${deps.limitMb} MB` }));
      if (e?.code) return next(AppError.invalid(`The upload could not be read (${e.code}). Send one file in the field "file".`, { file: 'Send one file' }));
      next(err);
    });

  r.post('/', 'files:upload', single, async (req, res) => {
    if (!req.file) throw AppError.invalid(`Choose a file to upload: ${ACCEPTED}`, { file: 'Choose a file' });
    const stored = await deps.files.store(req.user!.organisationId, req.user!.id, req.file);
    res.status(201).json({ file: stored });
  });

  r.get(
    '/:id/:variant',
    'signedIn',
    validate('params', z.object({ id: z.uuid({ error: 'File id is not valid' }), variant: z.enum(['large', 'display', 'thumb', 'original'], { error: 'Unknown size' }) })),
    async (req, res) => {
      const { id, variant } = res.locals.params;
      const file = await deps.files.read(req.user!.organisationId, id, variant);
      res.setHeader('Content-Type', file.mime);
      // Ids never change content, so the browser may keep them; private because they need a sign-in.
      res.setHeader('Cache-Control', 'private, max-age=31536000, immutable');
      res.setHeader('X-Content-Type-Options', 'nosniff');
      if (file.kind === 'document') res.setHeader('Content-Disposition', `inline; filename="${file.name.replace(/"/g, '')}"`);
      res.send(file.data);
    },
  );
  return r;
}
