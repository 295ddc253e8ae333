// Support desk cases over HTTP: logging a call and refusing half a case, the timeline, status
// rules, what each role sees and may do, walks run with the caller, the hand-off (e-mail and
// notice) and the caller's summary as the fake SMTP server received it, and the queue's list.
import { randomBytes, randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../../src/shared/guides/sample';
import type { CaseDetail } from '../../src/shared/schemas/cases';
import type { WalkState } from '../../src/shared/walks/walk-path';
import { hashPassword } from '../../server/lib/passwords';
import { TEST_PASSWORD, startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let support: Agent;
let supportUser: { id: number; email: string };
let guideId: number;

const call = (extra: Record<string, unknown> = {}) => ({
  callerName: 'Hal Brandt',
  callerCompany: 'Ostwick Foods',
  callerPhone: '+44 1632 960 418',
  callerEmail: 'hal.brandt@example.net',
  site: 'Ostwick plant 2',
  line: 'Line 3',
  applicator: 'V-31',
  symptom: 'Glue drips after the valve closes',
  ...extra,
});

async function logCall(extra: Record<string, unknown> = {}, agent: Agent = support): Promise<CaseDetail> {
  const res = await agent.post('/api/cases').send(call(extra));
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.case;
}

async function publishGuide() {
  return t.db.transaction(async (trx) => {
    const [guide] = await trx('guides').insert({ organisation_id: t.organisationId, status: 'active' }).returning('id');
    const [version] = await trx('guide_versions')
      .insert({
        guide_id: guide.id,
        number: 1,
        state: 'published',
        title: SAMPLE_GUIDE_META.title,
        symptom: SAMPLE_GUIDE_META.symptom,
        summary: SAMPLE_GUIDE_META.summary ?? '',
        tags: SAMPLE_GUIDE_META.tags,
        content: JSON.stringify(SAMPLE_GUIDE),
        published_at: trx.fn.now(),
      })
      .returning('id');
    await trx('guides').where({ id: guide.id }).update({ published_version_id: version.id });
    return guide.id as number;
  });
}

/** Walks the demo guide as the support desk does with a caller: hot nozzle, then the finding's outcome. */
async function walkToHotMelt(agent: Agent, outcome: 'fixed' | 'not-fixed'): Promise<number> {
  const started = await agent.post('/api/walks').send({ guideId, site: 'Ostwick plant 2' });
  expect(started.status, JSON.stringify(started.body)).toBe(201);
  const walkId = started.body.walk.id as number;
  let state: WalkState = started.body.walk.state;
  const give = async (entry: Record<string, unknown>) => {
    const res = await agent.post(`/api/walks/${walkId}/answers`).send({ id: `ans-${randomUUID()}`, answeredAt: new Date().toISOString(), ...entry });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    state = res.body.state;
  };
  const answer = async (entry: Record<string, unknown>) => {
    if (state.unacknowledged.length) await give({ stepId: state.at, kind: 'acknowledge', cautionIds: state.unacknowledged });
    await give(entry);
  };
  await answer({ stepId: 'drip-when', kind: 'choice', choiceId: 'after-stop' });
  await answer({ stepId: 'nozzle-temp', kind: 'reading', value: 200, unit: 'degC' });
  await answer({ stepId: 'finding-hot-melt', kind: 'finding-outcome', outcome });
  return walkId;
}

async function otherOrganisationSupport(): Promise<Agent> {
  const [org] = await t
    .db('organisations')
    .insert({ name: `Other works ${randomBytes(3).toString('hex')}` })
    .returning('id');
  const email = `other-${randomBytes(4).toString('hex')}@example.com`;
  await t.db('users').insert({ organisation_id: org.id, email, name: 'Other support', roles: ['support'], password_hash: await hashPassword(TEST_PASSWORD) });
  const agent = t.agent();
  await agent.post('/api/auth/login').send({ email, password: TEST_PASSWORD }).expect(200);
  return agent;
}

beforeAll(async () => {
  t = await startTestApp();
  const s = await t.signIn(['support']);
  support = s.agent;
  supportUser = s.user;
  guideId = await publishGuide();
});
afterAll(async () => t?.close());

describe('logging a call', () => {
  it('when support logs a call, then the case is new, unassigned, and its timeline starts with the call', async () => {
    const c = await logCall({ callerEmail: 'Hal.Brandt@Example.net', priority: 'high' });
    expect(c).toMatchObject({
      callerName: 'Hal Brandt',
      callerCompany: 'Ostwick Foods',
      callerEmail: 'hal.brandt@example.net',
      site: 'Ostwick plant 2',
      status: 'new',
      priority: 'high',
      assignee: null,
      canWork: true,
      allowedStatuses: ['in-progress', 'waiting', 'resolved', 'closed'],
    });
    expect(c.createdBy?.id).toBe(supportUser.id);
    expect(c.events.map((e) => e.kind)).toEqual(['created']);
    expect(c.events[0].text).toBe('Call logged: Glue drips after the valve closes');
    const again = await support.get(`/api/cases/${c.id}`);
    expect(again.status).toBe(200);
    expect(again.body.case.id).toBe(c.id);
  });

  it('when a case has no caller and no site, or a bad e-mail and phone, then 400 names each field and nothing is saved', async () => {
    const before = Number((await t.db('cases').count('* as n'))[0].n);
    const empty = await support.post('/api/cases').send({ symptom: 'Drips' });
    expect(empty.status).toBe(400);
    expect(empty.body.error.code).toBe('invalid_input');
    expect(Object.keys(empty.body.error.fields).sort()).toEqual(['callerName', 'site']);
    const bad = await support.post('/api/cases').send(call({ callerEmail: 'hal at ostwick', callerPhone: 'call me', symptom: '  ', priority: 'soonish' }));
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toMatchObject({ callerEmail: 'E-mail must look like name@example.com', symptom: 'Say what the caller sees' });
    expect(bad.body.error.fields.callerPhone).toMatch(/Phone must be digits/);
    expect(bad.body.error.fields.priority).toMatch(/Priority must be one of/);
    const ghost = await support.post('/api/cases').send(call({ assigneeId: 999999 }));
    expect(ghost.status).toBe(400);
    expect(ghost.body.error.fields.assigneeId).toBeTruthy();
    expect(Number((await t.db('cases').count('* as n'))[0].n)).toBe(before);
    expect(Number((await t.db('case_events').whereNotIn('case_id', t.db('cases').select('id')).count('* as n'))[0].n)).toBe(0);
  });

  it('when the call is about a registered valve, then the case is linked to it and takes its site and line', async () => {
    const [site] = await t.db('sites').insert({ organisation_id: t.organisationId, name: 'Brookfold dairy' }).returning('id');
    const [line] = await t.db('lines').insert({ organisation_id: t.organisationId, site_id: site.id, name: 'Cup line 1' }).returning('id');
    const [valve] = await t.db('applicators').insert({ organisation_id: t.organisationId, site_id: site.id, line_id: line.id, tag: 'CL1-V2', actuation: 'electric' }).returning('id');
    const res = await support.post('/api/cases').send({ callerName: 'Una Fell', applicatorId: valve.id, symptom: 'Dots too small' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.case).toMatchObject({
      site: 'Brookfold dairy',
      line: 'Cup line 1',
      applicator: 'CL1-V2',
      applicatorId: valve.id,
      registered: { id: valve.id, tag: 'CL1-V2', siteName: 'Brookfold dairy' },
    });
    const missing = await support.post('/api/cases').send({ callerName: 'Una Fell', applicatorId: 999999, symptom: 'Dots too small' });
    expect(missing.status).toBe(400);
    expect(missing.body.error.fields.applicatorId).toBeTruthy();
  });
});

describe('working a case', () => {
  it('when support notes, attaches, edits and moves the case through its statuses, then each step is on the timeline in order', async () => {
    const c = await logCall();
    const [file] = await t
      .db('files')
      .insert({
        id: randomUUID(),
        organisation_id: t.organisationId,
        kind: 'photo',
        mime: 'image/jpeg',
        original_name: 'nozzle.jpg',
        size: 1200,
        variants: JSON.stringify({ thumb: { key: 'x', mime: 'image/webp' } }),
      })
      .returning('id');
    const note = await support.post(`/api/cases/${c.id}/notes`).send({ text: 'Caller sends a photo of the nozzle', fileIds: [file.id] });
    expect(note.status).toBe(201);
    const noted = note.body.case.events.at(-1);
    expect(noted).toMatchObject({ kind: 'note', text: 'Caller sends a photo of the nozzle' });
    expect(noted.files).toEqual([{ id: file.id, kind: 'photo', originalName: 'nozzle.jpg', urls: { thumb: `/api/files/${file.id}/thumb` } }]);
    const missing = await support.post(`/api/cases/${c.id}/notes`).send({ text: 'x', fileIds: [randomUUID()] });
    expect(missing.status).toBe(400);
    expect(missing.body.error.fields.fileIds).toMatch(/Not found/);
    expect((await support.post(`/api/cases/${c.id}/notes`).send({ text: '  ' })).body.error.fields.text).toBe('Write a note or attach a file');

    const edited = await support.patch(`/api/cases/${c.id}`).send({ callerPhone: '+44 1632 960 999', priority: 'urgent' });
    expect(edited.status).toBe(200);
    expect(edited.body.case).toMatchObject({ callerPhone: '+44 1632 960 999', priority: 'urgent' });
    expect(edited.body.case.events.at(-1)).toMatchObject({ kind: 'edited', text: 'Changed phone, priority' });
    const noSite = await support.patch(`/api/cases/${c.id}`).send({ site: '' });
    expect(noSite.status).toBe(400);
    expect(noSite.body.error.fields.site).toBeTruthy();

    for (const status of ['waiting', 'in-progress', 'resolved', 'closed'] as const) {
      const res = await support.post(`/api/cases/${c.id}/status`).send({ status, note: status === 'waiting' ? 'Caller checks the heater setting' : undefined });
      expect(res.status, `${status}: ${JSON.stringify(res.body)}`).toBe(200);
      expect(res.body.case.status).toBe(status);
    }
    const closed = (await support.get(`/api/cases/${c.id}`)).body.case as CaseDetail;
    expect(closed.closedAt).toBeTruthy();
    expect(closed.allowedStatuses).toEqual(['in-progress']);
    expect(closed.events.filter((e) => e.kind === 'status').map((e) => `${e.fromStatus}>${e.toStatus}`)).toEqual(['new>waiting', 'waiting>in-progress', 'in-progress>resolved', 'resolved>closed']);
    expect(closed.events.find((e) => e.toStatus === 'waiting')?.text).toBe('Caller checks the heater setting');

    const wrong = await support.post(`/api/cases/${c.id}/status`).send({ status: 'resolved' });
    expect(wrong.status).toBe(409);
    expect(wrong.body.error.message).toBe('A case that is closed cannot become resolved');
    const handoff = await support.post(`/api/cases/${c.id}/status`).send({ status: 'handed-off' });
    expect(handoff.status).toBe(400);
    expect(handoff.body.error.fields.status).toMatch(/Hand off/);
    const reopened = await support.post(`/api/cases/${c.id}/status`).send({ status: 'in-progress' });
    expect(reopened.body.case).toMatchObject({ status: 'in-progress', closedAt: null, resolvedAt: null });
  });
});

describe('who sees and works which case', () => {
  it('when each role asks, then support and managers see all, authors and admins the handed-off ones, technicians theirs, and only the right people may change them', async () => {
    const tech = await t.signIn(['technician']);
    const otherTech = await t.signIn(['technician']);
    const author = await t.signIn(['author']);
    const otherAuthor = await t.signIn(['author']);
    const manager = await t.signIn(['manager']);
    const admin = await t.signIn(['admin']);

    const mine = await logCall({ assigneeId: tech.user.id, symptom: 'Assigned to a technician' });
    const handed = await logCall({ symptom: 'Handed to an author' });
    await support.post(`/api/cases/${handed.id}/handoff`).send({ assigneeId: author.user.id, note: 'Seen this before on line 3?' }).expect(200);
    const plain = await logCall({ symptom: 'Nobody else sees this' });
    const ids = (body: { cases: { id: number }[] }) => body.cases.map((c) => c.id);
    const seen = async (agent: Agent) => ids((await agent.get('/api/cases?pageSize=100').expect(200)).body);

    expect(await seen(support)).toEqual(expect.arrayContaining([mine.id, handed.id, plain.id]));
    expect(await seen(manager.agent)).toEqual(expect.arrayContaining([mine.id, handed.id, plain.id]));
    expect(await seen(tech.agent)).toEqual([mine.id]);
    expect(await seen(otherTech.agent)).toEqual([]);
    expect(await seen(author.agent)).toEqual([handed.id]);
    expect(await seen(otherAuthor.agent)).toEqual([handed.id]);
    expect(await seen(admin.agent)).toEqual([handed.id]);

    expect((await tech.agent.get(`/api/cases/${plain.id}`)).status).toBe(404);
    expect((await author.agent.get(`/api/cases/${mine.id}`)).status).toBe(404);
    expect((await admin.agent.get(`/api/cases/${handed.id}`)).status).toBe(200);

    // The person a case is assigned to works on it; others who may only read it cannot.
    expect((await tech.agent.post(`/api/cases/${mine.id}/notes`).send({ text: 'On site tomorrow' })).status).toBe(201);
    expect((await tech.agent.post(`/api/cases/${mine.id}/status`).send({ status: 'resolved' })).body.case.status).toBe('resolved');
    expect((await author.agent.post(`/api/cases/${handed.id}/notes`).send({ text: 'Check the heater controller' })).status).toBe(201);
    const notAssigned = await otherAuthor.agent.post(`/api/cases/${handed.id}/notes`).send({ text: 'Me too' });
    expect(notAssigned.status).toBe(403);
    expect((await manager.agent.post(`/api/cases/${handed.id}/status`).send({ status: 'closed' })).status).toBe(403);
    expect((await manager.agent.post('/api/cases').send(call())).status).toBe(403);
    expect((await tech.agent.patch(`/api/cases/${mine.id}`).send({ priority: 'low' })).status).toBe(403);
    const detail = (await author.agent.get(`/api/cases/${handed.id}`)).body.case as CaseDetail;
    expect(detail).toMatchObject({ canWork: false, canNote: true, canChangeStatus: true });
    const readOnly = (await otherAuthor.agent.get(`/api/cases/${handed.id}`)).body.case as CaseDetail;
    expect(readOnly).toMatchObject({ canWork: false, canNote: false, allowedStatuses: [] });

    const stranger = await otherOrganisationSupport();
    expect(ids((await stranger.get('/api/cases')).body)).toEqual([]);
    expect((await stranger.get(`/api/cases/${plain.id}`)).status).toBe(404);
    expect((await stranger.post(`/api/cases/${plain.id}/notes`).send({ text: 'hello' })).status).toBe(404);
  });
});

describe('walking a guide with the caller and handing off', () => {
  it('when support walks the guide for the caller to "not fixed" and hands off, then the author gets an e-mail with the walk and a notice, and sees the case', async () => {
    const author = await t.signIn(['author', 'technician']);
    const c = await logCall();
    const walkId = await walkToHotMelt(support, 'not-fixed');
    expect((await support.get(`/api/walks/${walkId}`).expect(200)).body.walk.caseId).toBeNull();
    const linked = await support.post(`/api/cases/${c.id}/walks`).send({ walkId });
    expect(linked.status).toBe(201);
    // The runner's end screen leads back to the case.
    expect((await support.get(`/api/walks/${walkId}`).expect(200)).body.walk.caseId).toBe(c.id);
    expect(linked.body.case.status).toBe('in-progress');
    expect(linked.body.case.walks).toEqual([
      expect.objectContaining({ id: walkId, status: 'ended', endKind: 'finding', outcome: 'not-fixed', stepTitle: 'Hot melt expanding in an overheated nozzle' }),
    ]);
    expect((await support.post(`/api/cases/${c.id}/walks`).send({ walkId })).status).toBe(201);
    const other = await logCall();
    const taken = await support.post(`/api/cases/${other.id}/walks`).send({ walkId });
    expect(taken.status).toBe(409);
    expect(taken.body.error.fields.walkId).toBe(`Already linked to case ${c.id}`);

    const tech = await t.signIn(['support']);
    const notAuthor = await support.post(`/api/cases/${c.id}/handoff`).send({ assigneeId: tech.user.id, walkId, note: 'x' });
    expect(notAuthor.status).toBe(400);
    expect(notAuthor.body.error.fields.assigneeId).toMatch(/author or technician/);
    expect((await support.post(`/api/cases/${c.id}/handoff`).send({ assigneeId: author.user.id, walkId })).body.error.fields.note).toBeTruthy();

    const res = await support.post(`/api/cases/${c.id}/handoff`).send({ assigneeId: author.user.id, walkId, note: 'Nozzle at 200 °C, new setting did not help. Please call Hal.' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const handed = res.body.case as CaseDetail;
    expect(handed).toMatchObject({ status: 'handed-off', assignee: { id: author.user.id } });
    expect(handed.handedOffAt).toBeTruthy();
    expect(handed.events.slice(-2).map((e) => e.kind)).toEqual(['handoff', 'email']);
    expect(handed.events.at(-2)).toMatchObject({ kind: 'handoff', assignee: { id: author.user.id }, walk: { id: walkId }, fromStatus: 'in-progress', toStatus: 'handed-off' });

    const mail = await t.waitForMail((m) => m.to.includes(author.user.email));
    expect(mail.subject).toBe(`Case ${c.id} handed to you: Glue drips after the valve closes`);
    expect(mail.text).toContain('Nozzle at 200 °C, new setting did not help. Please call Hal.');
    expect(mail.text).toContain('Caller: Hal Brandt (Ostwick Foods)');
    expect(mail.text).toContain('Reached the finding “Hot melt expanding in an overheated nozzle”; not fixed.');
    expect(mail.text).toContain('Measure the nozzle temperature with a contact thermometer (Measure): Nozzle temperature: 200 °C → Above 185 °C');
    expect(mail.text).toContain(`${t.url}/cases/${c.id}`);
    expect(mail.html).toContain(`href="${t.url}/cases/${c.id}"`);

    const notices = await author.agent.get('/api/notices');
    expect(notices.body.unread).toBe(1);
    expect(notices.body.notices[0]).toMatchObject({ kind: 'handoff', caseId: c.id, title: `Case ${c.id} handed to you by Test support` });
    await author.agent.post(`/api/notices/${notices.body.notices[0].id}/read`).send({}).expect(204);
    expect((await author.agent.get('/api/notices')).body.unread).toBe(0);
    expect((await support.post(`/api/notices/${notices.body.notices[0].id}/read`).send({})).status).toBe(404);

    const list = await author.agent.get('/api/cases?assignee=me');
    expect(list.body.cases.map((x: { id: number }) => x.id)).toEqual([c.id]);
    // The timeline shows the message's delivery as the queue reports it.
    let event: CaseDetail['events'][number] | undefined;
    for (let i = 0; i < 50 && event?.mail?.status !== 'sent'; i++) {
      if (i) await new Promise((r) => setTimeout(r, 100));
      event = ((await support.get(`/api/cases/${c.id}`)).body.case as CaseDetail).events.find((e) => e.kind === 'email');
    }
    expect(event?.mail).toMatchObject({ to: author.user.email, status: 'sent' });
  });

  it('when support sends the caller the summary of a walk that found the cause, then the message holds the path, the finding, the remedy and its cautions in text and HTML', async () => {
    const c = await logCall();
    const walkId = await walkToHotMelt(support, 'fixed');
    await support.post(`/api/cases/${c.id}/walks`).send({ walkId }).expect(201);

    const preview = await support.get(`/api/cases/${c.id}/summary`);
    expect(preview.status).toBe(200);
    expect(preview.body.preview).toMatchObject({ to: 'hal.brandt@example.net', walkId });

    const res = await support.post(`/api/cases/${c.id}/summary`).send({ note: 'Thanks for your patience on the phone.' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const mail = await t.waitForMail((m) => m.to.includes('hal.brandt@example.net'));
    expect(mail.subject).toBe(`Case ${c.id}: summary of your call about Glue drips after the valve closes`);
    const text = mail.text!;
    expect(text).toContain('Hello Hal Brandt,');
    expect(text).toContain('Thanks for your patience on the phone.');
    expect(text).toContain('1. When does fluid come out of the nozzle after the valve closes?: Mostly after the line stops, while the valve stays hot');
    expect(text).toContain('2. Measure the nozzle temperature with a contact thermometer: Nozzle temperature: 200 °C → Above 185 °C');
    expect(text).toContain('Hot melt expanding in an overheated nozzle. The nozzle runs hotter than the adhesive needs');
    expect(text).toContain('You told us this fixed it.');
    expect(text).toContain("1. Set the valve and nozzle temperature to the adhesive's data sheet value.");
    expect(text).toContain("Your site's rules, lockout procedure and the valve maker's manual come before this summary");
    const hot = SAMPLE_GUIDE.steps.find((s) => s.id === 'nozzle-temp')!.cautions[0];
    expect(text).toContain(hot.text);
    expect(mail.html).toContain('Hot melt expanding in an overheated nozzle');
    expect(mail.html).toContain('Before anyone works on the valve');
    expect(mail.html).toContain('&#39;s data sheet value.');
    expect(mail.raw).toMatch(/^Reply-To: .*$/m);
    expect(mail.raw).toContain(supportUser.email);

    const noMail = await logCall({ callerEmail: null });
    const refused = await support.post(`/api/cases/${noMail.id}/summary`).send({});
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields.to).toBeTruthy();
    const typed = await support.post(`/api/cases/${noMail.id}/summary`).send({ to: 'gwen.ash@example.net' });
    expect(typed.status).toBe(201);
    expect(typed.body.case.callerEmail).toBe('gwen.ash@example.net');
    const walkless = await t.waitForMail((m) => m.to.includes('gwen.ash@example.net'));
    expect(walkless.text).toContain('Before anyone works on the valve');
  });
});

describe('the case queue', () => {
  it('when support filters, sorts and pages, then the server answers the right slice with counts per status', async () => {
    const q = await startTestApp();
    try {
      const desk = (await q.signIn(['support'])).agent;
      const tech = await q.signIn(['technician']);
      const make = async (body: Record<string, unknown>) => (await desk.post('/api/cases').send(call(body)).expect(201)).body.case as CaseDetail;
      const a = await make({ site: 'Alder works', priority: 'low' });
      const b = await make({ site: 'Birch mill', priority: 'urgent', assigneeId: tech.user.id });
      const c = await make({ site: 'Alder annex', priority: 'high' });
      const d = await make({ site: 'Cedar yard' });
      await desk.post(`/api/cases/${d.id}/status`).send({ status: 'resolved' }).expect(200);
      await q
        .db('cases')
        .where({ id: a.id })
        .update({ created_at: q.db.raw(`now() - interval '10 days'`) });

      const get = async (qs: string) => {
        const res = await desk.get(`/api/cases?${qs}`);
        expect(res.status, JSON.stringify(res.body)).toBe(200);
        return res.body as { cases: { id: number }[]; total: number; counts: Record<string, number> };
      };
      const ids = (r: { cases: { id: number }[] }) => r.cases.map((x) => x.id);
      const oldestFirst = await get('status=open');
      expect(ids(oldestFirst)).toEqual([a.id, b.id, c.id]);
      expect(oldestFirst.counts).toEqual({ new: 3, 'in-progress': 0, waiting: 0, 'handed-off': 0, resolved: 1, closed: 0 });
      expect(ids(await get('site=alder'))).toEqual([a.id, c.id]);
      expect(ids(await get(`assignee=${tech.user.id}`))).toEqual([b.id]);
      expect(ids(await get('assignee=none&status=new'))).toEqual([a.id, c.id]);
      expect(ids(await get('age=over-week'))).toEqual([a.id]);
      expect(ids(await get('age=week'))).toEqual([b.id, c.id, d.id]);
      expect(ids(await get('sort=priority&dir=desc'))).toEqual([b.id, c.id, d.id, a.id]);
      const page2 = await get('sort=created&dir=desc&pageSize=2&page=2');
      expect(ids(page2)).toEqual([b.id, a.id]);
      expect(page2.total).toBe(4);
      expect(ids(await get('q=birch'))).toEqual([b.id]);

      const bad = await desk.get('/api/cases?status=lost&pageSize=500&sort=colour');
      expect(bad.status).toBe(400);
      expect(Object.keys(bad.body.error.fields).sort()).toEqual(['pageSize', 'sort', 'status']);
    } finally {
      await q.close();
    }
  });
});
