// Organisations are walled off: with a second organisation's content in place, every route in the
// route table, called by every role of the first organisation with the second's ids, must neither
// show, change nor find anything of the second (another organisation's ids answer 404, not 403).
import { randomUUID } from 'node:crypto';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../../src/shared/guides/sample';
import { ROLES, can, type Role } from '../../src/shared/permissions';
import { hashPassword } from '../../server/lib/passwords';
import { startTestApp, TEST_PASSWORD, type TestApp } from '../helpers/test-app';

type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let t: TestApp;
/** A word that appears only in the other organisation's content, so any response carrying it leaked. */
const MARK = 'Quillonbrass';
const agentsA = new Map<Role, Agent>();
const B = {} as {
  org: number;
  admin: Agent;
  author: Agent;
  reviewer: Agent;
  tech: Agent;
  support: Agent;
  userId: number;
  authorId: number;
  article: number;
  guide: number;
  walk: number;
  stepId: string;
  site: number;
  line: number;
  applicator: number;
  field: number;
  reading: number;
  event: number;
  case: number;
  notice: number;
  file: string;
  mail: number | null;
};
const today = new Date().toISOString().slice(0, 10);

async function userInB(roles: Role[]) {
  const email = `${roles.join('-')}-${randomUUID().slice(0, 8)}@${MARK.toLowerCase()}.example.com`;
  const [row] = await t
    .db('users')
    .insert({ organisation_id: B.org, email, name: `${MARK} ${roles.join(' ')}`, roles, password_hash: await hashPassword(TEST_PASSWORD) })
    .returning('id');
  const agent = t.agent();
  await agent.post('/api/auth/login').send({ email, password: TEST_PASSWORD }).expect(200);
  return { agent, id: row.id as number };
}

function ok(res: { status: number; body: unknown }, status = 200) {
  expect(res.status, JSON.stringify(res.body)).toBe(status);
  return res.body as Record<string, any>;
}

beforeAll(async () => {
  t = await startTestApp();
  for (const role of ROLES) agentsA.set(role, (await t.signIn([role])).agent);
  const [org] = await t
    .db('organisations')
    .insert({ name: `${MARK} works` })
    .returning('id');
  B.org = org.id;
  const admin = await userInB(['admin']);
  const author = await userInB(['author']);
  B.admin = admin.agent;
  B.userId = admin.id;
  B.author = author.agent;
  B.authorId = author.id;
  B.reviewer = (await userInB(['author'])).agent;
  B.tech = (await userInB(['technician'])).agent;
  B.support = (await userInB(['support'])).agent;

  const para = { type: 'paragraph', content: [{ type: 'text', text: `${MARK} seat cleaning` }] };
  B.article = ok(await B.author.post('/api/articles').send({ title: `${MARK} reseating`, summary: MARK, body: { type: 'doc', content: [para] } }), 201).article.id;
  ok(await B.author.post(`/api/articles/${B.article}/submit`).send({}));
  ok(await B.reviewer.post(`/api/articles/${B.article}/approve`).send({}));

  B.guide = ok(await B.author.post('/api/guides').send({ ...SAMPLE_GUIDE_META, title: `${MARK} drips`, symptom: `${MARK} drips after close`, content: SAMPLE_GUIDE }), 201).guide.id;
  ok(await B.author.post(`/api/guides/${B.guide}/submit`).send({}));
  ok(await B.reviewer.post(`/api/guides/${B.guide}/approve`).send({}));

  const walk = ok(await B.tech.post('/api/walks').send({ guideId: B.guide, site: MARK }), 201);
  B.walk = walk.walk?.id ?? walk.id;
  B.stepId = SAMPLE_GUIDE.steps[0].id;

  B.site = ok(await B.admin.post('/api/sites').send({ name: `${MARK} site` }), 201).site.id;
  B.line = ok(await B.admin.post('/api/lines').send({ siteId: B.site, name: `${MARK} line` }), 201).line.id;
  B.field = ok(await B.admin.post('/api/applicators/fields').send({ name: `${MARK} field`, type: 'text' }), 201).field.id;
  B.applicator = ok(
    await B.admin.post('/api/applicators').send({
      lineId: B.line,
      tag: `${MARK}-1`,
      actuation: 'electric',
      coilDrive: '24v-dc',
      needleTip: 'ball',
      needleMaterial: 'Tungsten carbide',
      seatMaterial: 'Stainless steel',
      orificeDiameterMm: 0.8,
      fluidFamily: 'hot-melt',
      fluidName: MARK,
      viscosityMPas: 1500,
      viscosityTemperatureC: 160,
      densityGPerCm3: 0.98,
      heated: true,
      setTemperatureC: 165,
      installedOn: today,
    }),
    201,
  ).applicator.id;
  ok(await B.admin.post(`/api/applicators/${B.applicator}/readings`).send({ readOn: today, count: 1000 }), 201);
  ok(await B.admin.post(`/api/applicators/${B.applicator}/service-events`).send({ performedOn: today, actions: ['cleaned'], note: MARK }), 201);
  B.reading = (await t.db('counter_readings').where({ organisation_id: B.org }).first()).id;
  B.event = (await t.db('service_events').where({ organisation_id: B.org }).first()).id;

  B.case = ok(await B.support.post('/api/cases').send({ callerName: MARK, site: MARK, symptom: `${MARK} glue drips`, applicatorId: B.applicator }), 201).case.id;
  ok(await B.support.post(`/api/cases/${B.case}/handoff`).send({ assigneeId: B.authorId, note: `${MARK} please look` }));
  B.notice = (await t.db('notices').where({ organisation_id: B.org }).first()).id;

  const png = await sharp({ create: { width: 40, height: 20, channels: 3, background: { r: 9, g: 90, b: 200 } } })
    .png()
    .toBuffer();
  B.file = ok(await B.tech.post('/api/files').attach('file', png, `${MARK}.png`), 201).file.id;
  ok(await B.admin.post('/api/admin/users').send({ email: `invitee@${MARK.toLowerCase()}.example.com`, name: `${MARK} invitee`, roles: ['technician'] }), 201);
  B.mail = (await t.db('mail_messages').where({ organisation_id: B.org }).first())?.id ?? null;
  // The mail queue works in the background; let it settle so its own updates are not taken for a probe's.
  for (let i = 0; i < 100 && (await t.db('mail_messages').where({ organisation_id: B.org }).whereNotIn('status', ['sent', 'failed']).first()); i++) {
    await new Promise((r) => setTimeout(r, 100));
  }
}, 60_000);
afterAll(async () => t?.close());

/** The route's path with every parameter replaced by the other organisation's matching id. */
function pathWithB(path: string): string {
  const idFor = (): string | number => {
    if (path.startsWith('/api/articles')) return B.article;
    if (path.startsWith('/api/guides')) return B.guide;
    if (path.startsWith('/api/walks')) return B.walk;
    if (path.startsWith('/api/sites')) return B.site;
    if (path.startsWith('/api/lines')) return B.line;
    if (path.startsWith('/api/applicators/fields')) return B.field;
    if (path.startsWith('/api/applicators')) return B.applicator;
    if (path.startsWith('/api/cases')) return B.case;
    if (path.startsWith('/api/notices')) return B.notice;
    if (path.startsWith('/api/files')) return B.file;
    if (path.startsWith('/api/admin/users')) return B.userId;
    if (path.startsWith('/api/admin/outbox')) return B.mail ?? 999999;
    if (path.startsWith('/api/calculators')) return 'sample';
    return 999999;
  };
  return path
    .replace(/:token/g, 'x'.repeat(32))
    .replace(/:readingId/g, String(B.reading))
    .replace(/:eventId/g, String(B.event))
    .replace(/:number/g, '1')
    .replace(/:kind/g, 'applicators')
    .replace(/:variant/g, 'display')
    .replace(/:id/g, String(idFor()))
    .concat(path.endsWith('/compare') ? '?from=1&to=1' : '');
}

/** A body that passes most schemas and points every reference at the other organisation. */
function bodyWithB(): Record<string, unknown> {
  return {
    guideId: B.guide,
    siteId: B.site,
    lineId: B.line,
    applicatorId: B.applicator,
    walkId: B.walk,
    assigneeId: B.authorId,
    fileIds: [B.file],
    name: 'Probe',
    title: 'Probe',
    tag: 'PROBE-1',
    type: 'text',
    comment: 'Probe',
    text: 'Probe',
    note: 'Probe',
    reason: 'Probe',
    status: 'closed',
    readOn: today,
    count: 5,
    performedOn: today,
    actions: ['cleaned'],
    callerName: 'Probe',
    site: 'Probe',
    symptom: 'Probe',
    baseVersion: 1,
    body: { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text: 'Probe' }] }] },
    id: `ans-${randomUUID()}`,
    clientId: `note-${randomUUID()}`,
    stepId: B.stepId,
    kind: 'acknowledge',
    cautionIds: ['lock-out'],
    answeredAt: new Date().toISOString(),
    roles: ['technician'],
    active: false,
    answers: [{ id: `ans-${randomUUID()}`, stepId: B.stepId, kind: 'acknowledge', cautionIds: ['lock-out'], answeredAt: new Date().toISOString() }],
  };
}

/** One digest of every row that belongs to the other organisation, directly or through a parent. */
async function snapshotB(): Promise<Record<string, string>> {
  const tables: { table_name: string }[] = // Left out: derived tables that background jobs rebuild for every organisation (search documents,
    // insight summaries), which may change at any moment whatever the probe; the digest runs and
    // opt-outs are people's data and stay in.
    (
      await t.db.raw(
        `select table_name from information_schema.columns where table_schema = 'public' and column_name = 'organisation_id'
         and table_name not in ('search_jobs', 'search_words', 'search_documents', 'search_org_state', 'audit_events')
         and (table_name not like 'insight\\_%' or table_name like 'insight\\_digest\\_%')`,
      )
    ).rows;
  const scoped = new Set(tables.map((r) => r.table_name));
  const children: { child: string; col: string; parent: string }[] = (
    await t.db.raw(`
      select c.conrelid::regclass::text as child, a.attname as col, c.confrelid::regclass::text as parent
      from pg_constraint c join pg_attribute a on a.attrelid = c.conrelid and a.attnum = c.conkey[1]
      where c.contype = 'f' and array_length(c.conkey, 1) = 1 and c.connamespace = 'public'::regnamespace`)
  ).rows.filter((r: { child: string; parent: string }) => !scoped.has(r.child) && scoped.has(r.parent) && r.parent !== 'users' && r.child !== 'user_sessions');
  const parts = [
    ...[...scoped].map((tb) => `select '${tb}' as t, md5(coalesce(string_agg(x::text, '|' order by x::text), '')) as h from "${tb}" x where x.organisation_id = ${B.org}`),
    ...children.map(
      (c) =>
        `select '${c.child}.${c.col}', md5(coalesce(string_agg(x::text, '|' order by x::text), '')) from ${c.child} x where x.${c.col} in (select id from ${c.parent} where organisation_id = ${B.org})`,
    ),
  ];
  const rows: { t: string; h: string }[] = (await t.db.raw(parts.join(' union all '))).rows;
  return Object.fromEntries(rows.map((r) => [r.t, r.h]));
}

function hasParam(path: string) {
  return /:(id|readingId|eventId)\b/.test(path) && !path.startsWith('/api/calculators');
}

describe('organisations walled off', () => {
  it('when the other organisation has content, then it is there (the probes below would prove nothing otherwise)', async () => {
    expect((await B.tech.get(`/api/articles/${B.article}`)).status).toBe(200);
    expect((await B.tech.get(`/api/guides/${B.guide}`)).status).toBe(200);
    expect((await B.tech.get(`/api/files/${B.file}/display`)).status).toBe(200);
    expect((await B.admin.get(`/api/applicators/${B.applicator}`)).status).toBe(200);
    expect((await B.support.get(`/api/cases/${B.case}`)).status).toBe(200);
    expect(B.mail).not.toBeNull();
  });

  it("when the other organisation's own people read the same paths, then they get 200, so the ids probed are real", async () => {
    const missed: string[] = [];
    for (const r of t.app.locals.routeTable) {
      if (r.method !== 'get' || !hasParam(r.path)) continue;
      let found = false;
      for (const a of [B.admin, B.author, B.support, B.tech]) if ((await a.get(pathWithB(r.path))).status === 200) found = true;
      if (!found) missed.push(r.path);
    }
    expect(missed).toEqual([]);
  });

  for (const role of ROLES) {
    it(`when a ${role} of one organisation calls every route with the other's ids, then reads answer 404, writes change nothing and no answer carries the other's data`, async () => {
      const agent = agentsA.get(role)!;
      const problems: string[] = [];
      for (const r of t.app.locals.routeTable) {
        if (r.path === '/api/auth/logout' || r.path.startsWith('/api/auth/')) continue; // own account only, no ids of others
        const before = r.method === 'get' ? null : await snapshotB();
        const path = pathWithB(r.path);
        const res = await agent[r.method](path).send(r.method === 'get' ? undefined : bodyWithB());
        const label = `${r.method.toUpperCase()} ${r.path} -> ${res.status}`;
        const allowed = r.access === 'public' || r.access === 'signedIn' || can([role], r.access);
        if (res.status >= 500) problems.push(`${label}: server error`);
        const text = JSON.stringify(res.body ?? '') + (typeof res.text === 'string' ? res.text : '');
        if (res.status < 300 && text.includes(MARK)) problems.push(`${label}: leaked the other organisation's data`);
        if (allowed && hasParam(r.path)) {
          if (r.method === 'get' && res.status !== 404) problems.push(`${label}: expected 404`);
          if (r.method !== 'get' && (res.status < 400 || res.status === 403)) problems.push(`${label}: expected 404 or a refusal that is not 403`);
        }
        if (before) {
          const after = await snapshotB();
          const changed = Object.keys(after).filter((k) => after[k] !== before[k]);
          if (changed.length) problems.push(`${label}: changed ${changed.join(', ')}`);
        }
      }
      expect(problems).toEqual([]);
    }, 60_000);
  }

  it('when all the probes have run, then no row of one organisation points at a row of another', async () => {
    const fks: { child: string; col: string; parent: string }[] = (
      await t.db.raw(`
        select c.conrelid::regclass::text as child, a.attname as col, c.confrelid::regclass::text as parent
        from pg_constraint c join pg_attribute a on a.attrelid = c.conrelid and a.attnum = c.conkey[1]
        where c.contype = 'f' and array_length(c.conkey, 1) = 1 and c.connamespace = 'public'::regnamespace
          and exists (select 1 from information_schema.columns where table_name = c.conrelid::regclass::text and column_name = 'organisation_id')
          and exists (select 1 from information_schema.columns where table_name = c.confrelid::regclass::text and column_name = 'organisation_id')`)
    ).rows;
    expect(fks.length).toBeGreaterThan(5);
    const crossed: string[] = [];
    for (const f of fks) {
      const { rows } = await t.db.raw(`select count(*)::int as n from ${f.child} x join ${f.parent} p on p.id = x.${f.col} where p.organisation_id <> x.organisation_id`);
      if (rows[0].n > 0) crossed.push(`${f.child}.${f.col} -> ${f.parent}: ${rows[0].n}`);
    }
    expect(crossed).toEqual([]);
  });

  it('when someone of one organisation searches for words only the other uses, then nothing of the other comes back', async () => {
    for (const role of ROLES) {
      const res = await agentsA.get(role)!.get(`/api/search?q=${MARK}`);
      expect(res.status).toBe(200);
      expect(res.body.total).toBe(0);
      expect(JSON.stringify(res.body.results)).not.toContain(MARK);
    }
    // The same query finds it inside its own organisation, so the search above could have found it.
    const own = await B.tech.get(`/api/search?q=${MARK}`);
    expect(JSON.stringify(own.body.results)).toContain(MARK);
  });
});
