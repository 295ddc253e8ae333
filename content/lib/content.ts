// Reads Beadpath's demo content from content/ (guide files with their link sidecars, Markdown
// articles, SVG drawings and the invented scenario) and checks all of it without a database:
// `npm run content:check` and the unit test run checkContent; the demo seed loads what it reads.
import { readFileSync, readdirSync, existsSync } from 'node:fs';
import { basename, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { z } from 'zod';
import { listCalculators } from '../../src/shared/calculators';
import { parseGuideFile, type GuideFile } from '../../src/shared/guides/export';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../../src/shared/guides/sample';
import { validateGuide } from '../../src/shared/guides/validate';
import type { Step } from '../../src/shared/guides/schema';
import { ApplicatorInput } from '../../src/shared/schemas/assets';
import { ArticleFields, slugify } from '../../src/shared/schemas/articles';
import { DEFAULT_CAUSES, DEFAULT_TAGS } from '../../src/shared/tags';
import { DEMO_USERS } from '../../seeds/01-demo-organisation';
import { markdownToDoc, splitFrontMatter, type MarkdownResolver, type MarkdownResult } from './markdown';

export const CONTENT_DIR = fileURLToPath(new URL('..', import.meta.url));

/** The demo guide other tests walk; its file must stay exactly the shared sample. */
export const SAMPLE_GUIDE_KEY = 'drips-after-close-electric';
/** The one article that must keep its title (tests and people know it by name). */
export const KEPT_ARTICLE_TITLE = 'Reading a worn seat under a loupe';

const KEY = /^[a-z0-9]+(-[a-z0-9]+)*$/;
const PART_NUMBER = /^BP-[A-Z0-9]+(-[A-Z0-9]+)*$/;
const AUTHOR_EMAILS = DEMO_USERS.filter((u) => u.roles.includes('author')).map((u) => u.email);

export interface DrawingSource {
  key: string;
  file: string;
  svg: string;
}

export interface ArticleSource {
  /** Stable key: the article's slug in the database and the target of article:KEY links. */
  key: string;
  file: string;
  title: string;
  summary: string;
  tags: string[];
  keywords: string[];
  author: string;
  reviewer: string;
  /** How long ago the demo says the article was published, so the history reads naturally. */
  publishedDaysAgo: number;
  markdown: string;
  bodyLine: number;
}

export const GuideLinks = z.strictObject({
  author: z.string(),
  reviewer: z.string(),
  publishedDaysAgo: z.number().int().min(0).max(3650),
  /** Per step: articles linked by key, and drawings shown under the step's text. */
  steps: z.record(
    z.string(),
    z.strictObject({
      articles: z.array(z.string()).optional(),
      figures: z.array(z.string()).optional(),
    }),
  ),
});
export type GuideLinks = z.infer<typeof GuideLinks>;

export interface GuideSource {
  key: string;
  file: string;
  json: unknown;
  /** The parsed file, when it is a valid guide file. */
  guide?: GuideFile;
  links?: GuideLinks;
}

const ScenarioLine = z.strictObject({ key: z.string().regex(KEY), site: z.string(), name: z.string().min(1), area: z.string().nullable(), contact: z.string().nullable() });
const ScenarioSite = z.strictObject({ key: z.string().regex(KEY), name: z.string().min(1), address: z.string().nullable(), contact: z.string().nullable() });
const ScenarioPerson = z.strictObject({
  name: z.string().min(1),
  role: z.string().min(1),
  site: z.string().nullable(),
  /** A demo sign-in this person is, when they have one (seeds/01-demo-organisation.ts). */
  email: z.string().nullable(),
});
const ScenarioApplicator = z.object({ line: z.string(), story: z.string().nullable().optional(), cyclesAtStart: z.number().int().min(0) }).catchall(z.unknown());
const ScenarioStory = z.strictObject({
  key: z.string().regex(KEY),
  summary: z.string().min(1),
  /** Free-form parameters for the history generator; see content/README.md. */
  params: z.record(z.string(), z.unknown()),
});
export const Scenario = z.strictObject({
  organisation: z.string(),
  description: z.string(),
  sites: z.array(ScenarioSite),
  lines: z.array(ScenarioLine),
  people: z.array(ScenarioPerson),
  applicators: z.array(ScenarioApplicator),
  stories: z.array(ScenarioStory),
});
export type Scenario = z.infer<typeof Scenario>;

export interface ContentSet {
  dir: string;
  drawings: DrawingSource[];
  articles: ArticleSource[];
  guides: GuideSource[];
  scenario: unknown;
  /** Files that could not be read at all. */
  readProblems: string[];
}

function listFiles(dir: string, suffix: string): string[] {
  if (!existsSync(dir)) return [];
  return readdirSync(dir)
    .filter((f) => f.endsWith(suffix))
    .sort();
}

const asList = (value: string | string[] | undefined) => (Array.isArray(value) ? value : value ? [value] : []);
const asText = (value: string | string[] | undefined) => (Array.isArray(value) ? value.join(', ') : (value ?? ''));

export function readContent(dir = CONTENT_DIR): ContentSet {
  const readProblems: string[] = [];
  const drawings = listFiles(join(dir, 'drawings'), '.svg').map((f) => ({
    key: basename(f, '.svg'),
    file: `drawings/${f}`,
    svg: readFileSync(join(dir, 'drawings', f), 'utf8'),
  }));

  const articles: ArticleSource[] = [];
  for (const f of listFiles(join(dir, 'articles'), '.md')) {
    const source = readFileSync(join(dir, 'articles', f), 'utf8');
    const front = splitFrontMatter(source);
    if ('error' in front) {
      readProblems.push(`articles/${f}: ${front.error}`);
      continue;
    }
    const days = Number(asText(front.fields.publishedDaysAgo) || '0');
    articles.push({
      key: basename(f, '.md'),
      file: `articles/${f}`,
      title: asText(front.fields.title),
      summary: asText(front.fields.summary),
      tags: asList(front.fields.tags),
      keywords: asList(front.fields.keywords),
      author: asText(front.fields.author),
      reviewer: asText(front.fields.reviewer),
      publishedDaysAgo: Number.isFinite(days) ? days : 0,
      markdown: front.body,
      bodyLine: front.bodyLine,
    });
  }

  const guides: GuideSource[] = [];
  for (const f of listFiles(join(dir, 'guides'), '.json').filter((name) => !name.endsWith('.links.json'))) {
    const key = basename(f, '.json');
    const g: GuideSource = { key, file: `guides/${f}`, json: undefined };
    try {
      g.json = JSON.parse(readFileSync(join(dir, 'guides', f), 'utf8'));
    } catch (err) {
      readProblems.push(`guides/${f}: not valid JSON (${(err as Error).message})`);
      continue;
    }
    const parsed = parseGuideFile(g.json, { causeCodes: DEFAULT_CAUSES.map((c) => c.code) });
    if (parsed.ok) g.guide = parsed.file;
    const linksFile = join(dir, 'guides', `${key}.links.json`);
    if (existsSync(linksFile)) {
      try {
        const links = GuideLinks.safeParse(JSON.parse(readFileSync(linksFile, 'utf8')));
        if (links.success) g.links = links.data;
        else readProblems.push(`guides/${key}.links.json: ${links.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ')}`);
      } catch (err) {
        readProblems.push(`guides/${key}.links.json: not valid JSON (${(err as Error).message})`);
      }
    }
    guides.push(g);
  }

  let scenario: unknown;
  const scenarioFile = join(dir, 'scenario', 'larkfield.json');
  try {
    scenario = JSON.parse(readFileSync(scenarioFile, 'utf8'));
  } catch (err) {
    readProblems.push(`scenario/larkfield.json: ${(err as Error).message}`);
  }
  return { dir, drawings, articles, guides, scenario, readProblems };
}

/** Converts an article's Markdown with a resolver; the check uses placeholder ids, the loader real ones. */
export function articleDoc(article: ArticleSource, resolver: MarkdownResolver): MarkdownResult {
  return markdownToDoc(article.markdown, resolver, article.bodyLine);
}

/** Placeholder addresses that pass the rich-text cleaner, for checking without a database. */
export function placeholderResolver(set: ContentSet): MarkdownResolver {
  const drawings = new Map(set.drawings.map((d, i) => [d.key, `/api/files/00000000-0000-4000-8000-${String(i).padStart(12, '0')}/display`]));
  const articles = new Map(set.articles.map((a, i) => [a.key, `/articles/${i + 1}`]));
  return { drawing: (key) => drawings.get(key), article: (key) => articles.get(key) };
}

/** Plain text of a TipTap node, for the wording checks. */
export function plainText(node: { text?: string; content?: unknown[] }): string {
  return (node.text ?? '') + (node.content ?? []).map((c) => plainText(c as { text?: string; content?: unknown[] })).join(' ');
}

// A step whose words say it opens the valve or handles fluid, heat, pressure or solvent must carry a
// caution. The list is deliberately broad: a false alarm costs an author a caution, a miss costs a hand.
const HANDS_ON =
  /\b(take (out|off|apart)|remove|replace|fit (a|the) new|fit a|strip|dismantle|purge|open the valve|unscrew|loosen|solvent|clean (the|it)|disconnect|pull the|unplug|flush|bleed|swap)\b/i;

// Questions and readings only count when their title itself sends someone in ("Strip the gun and
// look..."); a question that merely names a solvent does not.
const HANDS_ON_TITLE = /\b(strip|take (out|off|apart)|remove|dismantle|open the valve)\b/i;

function needsCaution(step: Step): boolean {
  if (step.kind === 'try') return HANDS_ON.test(`${step.title} ${step.action}`);
  if (step.kind === 'finding') return HANDS_ON.test(`${step.title} ${step.remedy.join(' ')}`);
  return HANDS_ON_TITLE.test(step.title);
}

export interface CheckReport {
  errors: string[];
  warnings: string[];
  /** One line per item, for the check's summary. */
  summary: string[];
}

export function checkContent(set: ContentSet): CheckReport {
  const errors = [...set.readProblems];
  const warnings: string[] = [];
  const summary: string[] = [];
  const calculators = listCalculators();
  const tagSlugs = new Set(DEFAULT_TAGS.map((t) => t.slug));
  const defaultCauses = new Set(DEFAULT_CAUSES.map((c) => c.code));
  const drawingKeys = new Set(set.drawings.map((d) => d.key));
  const articleKeys = new Set(set.articles.map((a) => a.key));
  const usedDrawings = new Set<string>();

  // ---- Drawings ----------------------------------------------------------------------------
  for (const d of set.drawings) {
    const at = d.file;
    if (!KEY.test(d.key)) errors.push(`${at}: file name must be a lower-case key with hyphens`);
    if (!/^<svg[\s>]/.test(d.svg.trimStart().replace(/^<\?xml[^>]*>\s*/, ''))) errors.push(`${at}: must be an <svg> document`);
    if (!/viewBox="[\d.\s-]+"/.test(d.svg)) errors.push(`${at}: needs a viewBox`);
    if (!/\swidth="\d+"/.test(d.svg) || !/\sheight="\d+"/.test(d.svg)) errors.push(`${at}: needs width and height in pixels`);
    if (/<(script|image|foreignObject)\b|xlink:href="http|href="http/i.test(d.svg)) errors.push(`${at}: no scripts, embedded images or outside links`);
    if (!/<title>[^<]+<\/title>/.test(d.svg)) errors.push(`${at}: needs a <title> saying what it shows`);
  }

  // ---- Articles ----------------------------------------------------------------------------
  const resolver = placeholderResolver(set);
  const titles = new Map<string, string>();
  for (const a of set.articles) {
    const at = a.file;
    if (!KEY.test(a.key) || a.key.length > 80) errors.push(`${at}: file name must be a lower-case key with hyphens, at most 80 characters`);
    const fields = ArticleFields.safeParse({ title: a.title, summary: a.summary, body: { type: 'doc' }, tags: a.tags, keywords: a.keywords });
    if (!fields.success) for (const issue of fields.error.issues) errors.push(`${at}: ${issue.path.join('.')}: ${issue.message}`);
    if (!a.summary) errors.push(`${at}: needs a summary`);
    if (slugify(a.title) === '') errors.push(`${at}: title needs letters`);
    if (titles.has(a.title.toLowerCase())) errors.push(`${at}: title '${a.title}' is also used by ${titles.get(a.title.toLowerCase())}`);
    titles.set(a.title.toLowerCase(), at);
    for (const tag of a.tags) if (!tagSlugs.has(tag)) errors.push(`${at}: tag '${tag}' is not one of the default tags`);
    if (!a.tags.length) errors.push(`${at}: give at least one tag`);
    if (!AUTHOR_EMAILS.includes(a.author)) errors.push(`${at}: author must be one of ${AUTHOR_EMAILS.join(', ')}`);
    if (!AUTHOR_EMAILS.includes(a.reviewer) || a.reviewer === a.author) errors.push(`${at}: reviewer must be another author`);

    const converted = articleDoc(a, resolver);
    for (const p of converted.problems) errors.push(`${at}:${p.line}: ${p.message}`);
    converted.drawings.forEach((k) => usedDrawings.add(k));
    const blocks = converted.doc.content ?? [];
    if (blocks[0]?.type !== 'caution') errors.push(`${at}: must start with a caution block (:::caution HAZARD)`);
    const words = plainText(converted.doc);
    if (!/local codes/i.test(words) || !/site rules/i.test(words) || !/maker['’]s manual/i.test(words)) {
      errors.push(`${at}: must defer to local codes, site rules and the equipment maker's manual`);
    }
    if (/million cycles|\b[15]e8\b|10⁸/i.test(words) && !/common practice/i.test(words)) {
      errors.push(`${at}: gives a wear figure in cycles without calling it common practice`);
    }
    // Calculators are named by their titles in the text; a renamed or misspelt one would send readers looking.
    const titlesOfCalculators = new Set(calculators.map((c) => c.title));
    for (const m of a.markdown.matchAll(/\*([^*]+)\* calculator|calculator \*([^*]+)\*/g)) {
      const named = m[1] ?? m[2];
      if (!titlesOfCalculators.has(named)) errors.push(`${at}: names a calculator '${named}' that does not exist`);
    }
    if (!blocks.some((b) => b.type === 'heading')) warnings.push(`${at}: has no headings`);
    summary.push(`article  ${a.key}: ${a.title} (${words.split(/\s+/).length} words${converted.drawings.length ? `, drawings: ${converted.drawings.join(', ')}` : ''})`);
  }
  if (!set.articles.some((a) => a.title === KEPT_ARTICLE_TITLE)) errors.push(`articles: the article '${KEPT_ARTICLE_TITLE}' must stay`);

  // ---- Guides ------------------------------------------------------------------------------
  const symptoms: { symptom: string; file: string }[] = [];
  for (const g of set.guides) {
    const at = g.file;
    if (!KEY.test(g.key)) errors.push(`${at}: file name must be a lower-case key with hyphens`);
    const parsed = parseGuideFile(g.json, { causeCodes: [...defaultCauses] });
    if (!parsed.ok) {
      for (const p of parsed.problems) errors.push(`${at}: ${p.path || '(file)'}: ${p.message}`);
      continue;
    }
    const file = parsed.file;
    const isSample = g.key === SAMPLE_GUIDE_KEY;
    const validation = validateGuide(file.content, { causeCodes: [...defaultCauses, ...(file.guide.causes ?? []).map((c) => c.code)], calculators });
    // Article links live in the sidecar (by key), so the validator's "no article" warning is checked
    // below against the sidecar instead.
    for (const w of validation.warnings) if (w.code !== 'finding-no-article') warnings.push(`${at}: ${w.message}`);
    for (const e of validation.errors) errors.push(`${at}: ${e.message}`);
    symptoms.push({ symptom: file.guide.symptom, file: at });

    if (isSample) {
      const { causes: _causes, ...meta } = file.guide;
      if (JSON.stringify(file.content) !== JSON.stringify(SAMPLE_GUIDE)) errors.push(`${at}: the demo guide's content must stay exactly SAMPLE_GUIDE`);
      if (JSON.stringify(meta) !== JSON.stringify(SAMPLE_GUIDE_META)) errors.push(`${at}: the demo guide's title, symptom, summary and tags must stay exactly SAMPLE_GUIDE_META`);
    }
    for (const tag of file.guide.tags) if (!tagSlugs.has(tag)) errors.push(`${at}: tag '${tag}' is not one of the default tags`);
    for (const cause of file.guide.causes ?? []) {
      const known = DEFAULT_CAUSES.find((c) => c.code === cause.code);
      if (known && known.label !== cause.label) errors.push(`${at}: cause '${cause.code}' is a default cause; use its label '${known.label}'`);
    }

    const steps = new Map(file.content.steps.map((s) => [s.id, s]));
    let measures = 0;
    let withCalculator = 0;
    if (!file.content.steps.some((s) => s.kind === 'handoff')) errors.push(`${at}: needs a Hand-off step`);
    for (const step of file.content.steps) {
      const where = `${at}: step '${step.id}'`;
      if (step.kind === 'measure') {
        measures += 1;
        if (step.calculator) withCalculator += 1;
      }
      if (step.kind === 'finding') {
        for (const part of step.parts) {
          if (!part.partNumber || !PART_NUMBER.test(part.partNumber)) errors.push(`${where}: part '${part.name}' needs an invented part number like BP-SEAT-15`);
        }
        if (!isSample) {
          if (step.typicalMinutes === undefined) errors.push(`${where}: a finding needs its typical minutes`);
          if (step.remedy.length < 2) warnings.push(`${where}: a remedy of one step; is anything missing (a check after the fix)?`);
          const linked = g.links?.steps[step.id]?.articles ?? [];
          if (!linked.length) errors.push(`${where}: link at least one article to the finding (in ${g.key}.links.json)`);
        }
      }
      if (!isSample && needsCaution(step) && step.cautions.length === 0) {
        errors.push(`${where}: the step sends someone to open or handle the valve, fluid or solvent but carries no caution`);
      }
      for (const c of step.cautions) {
        if (c.action.trim().length < 20) errors.push(`${where}: caution '${c.id}' must say what to do first`);
      }
      if (step.articleIds.length || step.photoIds.length) errors.push(`${where}: article and photo ids belong in ${g.key}.links.json (by key), not in the guide file`);
    }
    if (!isSample && withCalculator === 0) warnings.push(`${at}: no Measure step uses a calculator`);

    if (!isSample && !g.links) errors.push(`${at}: needs ${g.key}.links.json with its author, reviewer and article links`);
    if (g.links) {
      if (!AUTHOR_EMAILS.includes(g.links.author)) errors.push(`${at}: links author must be one of ${AUTHOR_EMAILS.join(', ')}`);
      if (!AUTHOR_EMAILS.includes(g.links.reviewer) || g.links.reviewer === g.links.author) errors.push(`${at}: links reviewer must be another author`);
      for (const [stepId, link] of Object.entries(g.links.steps)) {
        if (!steps.has(stepId)) errors.push(`${at}: links name step '${stepId}', which the guide does not have`);
        if (isSample && link.articles?.length) errors.push(`${at}: the demo guide stays as it is: link no articles to it`);
        for (const key of link.articles ?? []) if (!articleKeys.has(key)) errors.push(`${at}: step '${stepId}' links unknown article '${key}'`);
        for (const key of link.figures ?? []) {
          usedDrawings.add(key);
          if (!drawingKeys.has(key)) errors.push(`${at}: step '${stepId}' shows unknown drawing '${key}'`);
          if (isSample) errors.push(`${at}: the demo guide stays as it is: add no figures to it`);
        }
      }
    }
    const counts = file.content.steps.reduce<Record<string, number>>((acc, s) => ({ ...acc, [s.kind]: (acc[s.kind] ?? 0) + 1 }), {});
    summary.push(
      `guide    ${g.key}: ${file.guide.title} — ${file.content.steps.length} steps (${Object.entries(counts)
        .map(([k, n]) => `${n} ${k}`)
        .join(', ')}), ${withCalculator}/${measures} measures with a calculator`,
    );
  }
  if (!set.guides.some((g) => g.key === SAMPLE_GUIDE_KEY)) errors.push(`guides: the demo guide ${SAMPLE_GUIDE_KEY}.json must stay`);
  // A symptom inside another symptom makes the two links on the home page hard to tell apart (and
  // tests find links by name).
  for (const a of symptoms) {
    for (const b of symptoms) {
      if (a !== b && b.symptom.toLowerCase().includes(a.symptom.toLowerCase())) errors.push(`${b.file}: symptom '${b.symptom}' contains the symptom of ${a.file}`);
    }
  }
  for (const d of set.drawings) if (!usedDrawings.has(d.key)) warnings.push(`${d.file}: not used by any article or guide`);

  // ---- Scenario ----------------------------------------------------------------------------
  const scenario = Scenario.safeParse(set.scenario);
  if (!scenario.success) {
    for (const issue of scenario.error.issues) errors.push(`scenario/larkfield.json: ${issue.path.join('.')}: ${issue.message}`);
  } else {
    const s = scenario.data;
    const sites = new Set(s.sites.map((x) => x.key));
    const lines = new Map(s.lines.map((x) => [x.key, x]));
    for (const line of s.lines) if (!sites.has(line.site)) errors.push(`scenario: line '${line.key}' names unknown site '${line.site}'`);
    const tags = new Set<string>();
    const stories = new Set(s.stories.map((x) => x.key));
    for (const [i, a] of s.applicators.entries()) {
      const { line, story, cyclesAtStart: _c, ...fields } = a;
      const where = `scenario: applicator ${i} (${String(fields.tag)})`;
      const l = lines.get(line);
      if (!l) errors.push(`${where}: unknown line '${line}'`);
      if (story && !stories.has(story)) errors.push(`${where}: unknown story '${story}'`);
      const parsed = ApplicatorInput.safeParse({ ...fields, lineId: 1 });
      if (!parsed.success) for (const issue of parsed.error.issues) errors.push(`${where}: ${issue.path.join('.')}: ${issue.message}`);
      const tagKey = `${l?.site}/${String(fields.tag).toLowerCase()}`;
      if (tags.has(tagKey)) errors.push(`${where}: tag used twice on one site`);
      tags.add(tagKey);
    }
    for (const p of s.people) if (p.email && !DEMO_USERS.some((u) => u.email === p.email)) errors.push(`scenario: person '${p.name}' names unknown sign-in ${p.email}`);
    for (const story of s.stories) {
      const guideKey = story.params.guide;
      if (typeof guideKey === 'string' && !set.guides.some((g) => g.key === guideKey)) errors.push(`scenario: story '${story.key}' names unknown guide '${guideKey}'`);
    }
    summary.push(`scenario ${s.organisation}: ${s.sites.length} sites, ${s.lines.length} lines, ${s.applicators.length} applicators, ${s.people.length} people, ${s.stories.length} stories`);
  }
  return { errors, warnings, summary };
}
