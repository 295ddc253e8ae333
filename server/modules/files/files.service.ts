// Uploads: the real type is read from the bytes; photos are turned upright, stripped of all
// metadata (field photos carry GPS positions) and re-encoded in three sizes; PDFs are kept as sent.
import { randomUUID } from 'node:crypto';
import { fileTypeFromBuffer } from 'file-type';
import type { Knex } from 'knex';
import sharp from 'sharp';
import { AppError } from '../../lib/app-error';
import { storageFailure, type FileStorage } from '../../lib/storage';

export const ACCEPTED = 'JPEG, PNG or WebP photos and PDF documents';
const PHOTO_TYPES = new Set(['image/jpeg', 'image/png', 'image/webp']);

export const PHOTO_VARIANTS = {
  large: 2400,
  display: 1400,
  thumb: 360,
} as const;
export type Variant = keyof typeof PHOTO_VARIANTS | 'original';

/** Above any phone or camera photo; a few hundred bytes of PNG can declare billions of pixels to decode. */
export const MAX_PHOTO_PIXELS = 120_000_000;

export interface StoredFile {
  id: string;
  kind: 'photo' | 'document';
  mime: string;
  originalName: string;
  size: number;
  width: number | null;
  height: number | null;
  urls: Record<string, string>;
}

interface FileRow {
  id: string;
  organisation_id: number;
  kind: 'photo' | 'document';
  mime: string;
  original_name: string;
  size: number;
  width: number | null;
  height: number | null;
  variants: Record<string, { key: string; mime: string }>;
}

function toFile(row: FileRow): StoredFile {
  return {
    id: row.id,
    kind: row.kind,
    mime: row.mime,
    originalName: row.original_name,
    size: row.size,
    width: row.width,
    height: row.height,
    urls: Object.fromEntries(Object.keys(row.variants).map((v) => [v, `/api/files/${row.id}/${v}`])),
  };
}

function cleanName(name: string): string {
  const n = name
    .normalize('NFC')
    .replace(/[^\p{L}\p{N} ._()-]/gu, '_')
    .slice(0, 120);
  return n.trim() || 'file';
}

/** A refused write as the API says it: 507 when the disk is full, 503 otherwise; either way nothing was saved. */
function storeRefused(err: unknown, storage: FileStorage): AppError {
  const why = storageFailure(err);
  const where = storage.kind === 's3' ? 'object storage' : 'file storage';
  const error =
    why === 'no_space'
      ? new AppError('insufficient_storage', `The file could not be stored: the ${where} is full. Nothing was saved; ask an administrator to free space, then upload again.`, {
          file: 'Not stored: storage full',
        })
      : new AppError('unavailable', `The file could not be stored: the ${where} refused the write or is not reachable. Nothing was saved; try again in a moment.`, {
          file: 'Not stored: storage unavailable',
        });
  (error as { cause?: unknown }).cause = err;
  return error;
}

export function createFilesService(db: Knex, storage: FileStorage, log?: { warn: (obj: object, msg: string) => void }) {
  return {
    async store(organisationId: number, userId: number, upload: { buffer: Buffer; originalname: string }): Promise<StoredFile> {
      const detected = await fileTypeFromBuffer(upload.buffer);
      const named = /\.([a-z0-9]{1,5})$/i.exec(upload.originalname)?.[1]?.toLowerCase();
      const family = (ext: string | undefined) => (ext === 'jpeg' ? 'jpg' : ext);
      if (detected && named && ['jpg', 'jpeg', 'png', 'webp', 'pdf', 'gif'].includes(named) && family(named) !== family(detected.ext)) {
        throw AppError.invalid(`The file is named .${named} but its contents are ${detected.ext.toUpperCase()}. Save it again with the right type and upload that.`, {
          file: `Contents are ${detected.ext.toUpperCase()}, not ${named.toUpperCase()}`,
        });
      }
      const id = randomUUID();
      const written: string[] = [];
      const put = async (variant: string, data: Buffer, mime: string, ext: string) => {
        const key = `${organisationId}/${id}/${variant}.${ext}`;
        // Counted before the write: a failed write may still have left part of the bytes.
        written.push(key);
        try {
          await storage.put(key, data);
        } catch (err) {
          log?.warn({ err, storage: storage.kind, key }, 'file storage write failed');
          throw storeRefused(err, storage);
        }
        return [variant, { key, mime }] as const;
      };
      try {
        let row: Omit<FileRow, 'organisation_id'>;
        if (detected && PHOTO_TYPES.has(detected.mime)) {
          // The header is read before any pixel is decoded, so a declared-huge image costs nothing to refuse.
          const header = await sharp(upload.buffer, { limitInputPixels: false })
            .metadata()
            .catch(() => null);
          if (header?.width && header.height && header.width * header.height > MAX_PHOTO_PIXELS) {
            throw AppError.invalid(`The photo is ${header.width} × ${header.height} pixels; at most ${MAX_PHOTO_PIXELS / 1_000_000} megapixels are accepted. Make it smaller and upload again.`, {
              file: `At most ${MAX_PHOTO_PIXELS / 1_000_000} megapixels`,
            });
          }
          let meta;
          try {
            // rotate() with no angle applies the EXIF orientation; sharp writes no metadata unless asked.
            meta = await sharp(upload.buffer, { failOn: 'error', limitInputPixels: MAX_PHOTO_PIXELS }).rotate().toBuffer({ resolveWithObject: true });
          } catch {
            throw AppError.invalid(`The photo could not be read; it may be damaged. Accepted: ${ACCEPTED}.`, { file: 'The photo could not be read' });
          }
          const variants: Record<string, { key: string; mime: string }> = {};
          for (const [name, width] of Object.entries(PHOTO_VARIANTS)) {
            const out = await sharp(meta.data)
              .resize({ width, height: width, fit: 'inside', withoutEnlargement: true })
              .webp({ quality: name === 'thumb' ? 70 : 82 })
              .toBuffer();
            const [k, v] = await put(name, out, 'image/webp', 'webp');
            variants[k] = v;
          }
          row = { id, kind: 'photo', mime: 'image/webp', original_name: cleanName(upload.originalname), size: upload.buffer.length, width: meta.info.width, height: meta.info.height, variants };
        } else if (detected?.mime === 'application/pdf') {
          const [k, v] = await put('original', upload.buffer, 'application/pdf', 'pdf');
          row = { id, kind: 'document', mime: 'application/pdf', original_name: cleanName(upload.originalname), size: upload.buffer.length, width: null, height: null, variants: { [k]: v } };
        } else {
          const what = detected ? `a ${detected.ext.toUpperCase()} file` : 'not a file type Beadpath can check';
          throw new AppError('unsupported_media_type', `This file is ${what}. Accepted: ${ACCEPTED}.`, { file: `Accepted: ${ACCEPTED}` });
        }
        await db('files').insert({ ...row, organisation_id: organisationId, created_by: userId, variants: JSON.stringify(row.variants) });
        return toFile({ ...row, organisation_id: organisationId });
      } catch (err) {
        // Nothing half-stored: every byte written for this upload goes again.
        await Promise.all(written.map((k) => storage.delete(k).catch(() => {})));
        throw err;
      }
    },

    async read(organisationId: number, id: string, variant: string) {
      const row = (await db('files').where({ id, organisation_id: organisationId }).first()) as FileRow | undefined;
      const v = row?.variants[variant];
      if (!row || !v) throw AppError.notFound('This file');
      let data: Buffer | null;
      try {
        data = await storage.get(v.key);
      } catch (err) {
        log?.warn({ err, storage: storage.kind }, 'file storage read failed');
        throw new AppError('unavailable', 'The file storage is not reachable right now, so this file cannot be shown. Try again in a moment.');
      }
      if (!data) throw AppError.notFound('This file');
      return { data, mime: v.mime, name: row.original_name, kind: row.kind };
    },

    async describe(organisationId: number, ids: string[]): Promise<StoredFile[]> {
      if (!ids.length) return [];
      const rows = (await db('files').whereIn('id', ids).andWhere({ organisation_id: organisationId })) as FileRow[];
      return rows.map(toFile);
    },
  };
}

export type FilesService = ReturnType<typeof createFilesService>;
