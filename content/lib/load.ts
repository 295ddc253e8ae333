// Loads the demo content from content/ into one organisation: drawings as stored photos, articles
// (published, reviewed by a second author) and guides (published version 1, article links and
// figures resolved from stable keys). Idempotent item by item: a drawing is known by its derived id,
// an article by its slug (= its key), a guide by its title; anything already there is left alone,
// so people's edits survive a restart and new content files are picked up.
import { createHash } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import type { Knex } from 'knex';
import sharp from 'sharp';
import type { GuideContent, Step } from '../../src/shared/guides/schema';
import { listCalculators } from '../../src/shared/calculators';
import { validateGuide } from '../../src/shared/guides/validate';
import type { TipTapNode } from '../../src/shared/rich-text/extensions';
import { DEFAULT_CAUSES } from '../../src/shared/tags';
import { prepareRichText, renderDoc } from '../../server/lib/rich-text';
import { loadStorageConfig } from '../../server/config/env';
import { storageFor, type FileStorage } from '../../server/lib/storage';
import { PHOTO_VARIANTS } from '../../server/modules/files/files.service';
import { KEPT_ARTICLE_TITLE, SAMPLE_GUIDE_KEY, articleDoc, checkContent, readContent, type ContentSet, type DrawingSource } from './content';

const DAY_MS = 24 * 3600 * 1000;

/** Where the app keeps uploads unless FILES_DIR says otherwise (the same default as server/app.ts). */
export const DEFAULT_FILES_DIR = fileURLToPath(new URL('../../.data/files', import.meta.url));

export interface LoadOptions {
  organisationId: number;
  /** Storage for the drawings; defaults to the server's (S3 when configured, else FILES_DIR or .data/files). */
  storage?: FileStorage;
  /** "Now" for back-dating publication; injectable so a history generator can line up with it. */
  now?: Date;
  log?: (line: string) => void;
}

export interface LoadResult {
  drawings: Map<string, string>;
  articles: Map<string, number>;
  guides: Map<string, { guideId: number; versionId: number }>;
  created: { drawings: number; articles: number; guides: number; causes: number };
}

/**
 * A stable file id per organisation and drawing key, shaped like a version-4 UUID so it passes the
 * rich-text image rule. Re-running the seed finds the same row instead of storing a copy.
 */
export function drawingFileId(organisationId: number, key: string): string {
  const h = createHash('sha256').update(`beadpath-demo-drawing:${organisationId}:${key}`).digest('hex');
  const variant = ((parseInt(h[16], 16) & 0x3) | 0x8).toString(16);
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-4${h.slice(13, 16)}-${variant}${h.slice(17, 20)}-${h.slice(20, 32)}`;
}

async function userIds(trx: Knex): Promise<Map<string, number>> {
  const rows = await trx('users').select('id', 'email');
  return new Map(rows.map((r) => [String(r.email).toLowerCase(), Number(r.id)]));
}

/** Stores a drawing the way an upload is stored: WebP variants in storage, a files row with its id. */
async function storeDrawing(trx: Knex, storage: FileStorage, organisationId: number, userId: number | null, d: DrawingSource): Promise<boolean> {
  const id = drawingFileId(organisationId, d.key);
  const row = await trx('files').where({ id }).first();
  // The row can outlive its bytes (a wiped files folder, another FILES_DIR): write them again then.
  if (row && (await storage.get(`${organisationId}/${id}/display.webp`))) return false;
  const png = await sharp(Buffer.from(d.svg), { density: 144 }).flatten({ background: '#ffffff' }).png().toBuffer({ resolveWithObject: true });
  const variants: Record<string, { key: string; mime: string }> = {};
  for (const [name, width] of Object.entries(PHOTO_VARIANTS)) {
    const out = await sharp(png.data)
      .resize({ width, height: width, fit: 'inside', withoutEnlargement: true })
      .webp({ quality: name === 'thumb' ? 70 : 88 })
      .toBuffer();
    const key = `${organisationId}/${id}/${name}.webp`;
    await storage.put(key, out);
    variants[name] = { key, mime: 'image/webp' };
  }
  if (!row) {
    await trx('files').insert({
      id,
      organisation_id: organisationId,
      kind: 'photo',
      mime: 'image/webp',
      original_name: `${d.key}.png`,
      size: png.data.length,
      width: png.info.width,
      height: png.info.height,
      variants: JSON.stringify(variants),
      created_by: userId,
    });
  }
  return !row;
}

/** The organisation's causes: the defaults first (as the causes service starts them), then the guides' own. */
async function ensureCauses(trx: Knex, organisationId: number, set: ContentSet): Promise<number> {
  const any = await trx('causes').where({ organisation_id: organisationId }).first();
  if (!any) {
    await trx('causes')
      .insert(DEFAULT_CAUSES.map((c, i) => ({ organisation_id: organisationId, code: c.code, label: c.label, component: c.component ?? null, position: i })))
      .onConflict(['organisation_id', 'code'])
      .ignore();
  }
  const known = new Set((await trx('causes').where({ organisation_id: organisationId }).select('code')).map((r) => String(r.code)));
  const wanted = new Map<string, string>();
  for (const g of set.guides) for (const c of g.guide?.guide.causes ?? []) if (!known.has(c.code)) wanted.set(c.code, c.label);
  if (!wanted.size) return 0;
  const last = await trx('causes').where({ organisation_id: organisationId }).max('position as p').first();
  const start = Number(last?.p ?? -1) + 1;
  await trx('causes')
    .insert([...wanted].map(([code, label], i) => ({ organisation_id: organisationId, code, label, active: true, position: start + i })))
    .onConflict(['organisation_id', 'code'])
    .ignore();
  return wanted.size;
}

function imageNode(fileId: string, alt: string): TipTapNode {
  return { type: 'image', attrs: { src: `/api/files/${fileId}/display`, alt } };
}

/** A guide step as stored: article keys and figures resolved, body html rebuilt like a save does. */
function resolveStep(step: Step, link: { articles?: string[]; figures?: string[] } | undefined, articles: Map<string, number>, drawings: Map<string, string>, titles: Map<string, string>): Step {
  const figures = (link?.figures ?? []).flatMap((key) => {
    const id = drawings.get(key);
    return id ? [imageNode(id, titles.get(key) ?? key)] : [];
  });
  const doc = step.body?.doc as TipTapNode | undefined;
  const withFigures: TipTapNode | undefined = figures.length ? { type: 'doc', content: [...(doc?.content ?? []), ...figures] } : doc;
  const articleIds = (link?.articles ?? []).flatMap((key) => (articles.has(key) ? [articles.get(key)!] : []));
  const out: Step = { ...step, articleIds: articleIds.length ? articleIds : step.articleIds };
  if (withFigures) {
    const rich = prepareRichText(withFigures, 'body');
    out.body = { doc: rich.doc as never, html: renderDoc(rich.doc) };
  }
  return out;
}

function svgTitle(svg: string): string {
  return /<title>([^<]+)<\/title>/.exec(svg)?.[1]?.trim() ?? '';
}

/**
 * Loads everything in content/ into the organisation. Refuses content that fails the content check,
 * so a broken file can never half-load the demo.
 */
export async function loadDemoContent(db: Knex, opts: LoadOptions, set: ContentSet = readContent()): Promise<LoadResult> {
  const log = opts.log ?? (() => {});
  const report = checkContent(set);
  if (report.errors.length) throw new Error(`Demo content has ${report.errors.length} problems; run npm run content:check:\n${report.errors.slice(0, 10).join('\n')}`);
  const storage = opts.storage ?? storageFor(loadStorageConfig(process.env), DEFAULT_FILES_DIR);
  const now = opts.now ?? new Date();
  const ago = (days: number) => new Date(now.getTime() - days * DAY_MS);
  const orgId = opts.organisationId;
  const created = { drawings: 0, articles: 0, guides: 0, causes: 0 };

  return db.transaction(async (trx) => {
    const users = await userIds(trx);
    const who = (email: string) => users.get(email.toLowerCase()) ?? null;
    const firstAuthor = who(set.articles[0]?.author ?? '') ?? null;

    // Drawings first: articles and guide steps point at them.
    const drawings = new Map<string, string>();
    const titles = new Map<string, string>();
    for (const d of set.drawings) {
      if (await storeDrawing(trx, storage, orgId, firstAuthor, d)) created.drawings += 1;
      drawings.set(d.key, drawingFileId(orgId, d.key));
      titles.set(d.key, svgTitle(d.svg));
    }

    // Articles: rows first so that links between articles can use their ids, then the revisions.
    const articles = new Map<string, number>();
    const fresh: typeof set.articles = [];
    // The long-standing demo article and demo guide keep the first ids, as before this loader.
    const firstArticles = [...set.articles].sort((a, b) => Number(b.title === KEPT_ARTICLE_TITLE) - Number(a.title === KEPT_ARTICLE_TITLE));
    for (const a of firstArticles) {
      const existing = await trx('articles').where({ organisation_id: orgId, slug: a.key }).first('id');
      if (existing) {
        articles.set(a.key, Number(existing.id));
        continue;
      }
      const at = ago(a.publishedDaysAgo);
      const [row] = await trx('articles')
        .insert({
          organisation_id: orgId,
          slug: a.key,
          workflow: 'published',
          created_by: who(a.author),
          submitted_by: who(a.author),
          submitted_at: at,
          reviewed_by: who(a.reviewer),
          reviewed_at: at,
          created_at: at,
        })
        .returning('id');
      articles.set(a.key, Number(row.id));
      fresh.push(a);
    }
    const resolver = {
      drawing: (key: string) => (drawings.has(key) ? `/api/files/${drawings.get(key)}/display` : undefined),
      article: (key: string) => (articles.has(key) ? `/articles/${articles.get(key)}` : undefined),
    };
    for (const a of fresh) {
      const id = articles.get(a.key)!;
      const converted = articleDoc(a, resolver);
      const rich = prepareRichText(converted.doc);
      const at = ago(a.publishedDaysAgo);
      const [rev] = await trx('article_revisions')
        .insert({
          article_id: id,
          number: 1,
          title: a.title,
          summary: a.summary,
          body_json: JSON.stringify(rich.doc),
          body_html: rich.html,
          body_text: rich.text,
          tags: a.tags,
          keywords: a.keywords.map((k) => k.toLowerCase()),
          hazards: rich.hazards,
          file_ids: rich.fileIds,
          author_id: who(a.author),
          created_at: at,
        })
        .returning('id');
      await trx('articles').where({ id }).update({ head_revision_id: rev.id, published_revision_id: rev.id });
      await trx('article_events').insert([
        { article_id: id, kind: 'created', user_id: who(a.author), revision_number: 1, created_at: at },
        { article_id: id, kind: 'submitted', user_id: who(a.author), revision_number: 1, created_at: at },
        { article_id: id, kind: 'approved', user_id: who(a.reviewer), revision_number: 1, created_at: at },
      ]);
      created.articles += 1;
    }

    created.causes = await ensureCauses(trx, orgId, set);
    const causeCodes = (await trx('causes').where({ organisation_id: orgId, active: true }).select('code')).map((r) => String(r.code));
    const calculators = listCalculators();

    // Guides, known by title: the demo guide seeded by earlier versions of this file is found too.
    const guides = new Map<string, { guideId: number; versionId: number }>();
    const firstGuides = [...set.guides].sort((a, b) => Number(b.key === SAMPLE_GUIDE_KEY) - Number(a.key === SAMPLE_GUIDE_KEY));
    for (const g of firstGuides) {
      const file = g.guide!;
      const existing = await trx('guide_versions as v')
        .join('guides as g', 'g.id', 'v.guide_id')
        .where({ 'g.organisation_id': orgId, 'v.title': file.guide.title })
        .orderBy('v.number', 'desc')
        .first('g.id as guideId', 'g.published_version_id as versionId');
      if (existing) {
        guides.set(g.key, { guideId: Number(existing.guideId), versionId: Number(existing.versionId) });
        continue;
      }
      const content: GuideContent = {
        startStepId: file.content.startStepId,
        steps: file.content.steps.map((s) => resolveStep(s, g.links?.steps[s.id], articles, drawings, titles)),
      };
      const counts = validateGuide(content, { causeCodes, calculators, articleIds: [...articles.values()] });
      if (counts.errors.length) throw new Error(`Guide ${g.key} does not validate once loaded: ${counts.errors[0].message}`);
      const author = who(g.links?.author ?? 'author@example.com');
      const reviewer = who(g.links?.reviewer ?? 'author2@example.com');
      const at = ago(g.links?.publishedDaysAgo ?? 365);
      const [guide] = await trx('guides').insert({ organisation_id: orgId, status: 'active', created_by: author, created_at: at }).returning('id');
      const [version] = await trx('guide_versions')
        .insert({
          guide_id: guide.id,
          number: 1,
          state: 'published',
          title: file.guide.title,
          symptom: file.guide.symptom,
          summary: file.guide.summary ?? '',
          tags: file.guide.tags,
          content: JSON.stringify(content),
          error_count: counts.errors.length,
          warning_count: counts.warnings.length,
          created_by: author,
          updated_by: author,
          submitted_by: author,
          submitted_at: at,
          reviewed_by: reviewer,
          published_at: at,
          created_at: at,
        })
        .returning('id');
      await trx('guides').where({ id: guide.id }).update({ published_version_id: version.id });
      await trx('guide_events').insert([
        { guide_id: guide.id, version_number: 1, kind: 'created', user_id: author, created_at: at },
        { guide_id: guide.id, version_number: 1, kind: 'submitted', user_id: author, created_at: at },
        { guide_id: guide.id, version_number: 1, kind: 'approved', user_id: reviewer, created_at: at },
      ]);
      guides.set(g.key, { guideId: Number(guide.id), versionId: Number(version.id) });
      created.guides += 1;
    }
    log(`demo content: ${created.drawings} drawings, ${created.articles} articles, ${created.guides} guides, ${created.causes} causes added`);
    return { drawings, articles, guides, created };
  });
}
