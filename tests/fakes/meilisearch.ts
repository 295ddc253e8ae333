// A local stand-in for a Meilisearch server: the subset of its HTTP API the official client uses
// here (indexes, settings, documents add/delete, search and multi-search with filters, tasks),
// kept in memory. Tests can stop and restart it, delay its searches, and read what it was sent.
// Its request and response shapes are pinned by tests/api/meili-fake-contract.test.ts.
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';

type Doc = Record<string, unknown>;

interface Settings {
  searchableAttributes: string[];
  filterableAttributes: string[];
  sortableAttributes: string[];
  displayedAttributes: string[];
  synonyms: Record<string, string[]>;
  rankingRules: string[];
  stopWords: string[];
}

interface IndexState {
  uid: string;
  primaryKey: string | null;
  createdAt: string;
  updatedAt: string;
  settings: Settings;
  docs: Map<string, Doc>;
}

interface Task {
  uid: number;
  batchUid: number;
  indexUid: string | null;
  status: 'enqueued' | 'processing' | 'succeeded' | 'failed' | 'canceled';
  type: string;
  canceledBy: null;
  details: Record<string, unknown>;
  error: { message: string; code: string; type: string; link: string } | null;
  duration: string;
  enqueuedAt: string;
  startedAt: string;
  finishedAt: string;
}

export interface RecordedRequest {
  method: string;
  path: string;
  query: Record<string, string>;
  headers: { authorization?: string; contentType?: string; client?: string };
  body: unknown;
}

export interface FakeMeili {
  url: string;
  apiKey: string;
  requests: RecordedRequest[];
  /** Stops listening: connections are refused, as when the server is down. */
  stop(): Promise<void>;
  /** Listens again on the same port, with the same data. */
  start(): Promise<void>;
  /** Searches wait this long before answering. */
  setSearchDelay(ms: number): void;
  documents(uid: string): Doc[];
  indexUids(): string[];
  settings(uid: string): Settings | undefined;
  close(): Promise<void>;
}

class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly type = 'invalid_request',
  ) {
    super(message);
  }
}

const now = () => new Date().toISOString();
const errorBody = (code: string, message: string, type: string) => ({ message, code, type, link: `https://docs.meilisearch.com/errors#${code}` });

function defaultSettings(): Settings {
  return {
    searchableAttributes: ['*'],
    filterableAttributes: [],
    sortableAttributes: [],
    displayedAttributes: ['*'],
    synonyms: {},
    rankingRules: ['words', 'typo', 'proximity', 'attribute', 'sort', 'exactness'],
    stopWords: [],
  };
}

// ---- text matching ------------------------------------------------------------------------------

const fold = (s: string) => s.normalize('NFD').replace(/\p{M}/gu, '').toLowerCase();
const tokens = (s: string) =>
  fold(s)
    .split(/[^\p{L}\p{N}]+/u)
    .filter(Boolean);

function distance(a: string, b: string, max: number): number {
  if (Math.abs(a.length - b.length) > max) return max + 1;
  let prev = Array.from({ length: b.length + 1 }, (_, i) => i);
  for (let i = 1; i <= a.length; i++) {
    const cur = [i];
    for (let j = 1; j <= b.length; j++) cur[j] = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
    prev = cur;
  }
  return prev[b.length];
}

/** Typos allowed as the real server does by default: none under 5 letters, one from 5, two from 9. */
const typoBudget = (w: string) => (w.length >= 9 ? 2 : w.length >= 5 ? 1 : 0);

interface WordMatch {
  typos: number;
}

function matchWord(word: string, docTokens: string[], prefix: boolean): WordMatch | null {
  let best: WordMatch | null = null;
  for (const t of docTokens) {
    if (t === word || (prefix && t.startsWith(word))) return { typos: 0 };
    const budget = typoBudget(word);
    if (budget) {
      const d = distance(word, t, budget);
      if (d <= budget && (!best || d < best.typos)) best = { typos: d };
    }
  }
  return best;
}

function textOf(v: unknown): string {
  if (v === null || v === undefined) return '';
  if (Array.isArray(v)) return v.map(textOf).join(' ');
  if (typeof v === 'object')
    return Object.values(v as Doc)
      .map(textOf)
      .join(' ');
  return String(v);
}

// ---- filters ------------------------------------------------------------------------------------

type Filter = (doc: Doc) => boolean;

function parseFilter(input: unknown, filterable: string[]): Filter {
  if (input === undefined || input === null || input === '') return () => true;
  if (Array.isArray(input)) {
    const parts = input.map((p) => (Array.isArray(p) ? p.map((x) => parseFilter(x, filterable)) : [parseFilter(p, filterable)]));
    return (doc) => parts.every((ors) => ors.some((f) => f(doc)));
  }
  if (typeof input !== 'string') throw new ApiError(400, 'invalid_search_filter', 'Invalid syntax for the filter parameter: expected a string or an array.');
  const src = input;
  const toks = src.match(/"(?:[^"\\]|\\.)*"|'(?:[^'\\]|\\.)*'|!=|>=|<=|[=<>()[\],]|[^\s=<>!()[\],]+/g) ?? [];
  let i = 0;
  const peek = () => toks[i];
  const next = () => toks[i++];
  const fail = (why: string): never => {
    throw new ApiError(400, 'invalid_search_filter', `Invalid filter \`${src}\`: ${why}`);
  };
  const value = () => {
    const v = next();
    if (v === undefined) fail('a value is missing');
    return /^["']/.test(v!) ? v!.slice(1, -1).replace(/\\(.)/g, '$1') : v!;
  };
  const same = (a: unknown, b: string) => (Array.isArray(a) ? a.some((x) => String(x) === b) : a !== undefined && a !== null && String(a) === b);
  const attribute = () => {
    const a = next();
    if (!a || /^[()[\],=<>]$/.test(a)) fail('an attribute is missing');
    if (!filterable.includes(a!)) {
      throw new ApiError(400, 'invalid_search_filter', `Attribute \`${a}\` is not filterable. Available filterable attributes are: \`${filterable.join(', ')}\`.`);
    }
    return a!;
  };
  const primary = (): Filter => {
    if (peek() === '(') {
      next();
      const e = or();
      if (next() !== ')') fail('a closing parenthesis is missing');
      return e;
    }
    if (peek()?.toUpperCase() === 'NOT') {
      next();
      const e = primary();
      return (d) => !e(d);
    }
    const attr = attribute();
    const op = next();
    if (op?.toUpperCase() === 'IN' || (op?.toUpperCase() === 'NOT' && peek()?.toUpperCase() === 'IN')) {
      const negate = op.toUpperCase() === 'NOT';
      if (negate) next();
      if (next() !== '[') fail('`IN` needs a list in brackets');
      const values: string[] = [];
      while (peek() !== ']') {
        values.push(value());
        if (peek() === ',') next();
        else if (peek() !== ']') fail('list items are separated by commas');
      }
      next();
      return (d) => values.some((v) => same(d[attr], v)) !== negate;
    }
    if (op?.toUpperCase() === 'EXISTS') return (d) => d[attr] !== undefined;
    const v = value();
    const num = (x: unknown) => Number(x);
    switch (op) {
      case '=':
        return (d) => same(d[attr], v);
      case '!=':
        return (d) => !same(d[attr], v);
      case '>':
        return (d) => num(d[attr]) > num(v);
      case '>=':
        return (d) => num(d[attr]) >= num(v);
      case '<':
        return (d) => num(d[attr]) < num(v);
      case '<=':
        return (d) => num(d[attr]) <= num(v);
      default:
        return fail(`unknown operator \`${op}\``);
    }
  };
  const and = (): Filter => {
    let left = primary();
    while (peek()?.toUpperCase() === 'AND') {
      next();
      const l = left;
      const r = primary();
      left = (d) => l(d) && r(d);
    }
    return left;
  };
  function or(): Filter {
    let left = and();
    while (peek()?.toUpperCase() === 'OR') {
      next();
      const l = left;
      const r = and();
      left = (d) => l(d) || r(d);
    }
    return left;
  }
  const expr = or();
  if (i < toks.length) fail(`unexpected \`${toks[i]}\``);
  return expr;
}

// ---- search -------------------------------------------------------------------------------------

interface SearchBody {
  q?: string | null;
  filter?: unknown;
  limit?: number;
  offset?: number;
  attributesToRetrieve?: string[];
  attributesToHighlight?: string[];
  attributesToCrop?: string[];
  cropLength?: number;
  cropMarker?: string;
  highlightPreTag?: string;
  highlightPostTag?: string;
  showRankingScore?: boolean;
}

function searchIndex(index: IndexState, body: SearchBody) {
  const started = Date.now();
  const s = index.settings;
  const filter = parseFilter(body.filter, s.filterableAttributes);
  const searchable = s.searchableAttributes.includes('*') ? null : s.searchableAttributes;
  const words = tokens(body.q ?? '');
  const alternatives = words.map((w) => [w, ...(s.synonyms[w] ?? []).map(fold)]);
  const scored: { doc: Doc; score: number; matched: Set<string> }[] = [];

  for (const doc of index.docs.values()) {
    if (!filter(doc)) continue;
    if (!words.length) {
      scored.push({ doc, score: 1, matched: new Set() });
      continue;
    }
    const attrs = searchable ?? Object.keys(doc);
    const perAttr = attrs.map((a) => tokens(textOf(doc[a])));
    const all = perAttr.flat();
    // Matching strategy "last": every word if possible, else the leading words that do match.
    let leading = 0;
    let typos = 0;
    let bestAttr = attrs.length;
    const matched = new Set<string>();
    for (const [wi, alts] of alternatives.entries()) {
      let m: WordMatch | null = null;
      for (const alt of alts) {
        const altWords = alt.split(/\s+/);
        if (altWords.length > 1) {
          if (altWords.every((aw) => all.includes(aw))) m = { typos: 0 };
        } else m = m ?? matchWord(alt, all, wi === alternatives.length - 1);
        if (m) {
          for (const aw of altWords) matched.add(aw);
          const at = perAttr.findIndex((toks) => altWords.some((aw) => toks.some((t) => t === aw || t.startsWith(aw) || distance(aw, t, typoBudget(aw)) <= typoBudget(aw))));
          if (at >= 0) bestAttr = Math.min(bestAttr, at);
          break;
        }
      }
      if (!m) break;
      if (m.typos) for (const t of all) if (distance(alts[0], t, typoBudget(alts[0])) <= typoBudget(alts[0])) matched.add(t);
      leading++;
      typos += m.typos;
    }
    if (!leading) continue;
    const score = (leading / words.length) * (1 - 0.1 * Math.min(typos, 5)) * (1 - 0.04 * Math.min(bestAttr, 10));
    scored.push({ doc, score: Math.round(score * 10000) / 10000, matched });
  }
  scored.sort((a, b) => b.score - a.score);
  const offset = body.offset ?? 0;
  const limit = body.limit ?? 20;
  const page = scored.slice(offset, offset + limit);
  const pre = body.highlightPreTag ?? '<em>';
  const post = body.highlightPostTag ?? '</em>';
  const highlight = new Set(body.attributesToHighlight ?? []);
  const crop = new Map<string, number>();
  for (const c of body.attributesToCrop ?? []) {
    const [name, n] = c.split(':');
    crop.set(name, n ? Number(n) : (body.cropLength ?? 10));
  }
  const mark = (text: string, matched: Set<string>) => text.replace(/[\p{L}\p{N}]+/gu, (w) => (matched.has(fold(w)) || [...matched].some((m) => fold(w).startsWith(m)) ? `${pre}${w}${post}` : w));
  const cropText = (text: string, n: number, matched: Set<string>) => {
    const parts = text.split(/\s+/).filter(Boolean);
    if (parts.length <= n) return text;
    const hit = parts.findIndex((p) => tokens(p).some((t) => matched.has(t)));
    const start = Math.max(0, Math.min(parts.length - n, (hit < 0 ? 0 : hit) - Math.floor(n / 2)));
    const marker = body.cropMarker ?? '…';
    return `${start > 0 ? marker : ''}${parts.slice(start, start + n).join(' ')}${start + n < parts.length ? marker : ''}`;
  };

  const hits = page.map(({ doc, score, matched }) => {
    const retrieve = body.attributesToRetrieve && !body.attributesToRetrieve.includes('*') ? body.attributesToRetrieve : Object.keys(doc);
    const hit: Doc = {};
    for (const k of retrieve) if (k in doc) hit[k] = doc[k];
    if (highlight.size || crop.size) {
      const formatted: Doc = {};
      for (const [k, v] of Object.entries(hit)) {
        if (typeof v !== 'string') {
          formatted[k] = Array.isArray(v) || typeof v === 'object' ? v : String(v);
          continue;
        }
        let text = v;
        if (crop.has(k) || crop.has('*')) text = cropText(text, crop.get(k) ?? crop.get('*')!, matched);
        if (highlight.has(k) || highlight.has('*') || crop.has(k)) text = mark(text, matched);
        formatted[k] = text;
      }
      hit._formatted = formatted;
    }
    if (body.showRankingScore) hit._rankingScore = score;
    return hit;
  });
  return { hits, query: body.q ?? '', processingTimeMs: Date.now() - started, limit, offset, estimatedTotalHits: scored.length };
}

// ---- the server ---------------------------------------------------------------------------------

export async function startFakeMeili(opts: { apiKey?: string } = {}): Promise<FakeMeili> {
  const apiKey = opts.apiKey ?? 'fake-master-key';
  const indexes = new Map<string, IndexState>();
  const tasks = new Map<number, Task>();
  const requests: RecordedRequest[] = [];
  let taskUid = 0;
  let searchDelay = 0;
  let server: Server | null = null;
  let port = 0;

  function getIndex(uid: string): IndexState {
    const index = indexes.get(uid);
    if (!index) throw new ApiError(404, 'index_not_found', `Index \`${uid}\` not found.`);
    return index;
  }

  function ensureIndex(uid: string, primaryKey?: string | null): IndexState {
    let index = indexes.get(uid);
    if (!index) {
      index = { uid, primaryKey: primaryKey ?? null, createdAt: now(), updatedAt: now(), settings: defaultSettings(), docs: new Map() };
      indexes.set(uid, index);
    }
    return index;
  }

  /** Runs the work at once (this fake never queues) and records the task the client will poll. */
  function enqueue(indexUid: string | null, type: string, work: () => Record<string, unknown>) {
    const uid = taskUid++;
    const enqueuedAt = now();
    let details: Record<string, unknown> = {};
    let error: Task['error'] = null;
    try {
      details = work();
    } catch (err) {
      const e = err instanceof ApiError ? err : new ApiError(500, 'internal', String(err), 'internal');
      error = errorBody(e.code, e.message, e.type);
    }
    tasks.set(uid, {
      uid,
      batchUid: uid,
      indexUid,
      status: error ? 'failed' : 'succeeded',
      type,
      canceledBy: null,
      details,
      error,
      duration: 'PT0.001S',
      enqueuedAt,
      startedAt: now(),
      finishedAt: now(),
    });
    return { status: 202, body: { taskUid: uid, indexUid, status: 'enqueued', type, enqueuedAt } };
  }

  function primaryKeyOf(index: IndexState, docs: Doc[], fromQuery?: string): string {
    const pk = index.primaryKey ?? fromQuery ?? (docs[0] && Object.keys(docs[0]).find((k) => /(^|_)id$/i.test(k)));
    if (!pk) throw new ApiError(400, 'index_primary_key_no_candidate_found', 'The primary key inference failed: no candidate was found.');
    index.primaryKey = pk;
    return pk;
  }

  function indexObject(i: IndexState) {
    return { uid: i.uid, primaryKey: i.primaryKey, createdAt: i.createdAt, updatedAt: i.updatedAt };
  }

  async function route(method: string, path: string, query: URLSearchParams, body: any): Promise<{ status: number; body: unknown }> {
    const m = (re: RegExp) => re.exec(path);
    let p: RegExpExecArray | null;
    if (method === 'GET' && path === '/health') return { status: 200, body: { status: 'available' } };
    if (method === 'GET' && path === '/version') return { status: 200, body: { commitSha: 'fake', commitDate: now(), pkgVersion: '1.99.0-fake' } };
    if (method === 'GET' && (p = m(/^\/tasks\/(\d+)$/))) {
      const task = tasks.get(Number(p[1]));
      if (!task) throw new ApiError(404, 'task_not_found', `Task \`${p[1]}\` not found.`);
      return { status: 200, body: task };
    }
    if (method === 'GET' && path === '/indexes') {
      const list = [...indexes.values()].map(indexObject);
      return { status: 200, body: { results: list, offset: 0, limit: 20, total: list.length } };
    }
    if (method === 'POST' && path === '/indexes') {
      const uid = String(body?.uid ?? '');
      if (!/^[a-zA-Z0-9_-]{1,400}$/.test(uid)) throw new ApiError(400, 'invalid_index_uid', `\`${uid}\` is not a valid index uid.`);
      return enqueue(uid, 'indexCreation', () => {
        if (indexes.has(uid)) throw new ApiError(409, 'index_already_exists', `Index \`${uid}\` already exists.`);
        ensureIndex(uid, body?.primaryKey ?? null);
        return { primaryKey: body?.primaryKey ?? null };
      });
    }
    if (method === 'POST' && path === '/multi-search') {
      if (searchDelay) await new Promise((r) => setTimeout(r, searchDelay));
      const queries = (body?.queries ?? []) as (SearchBody & { indexUid: string })[];
      const results = queries.map((q) => ({ indexUid: q.indexUid, ...searchIndex(getIndex(q.indexUid), q) }));
      return { status: 200, body: { results } };
    }
    if ((p = m(/^\/indexes\/([^/]+)(\/.*)?$/))) {
      const uid = decodeURIComponent(p[1]);
      const rest = p[2] ?? '';
      if (rest === '') {
        if (method === 'GET') return { status: 200, body: indexObject(getIndex(uid)) };
        if (method === 'DELETE')
          return enqueue(uid, 'indexDeletion', () => {
            const deleted = getIndex(uid).docs.size;
            indexes.delete(uid);
            return { deletedDocuments: deleted };
          });
      }
      if (rest === '/search' && method === 'POST') {
        if (searchDelay) await new Promise((r) => setTimeout(r, searchDelay));
        return { status: 200, body: searchIndex(getIndex(uid), body ?? {}) };
      }
      if (rest === '/stats' && method === 'GET') {
        const index = getIndex(uid);
        const fields: Record<string, number> = {};
        for (const d of index.docs.values()) for (const k of Object.keys(d)) fields[k] = (fields[k] ?? 0) + 1;
        return { status: 200, body: { numberOfDocuments: index.docs.size, isIndexing: false, fieldDistribution: fields } };
      }
      if (rest === '/settings') {
        if (method === 'GET') return { status: 200, body: getIndex(uid).settings };
        if (method === 'PATCH')
          return enqueue(uid, 'settingsUpdate', () => {
            const index = ensureIndex(uid);
            index.settings = { ...index.settings, ...(body ?? {}) };
            index.updatedAt = now();
            return body ?? {};
          });
      }
      if (rest === '/documents') {
        if (method === 'GET') {
          const docs = [...getIndex(uid).docs.values()];
          const offset = Number(query.get('offset') ?? 0);
          const limit = Number(query.get('limit') ?? 20);
          return { status: 200, body: { results: docs.slice(offset, offset + limit), offset, limit, total: docs.length } };
        }
        if (method === 'POST' || method === 'PUT') {
          if (!Array.isArray(body)) throw new ApiError(400, 'malformed_payload', 'The documents payload must be an array.');
          return enqueue(uid, 'documentAdditionOrUpdate', () => {
            const index = ensureIndex(uid);
            const pk = primaryKeyOf(index, body, query.get('primaryKey') ?? undefined);
            for (const d of body as Doc[]) {
              const id = d[pk];
              if (typeof id !== 'number' && !(typeof id === 'string' && /^[a-zA-Z0-9_-]{1,511}$/.test(id))) {
                throw new ApiError(400, 'invalid_document_id', `Document identifier \`${JSON.stringify(id)}\` is invalid.`);
              }
              const key = String(id);
              index.docs.set(key, method === 'PUT' ? { ...(index.docs.get(key) ?? {}), ...d } : d);
            }
            index.updatedAt = now();
            return { receivedDocuments: body.length, indexedDocuments: body.length };
          });
        }
        if (method === 'DELETE')
          return enqueue(uid, 'documentDeletion', () => {
            const index = getIndex(uid);
            const n = index.docs.size;
            index.docs.clear();
            return { deletedDocuments: n };
          });
      }
      if (rest === '/documents/delete-batch' && method === 'POST') {
        return enqueue(uid, 'documentDeletion', () => {
          const index = getIndex(uid);
          let n = 0;
          for (const id of body as unknown[]) if (index.docs.delete(String(id))) n++;
          return { providedIds: (body as unknown[]).length, deletedDocuments: n };
        });
      }
      if (rest === '/documents/delete' && method === 'POST') {
        const filter = parseFilter(body?.filter, indexes.get(uid)?.settings.filterableAttributes ?? []);
        return enqueue(uid, 'documentDeletion', () => {
          const index = getIndex(uid);
          let n = 0;
          for (const [k, d] of index.docs) if (filter(d)) n += index.docs.delete(k) ? 1 : 0;
          return { originalFilter: JSON.stringify(body?.filter), deletedDocuments: n };
        });
      }
      if ((p = m(/^\/indexes\/[^/]+\/documents\/([^/]+)$/))) {
        const id = decodeURIComponent(p[1]);
        if (method === 'GET') {
          const d = getIndex(uid).docs.get(id);
          if (!d) throw new ApiError(404, 'document_not_found', `Document \`${id}\` not found.`);
          return { status: 200, body: d };
        }
        if (method === 'DELETE') return enqueue(uid, 'documentDeletion', () => ({ deletedDocuments: getIndex(uid).docs.delete(id) ? 1 : 0 }));
      }
    }
    throw new ApiError(404, 'not_found', `${method} ${path} is not part of this fake.`);
  }

  async function handle(req: IncomingMessage, res: ServerResponse) {
    const chunks: Buffer[] = [];
    for await (const c of req) chunks.push(c as Buffer);
    const raw = Buffer.concat(chunks).toString('utf8');
    const url = new URL(req.url ?? '/', 'http://fake');
    let body: unknown = undefined;
    const send = (status: number, payload: unknown) => {
      if (res.destroyed) return;
      res.writeHead(status, { 'Content-Type': 'application/json' });
      res.end(payload === undefined ? '' : JSON.stringify(payload));
    };
    try {
      body = raw ? JSON.parse(raw) : undefined;
    } catch {
      return send(400, errorBody('malformed_payload', 'The request body is not valid JSON.', 'invalid_request'));
    }
    requests.push({
      method: req.method ?? 'GET',
      path: url.pathname,
      query: Object.fromEntries(url.searchParams),
      headers: { authorization: req.headers.authorization, contentType: req.headers['content-type'], client: req.headers['x-meilisearch-client'] as string | undefined },
      body,
    });
    if (url.pathname !== '/health') {
      const auth = req.headers.authorization;
      if (!auth) return send(401, errorBody('missing_authorization_header', 'The Authorization header is missing.', 'auth'));
      if (auth !== `Bearer ${apiKey}`) return send(403, errorBody('invalid_api_key', 'The provided API key is invalid.', 'auth'));
    }
    try {
      const out = await route(req.method ?? 'GET', url.pathname, url.searchParams, body);
      send(out.status, out.body);
    } catch (err) {
      const e = err instanceof ApiError ? err : new ApiError(500, 'internal', String(err), 'internal');
      send(e.status, errorBody(e.code, e.message, e.type));
    }
  }

  async function listen() {
    server = createServer((req, res) => void handle(req, res));
    await new Promise<void>((resolve, reject) => {
      server!.once('error', reject);
      server!.listen(port, '127.0.0.1', () => resolve());
    });
    port = (server.address() as AddressInfo).port;
  }

  async function stop() {
    if (!server) return;
    const s = server;
    server = null;
    s.closeAllConnections();
    await new Promise<void>((r) => s.close(() => r()));
  }

  await listen();
  return {
    url: `http://127.0.0.1:${port}`,
    apiKey,
    requests,
    stop,
    start: async () => {
      if (!server) await listen();
    },
    setSearchDelay: (ms) => {
      searchDelay = ms;
    },
    documents: (uid) => [...(indexes.get(uid)?.docs.values() ?? [])],
    indexUids: () => [...indexes.keys()],
    settings: (uid) => indexes.get(uid)?.settings,
    close: stop,
  };
}
