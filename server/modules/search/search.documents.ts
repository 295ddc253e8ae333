// Reads published guides and articles straight from their tables (read-only) and turns each into
// one engine-neutral search document; a missing or unpublished source comes back as null.
import type { Knex } from 'knex';
import type { SearchKind } from '../../../src/shared/schemas/search';

export interface SearchSource {
  kind: SearchKind;
  refId: number;
  organisationId: number;
  version: number;
  title: string;
  symptom: string;
  summary: string;
  /** Tag slugs, as filters compare them. */
  tags: string[];
  facets: { actuation: string[]; component: string[]; fluid: string[] };
  /** Words ranked with the symptom: tag labels, cause names, article keywords. */
  headWords: string[];
  /** Step and article text: found, ranked lowest, and quoted in snippets. */
  body: string;
  steps: { id: string; title: string; text: string }[];
  stamp: Date;
  publishedAt: Date | null;
}

/** Highlight delimiters; removed from stored text so content can never forge a <mark>. */
export const MARK_OPEN = '\u27E6';
export const MARK_CLOSE = '\u27E7';

const clean = (s: unknown) => (typeof s === 'string' ? s.replace(/[\u27E6\u27E7]/g, ' ').replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F]/g, ' ') : '');

/** Plain text of an editor document: every text node, blocks separated by spaces. */
export function docText(node: unknown, out: string[] = []): string[] {
  if (!node || typeof node !== 'object') return out;
  const n = node as { text?: unknown; content?: unknown };
  if (typeof n.text === 'string') out.push(n.text);
  if (Array.isArray(n.content)) for (const c of n.content) docText(c, out);
  return out;
}

type Json = Record<string, unknown>;

function stepText(step: Json, causeLabels: Map<string, string>): { text: string; cause: string | null } {
  const parts: string[] = [];
  const body = step.body as Json | undefined;
  if (body?.doc) parts.push(docText(body.doc).join(' '));
  for (const key of ['action', 'cause', 'contact', 'message'] as const) if (typeof step[key] === 'string') parts.push(step[key] as string);
  if (Array.isArray(step.choices)) for (const c of step.choices as Json[]) parts.push(String(c.label ?? ''));
  if (Array.isArray(step.remedy)) for (const r of step.remedy) parts.push(String(r));
  if (step.reading && typeof step.reading === 'object') parts.push(String((step.reading as Json).label ?? ''));
  const code = typeof step.causeCode === 'string' ? step.causeCode : '';
  return { text: clean(parts.filter(Boolean).join(' ')), cause: code ? (causeLabels.get(code) ?? code.replace(/-/g, ' ')) : null };
}

interface OrgLabels {
  tags: Map<string, { group: string; label: string }>;
  causes: Map<string, string>;
}

async function labelsFor(db: Knex, organisationIds: number[]): Promise<Map<number, OrgLabels>> {
  const out = new Map<number, OrgLabels>();
  for (const id of organisationIds) out.set(id, { tags: new Map(), causes: new Map() });
  if (!organisationIds.length) return out;
  const [tags, causes] = await Promise.all([
    db('tags').whereIn('organisation_id', organisationIds).select('organisation_id', 'group', 'slug', 'label'),
    db('causes').whereIn('organisation_id', organisationIds).select('organisation_id', 'code', 'label'),
  ]);
  for (const t of tags) out.get(t.organisation_id)!.tags.set(t.slug, { group: t.group, label: t.label });
  for (const c of causes) out.get(c.organisation_id)!.causes.set(c.code, c.label);
  return out;
}

function facetsOf(tags: string[], labels: OrgLabels) {
  const facets = { actuation: [] as string[], component: [] as string[], fluid: [] as string[] };
  for (const slug of tags) {
    const group = labels.tags.get(slug)?.group as keyof typeof facets | undefined;
    if (group && facets[group]) facets[group].push(slug);
  }
  return facets;
}

function tagWords(tags: string[], labels: OrgLabels): string[] {
  return tags.flatMap((slug) => [slug.replace(/-/g, ' '), labels.tags.get(slug)?.label ?? '']).filter(Boolean);
}

/** Published articles by id; ids that are missing, unpublished or archived map to null. */
export async function loadArticles(db: Knex, ids: number[]): Promise<Map<number, SearchSource | null>> {
  const out = new Map<number, SearchSource | null>(ids.map((id) => [id, null]));
  if (!ids.length) return out;
  const rows = await db('articles as a')
    .join('article_revisions as r', 'r.id', 'a.published_revision_id')
    .whereIn('a.id', ids)
    .whereNot('a.workflow', 'archived')
    .select('a.id', 'a.organisation_id', 'a.updated_at', 'a.reviewed_at', 'r.number', 'r.title', 'r.summary', 'r.body_text', 'r.tags', 'r.keywords', 'r.updated_at as r_updated_at');
  const labels = await labelsFor(db, [...new Set(rows.map((r) => r.organisation_id as number))]);
  for (const r of rows) {
    const l = labels.get(r.organisation_id)!;
    out.set(r.id, {
      kind: 'article',
      refId: r.id,
      organisationId: r.organisation_id,
      version: r.number,
      title: clean(r.title),
      symptom: '',
      summary: clean(r.summary),
      tags: r.tags,
      facets: facetsOf(r.tags, l),
      headWords: [...tagWords(r.tags, l), ...r.keywords.map(clean)],
      body: clean(r.body_text),
      steps: [],
      stamp: new Date(Math.max(r.updated_at.getTime(), r.r_updated_at.getTime())),
      publishedAt: r.reviewed_at ?? r.r_updated_at,
    });
  }
  return out;
}

/** Published, active guides by id; missing, unpublished or retired ones map to null. */
export async function loadGuides(db: Knex, ids: number[]): Promise<Map<number, SearchSource | null>> {
  const out = new Map<number, SearchSource | null>(ids.map((id) => [id, null]));
  if (!ids.length) return out;
  const rows = await db('guides as g')
    .join('guide_versions as v', 'v.id', 'g.published_version_id')
    .whereIn('g.id', ids)
    .where('g.status', 'active')
    .select('g.id', 'g.organisation_id', 'g.updated_at', 'v.number', 'v.title', 'v.symptom', 'v.summary', 'v.tags', 'v.content', 'v.published_at', 'v.updated_at as v_updated_at');
  const labels = await labelsFor(db, [...new Set(rows.map((r) => r.organisation_id as number))]);
  for (const r of rows) {
    const l = labels.get(r.organisation_id)!;
    const steps: SearchSource['steps'] = [];
    const causes = new Set<string>();
    for (const s of ((r.content as Json)?.steps ?? []) as Json[]) {
      const { text, cause } = stepText(s, l.causes);
      if (cause) causes.add(cause);
      steps.push({ id: String(s.id), title: clean(s.title), text });
    }
    out.set(r.id, {
      kind: 'guide',
      refId: r.id,
      organisationId: r.organisation_id,
      version: r.number,
      title: clean(r.title),
      symptom: clean(r.symptom),
      summary: clean(r.summary),
      tags: r.tags,
      facets: facetsOf(r.tags, l),
      headWords: [...tagWords(r.tags, l), ...causes],
      body: steps.map((s) => `${s.title}. ${s.text}`).join(' '),
      steps,
      stamp: new Date(Math.max(r.updated_at.getTime(), r.v_updated_at.getTime())),
      publishedAt: r.published_at,
    });
  }
  return out;
}

export function loadSources(db: Knex, kind: SearchKind, ids: number[]) {
  return kind === 'guide' ? loadGuides(db, ids) : loadArticles(db, ids);
}
