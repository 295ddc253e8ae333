// Walks over HTTP on the demo guide: full walks to each kind of end, cautions before answers,
// retries stored once, refused answers leaving the log as it was, Back, readings and their units,
// who may answer, view and flag, organisation scoping, notes, abandon, summary and ETag polling.
import { randomBytes, randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../../src/shared/guides/sample';
import type { GuideContent } from '../../src/shared/guides/schema';
import type { WalkDetail } from '../../src/shared/schemas/walks';
import type { WalkState } from '../../src/shared/walks/walk-path';
import { hashPassword } from '../../server/lib/passwords';
import { startTestApp, TEST_PASSWORD, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let tech: Agent;
let techId: number;
let colleague: Agent;
let support: Agent;
let manager: Agent;
let guideId: number;

/** A guide as the guides module would leave it once published: a guide row and its published version. */
async function publishGuide(opts: { organisationId?: number; status?: 'active' | 'retired'; published?: boolean; content?: GuideContent } = {}) {
  return t.db.transaction(async (trx) => {
    const [guide] = await trx('guides')
      .insert({ organisation_id: opts.organisationId ?? t.organisationId, status: opts.status ?? 'active', retired_at: opts.status === 'retired' ? trx.fn.now() : null })
      .returning('id');
    const published = opts.published ?? true;
    const [version] = await trx('guide_versions')
      .insert({
        guide_id: guide.id,
        number: 1,
        state: published ? 'published' : 'draft',
        title: SAMPLE_GUIDE_META.title,
        symptom: SAMPLE_GUIDE_META.symptom,
        summary: SAMPLE_GUIDE_META.summary ?? '',
        tags: SAMPLE_GUIDE_META.tags,
        content: JSON.stringify(opts.content ?? SAMPLE_GUIDE),
        published_at: published ? trx.fn.now() : null,
      })
      .returning('id');
    await trx('guides')
      .where({ id: guide.id })
      .update(published ? { published_version_id: version.id } : { draft_version_id: version.id });
    return { guideId: guide.id as number, versionId: version.id as number };
  });
}

async function otherOrganisation(roles: string[]) {
  const [org] = await t
    .db('organisations')
    .insert({ name: `Other works ${randomBytes(3).toString('hex')}` })
    .returning('id');
  const email = `other-${randomBytes(4).toString('hex')}@example.com`;
  const [user] = await t
    .db('users')
    .insert({ organisation_id: org.id, email, name: 'Other organisation user', roles, password_hash: await hashPassword(TEST_PASSWORD) })
    .returning('id');
  const agent = t.agent();
  await agent.post('/api/auth/login').send({ email, password: TEST_PASSWORD }).expect(200);
  return { agent, organisationId: org.id as number, userId: user.id as number };
}

type Draft = { stepId: string } & Record<string, unknown>;
const choose = (stepId: string, choiceId: string): Draft => ({ stepId, kind: 'choice', choiceId });
const read = (stepId: string, value: number, unit: string, extra: Record<string, unknown> = {}): Draft => ({ stepId, kind: 'reading', value, unit, ...extra });
const tried = (stepId: string, fixed: boolean): Draft => ({ stepId, kind: 'try', fixed });
const coilAt20C = { calculatorInputs: { measuredAt: { value: 20, unit: 'degC' } } };

/** The phone runner's part: make entries with fresh ids, acknowledge cautions, answer. */
class Runner {
  state: WalkState;
  readonly sent: Record<string, unknown>[] = [];
  constructor(
    readonly agent: Agent,
    readonly walkId: number,
    state: WalkState,
  ) {
    this.state = state;
  }

  entry(draft: Draft): Record<string, unknown> {
    return { id: `ans-${randomUUID()}`, answeredAt: new Date().toISOString(), ...draft };
  }

  post(body: unknown) {
    return this.agent.post(`/api/walks/${this.walkId}/answers`).send(body as object);
  }

  async give(draft: Draft) {
    const body = this.entry(draft);
    const res = await this.post(body);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.duplicate).toBe(false);
    this.sent.push(body);
    this.state = res.body.state;
    return res.body;
  }

  /** Acknowledges the step's cautions first, as the runner must, then answers. */
  async answer(draft: Draft) {
    if (this.state.unacknowledged.length > 0) await this.give({ stepId: this.state.at!, kind: 'acknowledge', cautionIds: this.state.unacknowledged });
    return this.give(draft);
  }
}

async function start(agent: Agent = tech, body: Record<string, unknown> = {}): Promise<{ walk: WalkDetail; run: Runner }> {
  const res = await agent.post('/api/walks').send({ guideId, ...body });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return { walk: res.body.walk, run: new Runner(agent, res.body.walk.id, res.body.walk.state) };
}

const pathOf = (state: WalkState) => state.path.map((p) => p.stepId);
const storedCount = async (walkId: number) => Number((await t.db('walk_answers').where({ walk_id: walkId }).count('* as n'))[0].n);

beforeAll(async () => {
  t = await startTestApp();
  const signedIn = await t.signIn(['technician']);
  tech = signedIn.agent;
  techId = signedIn.user.id;
  colleague = (await t.signIn(['technician'])).agent;
  support = (await t.signIn(['support'])).agent;
  manager = (await t.signIn(['manager'])).agent;
  guideId = (await publishGuide()).guideId;
});
afterAll(async () => t?.close());

describe('starting a walk', () => {
  it('when a technician starts a walk with a site and line, then it is open at the start step and pins the published version', async () => {
    const { versionId, guideId: id } = await publishGuide();
    const res = await tech.post('/api/walks').send({ guideId: id, site: ' Plant 2 ', line: 'Carton line 4', applicator: '' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const walk: WalkDetail = res.body.walk;
    expect(walk).toMatchObject({
      guideId: id,
      guideVersionId: versionId,
      userId: techId,
      site: 'Plant 2',
      line: 'Carton line 4',
      applicator: null,
      status: 'open',
      currentStepId: 'drip-when',
      answerCount: 0,
      canAnswer: true,
      answers: [],
    });
    expect(walk.guide).toMatchObject({ versionId, versionNumber: 1, title: SAMPLE_GUIDE_META.title, symptom: SAMPLE_GUIDE_META.symptom });
    expect(walk.guide.content.startStepId).toBe('drip-when');
    expect(walk.state).toMatchObject({ current: 'drip-when', at: 'drip-when', ended: null });
    expect(walk.userName).toBeTruthy();

    // A new published version later does not move the walk.
    const [v2] = await t
      .db('guide_versions')
      .insert({ guide_id: id, number: 2, state: 'published', title: 'Renamed guide', symptom: 'x', content: JSON.stringify(SAMPLE_GUIDE) })
      .returning('id');
    await t.db('guides').where({ id }).update({ published_version_id: v2.id });
    const again = await tech.get(`/api/walks/${walk.id}`);
    expect(again.body.walk.guide).toMatchObject({ versionId, title: SAMPLE_GUIDE_META.title });
  });

  it('when the guide is retired, unpublished, missing or from another organisation, then no walk starts', async () => {
    const retired = await publishGuide({ status: 'retired' });
    const r1 = await tech.post('/api/walks').send({ guideId: retired.guideId });
    expect(r1.status).toBe(409);
    expect(r1.body.error.message).toMatch(/retired/);
    expect(r1.body.error.fields.guideId).toBeTruthy();

    const draft = await publishGuide({ published: false });
    const r2 = await tech.post('/api/walks').send({ guideId: draft.guideId });
    expect(r2.status).toBe(404);
    expect(r2.body.error.message).toMatch(/no published version/);

    expect((await tech.post('/api/walks').send({ guideId: 999999 })).status).toBe(404);
    const other = await otherOrganisation(['author']);
    const foreign = await publishGuide({ organisationId: other.organisationId });
    expect((await tech.post('/api/walks').send({ guideId: foreign.guideId })).status).toBe(404);
    expect(await t.db('walks').whereIn('guide_id', [retired.guideId, draft.guideId, foreign.guideId]).count('* as n')).toEqual([{ n: '0' }]);
  });

  it('when the start request is not valid, then 400 names the field', async () => {
    const noGuide = await tech.post('/api/walks').send({});
    expect(noGuide.status).toBe(400);
    expect(noGuide.body.error.fields.guideId).toBeTruthy();
    const longSite = await tech.post('/api/walks').send({ guideId, site: 'x'.repeat(121) });
    expect(longSite.status).toBe(400);
    expect(longSite.body.error.fields.site).toMatch(/120/);
    const badKey = await tech.post('/api/walks').send({ guideId, clientId: 'short' });
    expect(badKey.body.error.fields.clientId).toBeTruthy();
  });

  it('when a start with a client id is retried, then the walk the first one made comes back and no second walk exists', async () => {
    const clientId = `start-${randomUUID()}`;
    const first = await tech.post('/api/walks').send({ guideId, line: 'Retry line', clientId });
    expect(first.status).toBe(201);
    const second = await tech.post('/api/walks').send({ guideId, line: 'Retry line', clientId });
    expect(second.status).toBe(200);
    expect(second.body).toMatchObject({ created: false, walk: { id: first.body.walk.id } });
    expect(await t.db('walks').where({ user_id: techId, line: 'Retry line' }).count('* as n')).toEqual([{ n: '1' }]);
  });

  it('when a manager, who does not run walks, tries to start one, then 403', async () => {
    expect((await manager.post('/api/walks').send({ guideId })).status).toBe(403);
  });
});

describe('full walks along the demo guide', () => {
  it('when the coil reads low through its calculator, then the walk ends at the coil finding marked fixed and the record equals the path taken', async () => {
    const { run } = await start(tech, { site: 'Plant 1', line: 'L3', applicator: 'Valve 7' });
    await run.answer(choose('drip-when', 'after-each-shot'));
    await run.answer(read('fluid-pressure', 58, 'psi')); // 4.0 bar: at or below the limit
    expect(run.state.at).toBe('purge-air');
    expect(run.state.unacknowledged).toEqual(['injection', 'solvent']);
    await run.answer(tried('purge-air', false));
    await run.answer(read('off-voltage', 0.3, 'V'));
    expect(run.state.unacknowledged).toEqual(['lock-out']);
    // 25 Ω against 28.8 Ω nominal at 20 °C: −13.19 %, more than 10 % low.
    const deviation = ((25 - 28.8) / 28.8) * 100;
    const measured = await run.answer(read('coil-resistance', 25, 'ohm', { ...coilAt20C, computed: { value: deviation, unit: '%' } }));
    expect(measured.state.at).toBe('finding-coil-shorted');
    expect(measured.walk.status).toBe('open'); // a finding waits for its outcome
    const coilStep = measured.state.path.find((p: { stepId: string }) => p.stepId === 'coil-resistance');
    expect(coilStep.route.bandId).toBe('low');
    expect(coilStep.route.computed.unit).toBe('%');
    expect(coilStep.route.computed.value).toBeCloseTo(deviation, 6);

    const done = await run.answer({ stepId: 'finding-coil-shorted', kind: 'finding-outcome', outcome: 'fixed', note: 'Fitted a new coil BP-COIL-24.' });
    expect(done.walk).toMatchObject({
      status: 'ended',
      endKind: 'finding',
      outcome: 'fixed',
      causeCode: 'coil-shorted',
      endedAtStepId: 'finding-coil-shorted',
      outcomeNote: 'Fitted a new coil BP-COIL-24.',
    });
    expect(done.walk.endedAt).toBeTruthy();

    const stored: WalkDetail = (await tech.get(`/api/walks/${run.walkId}`)).body.walk;
    expect(pathOf(stored.state)).toEqual(['drip-when', 'fluid-pressure', 'purge-air', 'off-voltage', 'coil-resistance', 'finding-coil-shorted']);
    expect(stored.state.ended).toBe('finding');
    expect(stored.answers.map((a) => a.id)).toEqual(run.sent.map((e) => e.id));
    expect(stored.answers.map((a) => a.seq)).toEqual(run.sent.map((_, i) => i + 1));
    expect(stored.answers.filter((a) => a.kind === 'acknowledge').map((a) => a.stepId)).toEqual(['purge-air', 'off-voltage', 'coil-resistance']);
    expect(stored.answerCount).toBe(run.sent.length);
    expect(stored.canAnswer).toBe(false);
    expect((await t.db('walks').where({ id: run.walkId }).first()).current_step_id).toBe('finding-coil-shorted');

    const summary = (await tech.get(`/api/walks/${run.walkId}/summary`)).body.summary;
    expect(summary.steps.map((s: { stepId: string }) => s.stepId)).toEqual(pathOf(stored.state));
    expect(summary.steps[0].answer).toBe('A drop forms right after every shot, then stops');
    expect(summary.steps[1].answer).toMatch(/58 psi \(3\.99\d* bar\) → At or below the 5\.5 bar limit/);
    expect(summary.steps[2]).toMatchObject({ kind: 'try', answer: 'Not fixed' });
    expect(summary.steps[2].cautions.map((c: { acknowledgedAt: string | null }) => Boolean(c.acknowledgedAt))).toEqual([true, true]);
    expect(summary.steps[4].reading).toMatchObject({ value: 25, unit: 'ohm', bandId: 'low', bandLabel: 'More than 10 % below nominal' });
    expect(summary.steps[4].reading.calculator).toMatchObject({ id: 'coil-check', title: 'Coil check', output: 'deviation' });
    expect(summary.steps[4].answer).toMatch(/25 Ω; Coil check with coil temperature at measurement 20 °C: deviation from nominal -13\.19\d* % → More than 10 % below nominal/);
    expect(summary.steps[5].answer).toBe('Fixed: Fitted a new coil BP-COIL-24.');
    expect(summary).toMatchObject({
      outcome: 'fixed',
      outcomeLabel: 'Fixed',
      causeCode: 'coil-shorted',
      causeLabel: 'Coil shorted turns',
      site: 'Plant 1',
      line: 'L3',
      applicator: 'Valve 7',
      handoffText: null,
    });
    expect(summary.text).toContain('Cautions acknowledged:');
    expect(summary.text).toContain('Check the coil resistance against its nominal value (Measure)');
  });

  it('when the coil is in tolerance and a new spring does not help, then the walk ends at the hand-off with a message to paste', async () => {
    const { run } = await start(tech, { line: 'Line 9' });
    await run.answer(choose('drip-when', 'after-each-shot'));
    await run.answer(read('fluid-pressure', 4, 'bar'));
    await run.answer(tried('purge-air', false));
    await run.answer(read('off-voltage', 0.3, 'V'));
    await run.answer(read('coil-resistance', 28.1, 'ohm', coilAt20C));
    const end = await run.answer(tried('spring-try', false));
    expect(end.walk).toMatchObject({ status: 'ended', endKind: 'handoff', outcome: null, endedAtStepId: 'handoff-engineer' });
    expect(end.state.ended).toBe('handoff');

    const summary = (await support.get(`/api/walks/${run.walkId}/summary`)).body.summary;
    expect(summary.steps.at(-1)).toMatchObject({ stepId: 'handoff-engineer', kind: 'handoff', answer: 'Hand-off: call The senior technician or application engineer on call' });
    const text: string = summary.handoffText;
    expect(text).toContain('Call: The senior technician or application engineer on call');
    expect(text).toContain('What to tell them: Tell them the valve still drips');
    expect(text).toContain('Line: Line 9');
    expect(text).toContain('Path so far:');
    expect(text).toContain('1. When does fluid come out of the nozzle after the valve closes? (Ask): A drop forms right after every shot, then stops');
    expect(text).toContain('Fit a new closing spring (Try): Not fixed');
    expect(text).toMatch(/28\.1 Ω; Coil check .*→ Within 10 % of nominal/);
  });

  it('when something else fixed it, then the outcome keeps the cause code from the list and a made-up code is refused', async () => {
    const { run } = await start();
    await run.answer(choose('drip-when', 'between-shots'));
    expect(run.state.unacknowledged).toEqual(['lock-out', 'relieve-pressure', 'solvent']);
    await run.answer(tried('clean-seat', true));
    expect(run.state.at).toBe('finding-seat-debris');

    const made = await run.post(run.entry({ stepId: 'finding-seat-debris', kind: 'finding-outcome', outcome: 'fixed-by-other', note: 'Changed the filter', causeCode: 'gremlins' }));
    expect(made.status).toBe(400);
    expect(made.body.error.fields.causeCode).toMatch(/not in the organisation's list/);
    const noNote = await run.post(run.entry({ stepId: 'finding-seat-debris', kind: 'finding-outcome', outcome: 'fixed-by-other', causeCode: 'filter-blocked' }));
    expect(noNote.status).toBe(400);
    expect(noNote.body.error.fields.note).toBeTruthy();

    const done = await run.answer({ stepId: 'finding-seat-debris', kind: 'finding-outcome', outcome: 'fixed-by-other', note: 'The filter was blocked; changed it.', causeCode: 'filter-blocked' });
    expect(done.walk).toMatchObject({ status: 'ended', endKind: 'finding', outcome: 'fixed-by-other', causeCode: 'filter-blocked', outcomeNote: 'The filter was blocked; changed it.' });
    const summary = (await tech.get(`/api/walks/${run.walkId}/summary`)).body.summary;
    expect(summary).toMatchObject({ outcomeLabel: 'Fixed by something else', causeLabel: 'Filter blocked' });
    expect(summary.steps.at(-1).answer).toBe('Fixed by something else (cause: Filter blocked): The filter was blocked; changed it.');
  });

  it('when the organisation keeps its own list of causes, then only its active causes are accepted', async () => {
    const other = await otherOrganisation(['technician']);
    await t.db('causes').insert([
      { organisation_id: other.organisationId, code: 'glue-skinned', label: 'Glue skinned over in the tank', active: true },
      { organisation_id: other.organisationId, code: 'filter-blocked', label: 'Filter blocked', active: false },
    ]);
    const own = await publishGuide({ organisationId: other.organisationId });
    const started = await other.agent.post('/api/walks').send({ guideId: own.guideId });
    const run = new Runner(other.agent, started.body.walk.id, started.body.walk.state);
    await run.answer(choose('drip-when', 'between-shots'));
    await run.answer(tried('clean-seat', true));
    const inactive = await run.post(run.entry({ stepId: 'finding-seat-debris', kind: 'finding-outcome', outcome: 'fixed-by-other', note: 'Filter', causeCode: 'filter-blocked' }));
    expect(inactive.status).toBe(400);
    expect(inactive.body.error.fields.causeCode).toBeTruthy();
    const done = await run.give({ stepId: 'finding-seat-debris', kind: 'finding-outcome', outcome: 'fixed-by-other', note: 'Skin in the tank', causeCode: 'glue-skinned' });
    expect(done.walk.causeCode).toBe('glue-skinned');
    expect((await other.agent.get(`/api/walks/${run.walkId}/summary`)).body.summary.causeLabel).toBe('Glue skinned over in the tank');
  });

  it('when a shorter nozzle fixes a hot-melt drool, then the walk ends fixed at that Try', async () => {
    const { run } = await start();
    await run.answer(choose('drip-when', 'after-stop'));
    expect(run.state.unacknowledged).toEqual(['hot-valve']);
    await run.answer(read('nozzle-temp', 360, 'degF'));
    const done = await run.answer(tried('short-nozzle', true));
    expect(done.walk).toMatchObject({ status: 'ended', endKind: 'fixed-by-try', outcome: 'fixed', causeCode: null, endedAtStepId: 'short-nozzle' });
    expect(pathOf(done.state)).toEqual(['drip-when', 'nozzle-temp', 'short-nozzle']);
  });
});

describe('answers the walk must refuse', () => {
  it('when an answer is sent again with the same id, then it is stored once and the retry answers 200 duplicate', async () => {
    const { run } = await start();
    const entry = run.entry(choose('drip-when', 'between-shots'));
    const first = await run.post(entry);
    expect(first.status).toBe(201);
    expect(first.body.duplicate).toBe(false);
    const retry = await run.post({ ...entry, answeredAt: new Date(Date.now() + 5000).toISOString() });
    expect(retry.status).toBe(200);
    expect(retry.body.duplicate).toBe(true);
    expect(retry.body.state).toEqual(first.body.state);
    expect(retry.body.walk.answerCount).toBe(1);
    expect(await storedCount(run.walkId)).toBe(1);
  });

  it('when the same id comes with a different answer, then 409 names the id and nothing changes', async () => {
    const { run } = await start();
    const entry = run.entry(choose('drip-when', 'between-shots'));
    await run.post(entry).expect(201);
    const reused = await run.post({ ...entry, choiceId: 'after-stop' });
    expect(reused.status).toBe(409);
    expect(reused.body.error.fields.id).toBeTruthy();
    expect(reused.body.error.message).toMatch(/already used for a different answer/);
    expect(await storedCount(run.walkId)).toBe(1);
    expect((await tech.get(`/api/walks/${run.walkId}`)).body.walk.state.at).toBe('clean-seat');
  });

  it('when a step that is not on the current path is answered, then it is refused and the log is unchanged', async () => {
    const { run } = await start();
    await run.answer(choose('drip-when', 'after-each-shot'));
    const before = (await tech.get(`/api/walks/${run.walkId}`)).body.walk;
    const ahead = await run.post(run.entry(choose('seat-inspect', 'seat-ring')));
    expect(ahead.status).toBe(409);
    expect(ahead.body.error.message).toMatch(/not on the walk's current path/);
    expect(ahead.body.error.fields.stepId).toBeTruthy();
    expect(ahead.body.error.details).toMatchObject({ reason: 'not-on-path', stepId: 'seat-inspect' });
    const answered = await run.post(run.entry(choose('drip-when', 'between-shots')));
    expect(answered.status).toBe(409);
    expect(answered.body.error.message).toMatch(/already answered; go back/);
    const unknown = await run.post(run.entry(read('no-such-step', 1, 'bar')));
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields.stepId).toBeTruthy();
    const after = (await tech.get(`/api/walks/${run.walkId}`)).body.walk;
    expect(after.answers).toEqual(before.answers);
    expect(after.answerCount).toBe(before.answerCount);
  });

  it('when a step with cautions is answered before they are acknowledged, then it is refused until they are', async () => {
    const { run } = await start();
    await run.answer(choose('drip-when', 'between-shots'));
    const early = await run.post(run.entry(tried('clean-seat', true)));
    expect(early.status).toBe(409);
    expect(early.body.error.message).toMatch(/Acknowledge the cautions/);
    expect(early.body.error.details).toMatchObject({ reason: 'cautions-unacknowledged', unacknowledged: ['lock-out', 'relieve-pressure', 'solvent'] });
    expect(await storedCount(run.walkId)).toBe(1);

    await run.give({ stepId: 'clean-seat', kind: 'acknowledge', cautionIds: ['lock-out'] });
    expect((await run.post(run.entry(tried('clean-seat', true)))).status).toBe(409);
    const wrongCaution = await run.post(run.entry({ stepId: 'clean-seat', kind: 'acknowledge', cautionIds: ['hot-valve'] }));
    expect(wrongCaution.status).toBe(400);
    expect(wrongCaution.body.error.fields.cautionIds).toBeTruthy();
    await run.give({ stepId: 'clean-seat', kind: 'acknowledge', cautionIds: ['relieve-pressure', 'solvent'] });
    await run.give(tried('clean-seat', false));
    expect(run.state.at).toBe('seat-inspect');
  });

  it('when the technician goes back and answers differently, then the path changes and the earlier answers stay in the log', async () => {
    const { run } = await start();
    await run.answer(choose('drip-when', 'after-each-shot'));
    await run.answer(read('fluid-pressure', 4, 'bar'));
    expect(run.state.at).toBe('purge-air');

    await run.give({ stepId: 'drip-when', kind: 'back' });
    expect(run.state).toMatchObject({ current: 'drip-when', previousAnswer: { kind: 'choice', choiceId: 'after-each-shot' } });
    // The same answer again brings the later answers straight back.
    await run.give(choose('drip-when', 'after-each-shot'));
    expect(pathOf(run.state)).toEqual(['drip-when', 'fluid-pressure', 'purge-air']);

    await run.give({ stepId: 'drip-when', kind: 'back' });
    await run.give(choose('drip-when', 'between-shots'));
    const walk: WalkDetail = (await tech.get(`/api/walks/${run.walkId}`)).body.walk;
    expect(pathOf(walk.state)).toEqual(['drip-when', 'clean-seat']);
    expect(walk.currentStepId).toBe('clean-seat');
    expect(walk.answers.map((a) => a.kind)).toEqual(['choice', 'reading', 'back', 'choice', 'back', 'choice']);
    const back = await run.post(run.entry({ stepId: 'fluid-pressure', kind: 'back' }));
    expect(back.status).toBe(409);
    expect(back.body.error.message).toMatch(/not on the walk's current path/);
  });

  it('when a reading has the wrong unit or is physically impossible, then 400 names the field', async () => {
    const { run } = await start();
    await run.answer(choose('drip-when', 'after-each-shot'));
    const wrongUnit = await run.post(run.entry(read('fluid-pressure', 4, 'degC')));
    expect(wrongUnit.status).toBe(400);
    expect(wrongUnit.body.error.fields.unit).toMatch(/temperature unit; this step needs a pressure/);
    const vacuum = await run.post(run.entry(read('fluid-pressure', -2, 'bar')));
    expect(vacuum.status).toBe(400);
    expect(vacuum.body.error.fields.value).toMatch(/below a full vacuum/);
    const notNumber = await run.post(run.entry(read('fluid-pressure', Number.NaN, 'bar')));
    expect(notNumber.status).toBe(400);
    expect(notNumber.body.error.fields.value).toBeTruthy();
    await run.answer(read('fluid-pressure', 4, 'bar'));
    await run.answer(tried('purge-air', false));
    await run.answer(read('off-voltage', 0.3, 'V'));
    await run.give({ stepId: 'coil-resistance', kind: 'acknowledge', cautionIds: ['lock-out'] });

    const negative = await run.post(run.entry(read('coil-resistance', -3, 'ohm', coilAt20C)));
    expect(negative.status).toBe(400);
    expect(negative.body.error.fields.value).toMatch(/resistance reading cannot be negative/);
    const coldCoil = await run.post(run.entry(read('coil-resistance', 28, 'ohm', { calculatorInputs: { measuredAt: { value: -500, unit: 'degF' } } })));
    expect(coldCoil.status).toBe(400);
    expect(coldCoil.body.error.fields['calculatorInputs.measuredAt']).toBeTruthy();
    const fixedInput = await run.post(run.entry(read('coil-resistance', 28, 'ohm', { calculatorInputs: { ...coilAt20C.calculatorInputs, nominalResistance: { value: 30, unit: 'ohm' } } })));
    expect(fixedInput.status).toBe(400);
    expect(fixedInput.body.error.fields['calculatorInputs.nominalResistance']).toMatch(/fixed by the guide/);
    const wrongComputed = await run.post(run.entry(read('coil-resistance', 28, 'ohm', { ...coilAt20C, computed: { value: 50, unit: '%' } })));
    expect(wrongComputed.status).toBe(400);
    expect(wrongComputed.body.error.fields['computed.value']).toMatch(/does not match/);
    const badShape = await run.post(run.entry({ stepId: 'coil-resistance', kind: 'reading', value: '28', unit: 'ohm' }));
    expect(badShape.status).toBe(400);
    expect(badShape.body.error.fields.value).toBeTruthy();
    const badKind = await run.post(run.entry({ stepId: 'coil-resistance', kind: 'guess' }));
    expect(badKind.status).toBe(400);
    expect(badKind.body.error.fields.kind).toBeTruthy();
    const noId = await run.post({ stepId: 'coil-resistance', kind: 'back', answeredAt: new Date().toISOString() });
    expect(noId.status).toBe(400);
    expect(noId.body.error.fields.id).toBeTruthy();
    expect((await tech.get(`/api/walks/${run.walkId}`)).body.walk.state.at).toBe('coil-resistance');
  });

  it('when a temperature reading is below absolute zero, then 400 names the value and the walk stays on the step', async () => {
    const { run } = await start();
    await run.answer(choose('drip-when', 'after-stop'));
    await run.give({ stepId: 'nozzle-temp', kind: 'acknowledge', cautionIds: ['hot-valve'] });
    const frozen = await run.post(run.entry(read('nozzle-temp', -300, 'degC')));
    expect(frozen.status).toBe(400);
    expect(frozen.body.error.fields.value).toMatch(/below absolute zero/);
    expect(frozen.body.error.details).toMatchObject({ reason: 'reading-out-of-range', stepId: 'nozzle-temp' });
    expect(await storedCount(run.walkId)).toBe(2);
  });

  it('when the walk has ended, then new answers are refused with 409 but the entry that ended it can be resent', async () => {
    const { run } = await start();
    await run.answer(choose('drip-when', 'after-each-shot'));
    await run.answer(read('fluid-pressure', 7, 'bar'));
    const ending = run.entry({ stepId: 'finding-pressure-high', kind: 'finding-outcome', outcome: 'not-fixed', note: 'Regulator reset, still drips' });
    const ended = await run.post(ending);
    expect(ended.status).toBe(201);
    expect(ended.body.walk).toMatchObject({ status: 'ended', outcome: 'not-fixed', causeCode: null });
    const more = await run.post(run.entry({ stepId: 'finding-pressure-high', kind: 'back' }));
    expect(more.status).toBe(409);
    expect(more.body.error.message).toMatch(/has ended/);
    const resent = await run.post(ending);
    expect(resent.status).toBe(200);
    expect(resent.body.duplicate).toBe(true);
    expect(await storedCount(run.walkId)).toBe(3);
  });
});

describe('who may see and do what', () => {
  it("when another technician answers someone else's walk, then 403, while colleagues and the support desk can view it", async () => {
    const { run } = await start();
    await run.answer(choose('drip-when', 'between-shots'));
    const intruder = await colleague.post(`/api/walks/${run.walkId}/answers`).send(run.entry({ stepId: 'clean-seat', kind: 'acknowledge', cautionIds: ['lock-out'] }));
    expect(intruder.status).toBe(403);
    expect(intruder.body.error.message).toMatch(/Only the technician who started this walk/);
    expect((await colleague.post(`/api/walks/${run.walkId}/abandon`).send({})).status).toBe(403);
    expect(await storedCount(run.walkId)).toBe(1);

    for (const viewer of [colleague, support, manager]) {
      const seen = await viewer.get(`/api/walks/${run.walkId}`);
      expect(seen.status).toBe(200);
      expect(seen.body.walk).toMatchObject({ id: run.walkId, canAnswer: false, canAddNotes: false });
      expect(seen.body.walk.state.at).toBe('clean-seat');
      expect((await viewer.get(`/api/walks/${run.walkId}/summary`)).status).toBe(200);
    }
  });

  it('when someone from another organisation asks for a walk, then 404 everywhere', async () => {
    const { run } = await start();
    const other = await otherOrganisation(['technician', 'support']);
    expect((await other.agent.get(`/api/walks/${run.walkId}`)).status).toBe(404);
    expect((await other.agent.get(`/api/walks/${run.walkId}/summary`)).status).toBe(404);
    expect((await other.agent.post(`/api/walks/${run.walkId}/answers`).send(run.entry(choose('drip-when', 'after-stop')))).status).toBe(404);
    expect((await other.agent.post(`/api/walks/${run.walkId}/flags`).send({ stepId: 'drip-when', comment: 'x' })).status).toBe(404);
    expect((await other.agent.post(`/api/walks/${run.walkId}/abandon`).send({})).status).toBe(404);
    expect((await other.agent.get('/api/walks')).body.walks.map((w: { id: number }) => w.id)).not.toContain(run.walkId);
    expect(await storedCount(run.walkId)).toBe(0);
  });

  it("when walks are listed, then technicians see their own and the support desk and managers see everyone's", async () => {
    const { run: mineOpen } = await start();
    const { run: theirs } = await start(colleague);
    await theirs.answer(choose('drip-when', 'after-each-shot'));

    const own = await tech.get('/api/walks?mine=1&status=open');
    expect(own.status).toBe(200);
    const ownIds = own.body.walks.map((w: { id: number }) => w.id);
    expect(ownIds).toContain(mineOpen.walkId);
    expect(ownIds).not.toContain(theirs.walkId);
    expect(own.body.walks.every((w: { status: string; userId: number }) => w.status === 'open' && w.userId === techId)).toBe(true);
    // Without mine, a technician still gets only their own walks.
    expect((await tech.get('/api/walks')).body.walks.every((w: { userId: number }) => w.userId === techId)).toBe(true);
    expect((await tech.get('/api/walks?mine=0')).status).toBe(403);
    expect((await manager.get('/api/walks?mine=1')).status).toBe(403);

    const all = await support.get(`/api/walks?guideId=${guideId}`);
    const item = all.body.walks.find((w: { id: number }) => w.id === theirs.walkId);
    expect(item).toMatchObject({
      guideTitle: SAMPLE_GUIDE_META.title,
      symptom: SAMPLE_GUIDE_META.symptom,
      versionNumber: 1,
      status: 'open',
      currentStepId: 'fluid-pressure',
      currentStepTitle: 'Read the fluid pressure at the valve inlet with the line running',
      pathLength: 2,
      stepCount: SAMPLE_GUIDE.steps.length,
      answerCount: 1,
    });
    expect(item.startedAt).toBeTruthy();
    expect(item.updatedAt).toBeTruthy();
    expect(all.body.walks.map((w: { id: number }) => w.id)).toContain(mineOpen.walkId);
    expect((await manager.get('/api/walks?status=ended')).body.walks.every((w: { status: string }) => w.status === 'ended')).toBe(true);
    expect((await support.get('/api/walks?status=finished')).status).toBe(400);
  });
});

describe('notes, abandon and flags', () => {
  async function storedFile(organisationId = t.organisationId) {
    const id = randomUUID();
    await t.db('files').insert({ id, organisation_id: organisationId, kind: 'photo', mime: 'image/webp', original_name: 'seat.webp', size: 1234, variants: JSON.stringify({}) });
    return id;
  }

  it('when a note with a photo is sent twice, then it is stored once; unknown photos and changed content are refused', async () => {
    const { run } = await start();
    const photo = await storedFile();
    const note = { clientId: `note-${randomUUID()}`, stepId: 'drip-when', text: 'Drop forms within half a second', fileIds: [photo] };
    const first = await tech.post(`/api/walks/${run.walkId}/notes`).send(note);
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    expect(first.body).toMatchObject({ duplicate: false, note: { stepId: 'drip-when', text: note.text, fileIds: [photo] } });
    expect(first.body.note.files[0]).toMatchObject({ id: photo, kind: 'photo' });
    const again = await tech.post(`/api/walks/${run.walkId}/notes`).send(note);
    expect(again.status).toBe(200);
    expect(again.body.duplicate).toBe(true);
    expect((await tech.post(`/api/walks/${run.walkId}/notes`).send({ ...note, text: 'Changed' })).status).toBe(409);
    expect(await t.db('walk_notes').where({ walk_id: run.walkId }).count('* as n')).toEqual([{ n: '1' }]);

    const other = await otherOrganisation(['author']);
    const foreignPhoto = await storedFile(other.organisationId);
    const foreign = await tech.post(`/api/walks/${run.walkId}/notes`).send({ clientId: `note-${randomUUID()}`, stepId: 'drip-when', fileIds: [foreignPhoto] });
    expect(foreign.status).toBe(400);
    expect(foreign.body.error.fields.fileIds).toBeTruthy();
    const empty = await tech.post(`/api/walks/${run.walkId}/notes`).send({ clientId: `note-${randomUUID()}`, stepId: 'drip-when', text: '  ' });
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.text).toBeTruthy();
    const badStep = await tech.post(`/api/walks/${run.walkId}/notes`).send({ clientId: `note-${randomUUID()}`, stepId: 'nowhere', text: 'x' });
    expect(badStep.body.error.fields.stepId).toBeTruthy();
    expect((await colleague.post(`/api/walks/${run.walkId}/notes`).send({ clientId: `note-${randomUUID()}`, stepId: 'drip-when', text: 'x' })).status).toBe(403);

    const walk: WalkDetail = (await support.get(`/api/walks/${run.walkId}`)).body.walk;
    expect(walk.notes).toHaveLength(1);
    expect(walk.notes[0].files[0].id).toBe(photo);
  });

  it('when a walk is abandoned, then it records the step it stopped at, takes no answers, and notes close a day later', async () => {
    const { run } = await start();
    await run.answer(choose('drip-when', 'between-shots'));
    const res = await tech.post(`/api/walks/${run.walkId}/abandon`).send({ reason: 'Line restarted for a rush order' });
    expect(res.status).toBe(200);
    expect(res.body.walk).toMatchObject({ status: 'abandoned', endKind: 'abandoned', endedAtStepId: 'clean-seat', outcomeNote: 'Line restarted for a rush order' });
    expect((await tech.post(`/api/walks/${run.walkId}/abandon`).send({})).status).toBe(200);
    const late = await run.post(run.entry({ stepId: 'clean-seat', kind: 'acknowledge', cautionIds: ['lock-out'] }));
    expect(late.status).toBe(409);
    expect(late.body.error.message).toMatch(/abandoned/);

    const note = { clientId: `note-${randomUUID()}`, stepId: 'clean-seat', text: 'Will come back after the rush' };
    expect((await tech.post(`/api/walks/${run.walkId}/notes`).send(note)).status).toBe(201);
    await t
      .db('walks')
      .where({ id: run.walkId })
      .update({ ended_at: t.db.raw("now() - interval '25 hours'") });
    const tooLate = await tech.post(`/api/walks/${run.walkId}/notes`).send({ ...note, clientId: `note-${randomUUID()}` });
    expect(tooLate.status).toBe(409);
    expect(tooLate.body.error.message).toMatch(/a day after it ends/);
    // A retry of the note stored in time is still acknowledged.
    expect((await tech.post(`/api/walks/${run.walkId}/notes`).send(note)).status).toBe(200);

    const summary = (await tech.get(`/api/walks/${run.walkId}/summary`)).body.summary;
    expect(summary.status).toBe('abandoned');
    expect(summary.steps.at(-1)).toMatchObject({ stepId: 'clean-seat', answer: null });
    expect(summary.text).toContain('not answered: the walk was stopped here');
    expect(summary.text).toContain('Reason: Line restarted for a rush order');

    const { run: finished } = await start();
    await finished.answer(choose('drip-when', 'after-stop'));
    await finished.answer(read('nozzle-temp', 200, 'degC'));
    await finished.answer({ stepId: 'finding-hot-melt', kind: 'finding-outcome', outcome: 'fixed' });
    expect((await tech.post(`/api/walks/${finished.walkId}/abandon`).send({})).status).toBe(409);
  });

  it('when a colleague flags a step as unclear, then a flag row is kept for the pinned version and shows on the walk', async () => {
    const { run, walk } = await start();
    const res = await support.post(`/api/walks/${run.walkId}/flags`).send({ stepId: 'fluid-pressure', comment: '  Which gauge? There are two on this line.  ' });
    expect(res.status).toBe(201);
    expect(res.body.flag).toMatchObject({ stepId: 'fluid-pressure', comment: 'Which gauge? There are two on this line.', resolvedAt: null });
    const row = await t.db('step_flags').where({ id: res.body.flag.id }).first();
    expect(row).toMatchObject({ organisation_id: t.organisationId, guide_id: guideId, guide_version_id: walk.guideVersionId, walk_id: run.walkId, step_id: 'fluid-pressure' });

    const empty = await tech.post(`/api/walks/${run.walkId}/flags`).send({ stepId: 'fluid-pressure', comment: ' ' });
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.comment).toBeTruthy();
    expect((await tech.post(`/api/walks/${run.walkId}/flags`).send({ stepId: 'fluid-pressure', comment: 'x'.repeat(1001) })).body.error.fields.comment).toMatch(/1000/);
    const unknown = await tech.post(`/api/walks/${run.walkId}/flags`).send({ stepId: 'nowhere', comment: 'x' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields.stepId).toBeTruthy();
    expect((await manager.post(`/api/walks/${run.walkId}/flags`).send({ stepId: 'fluid-pressure', comment: 'x' })).status).toBe(403);

    const seen: WalkDetail = (await tech.get(`/api/walks/${run.walkId}`)).body.walk;
    expect(seen.flags.map((f) => f.comment)).toEqual(['Which gauge? There are two on this line.']);
  });
});

describe('polling the live view', () => {
  it('when nothing changed since the last poll, then 304 with no body; an answer, a note or a flag change the tag', async () => {
    const { run } = await start();
    const first = await support.get(`/api/walks/${run.walkId}`);
    expect(first.status).toBe(200);
    const tag = first.headers.etag;
    expect(tag).toMatch(/^W\/"walk-/);
    expect(first.headers['cache-control']).toContain('no-cache');

    const same = await support.get(`/api/walks/${run.walkId}`).set('If-None-Match', tag);
    expect(same.status).toBe(304);
    expect(same.text ?? '').toBe('');
    expect(same.headers.etag).toBe(tag);
    // A copy cached by the technician's own browser is not the support desk's: the tags differ.
    expect((await tech.get(`/api/walks/${run.walkId}`)).headers.etag).not.toBe(tag);

    await run.answer(choose('drip-when', 'between-shots'));
    const moved = await support.get(`/api/walks/${run.walkId}`).set('If-None-Match', tag);
    expect(moved.status).toBe(200);
    expect(moved.body.walk.state.at).toBe('clean-seat');
    const tag2 = moved.headers.etag;
    expect(tag2).not.toBe(tag);

    await tech
      .post(`/api/walks/${run.walkId}/notes`)
      .send({ clientId: `note-${randomUUID()}`, stepId: 'clean-seat', text: 'Seat has a brown crust' })
      .expect(201);
    const noted = await support.get(`/api/walks/${run.walkId}`).set('If-None-Match', tag2);
    expect(noted.status).toBe(200);
    expect(noted.body.walk.notes).toHaveLength(1);
    const tag3 = noted.headers.etag;

    await support.post(`/api/walks/${run.walkId}/flags`).send({ stepId: 'clean-seat', comment: 'Name the solvent' }).expect(201);
    const flagged = await support.get(`/api/walks/${run.walkId}`).set('If-None-Match', tag3);
    expect(flagged.status).toBe(200);
    expect(flagged.body.walk.flags).toHaveLength(1);
    expect((await support.get(`/api/walks/${run.walkId}`).set('If-None-Match', flagged.headers.etag)).status).toBe(304);
  });

  it('when the walk id is unknown or not a number, then 404 or 400 rather than a stale 304', async () => {
    expect((await support.get('/api/walks/999999').set('If-None-Match', '*')).status).toBe(404);
    const bad = await support.get('/api/walks/abc');
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.id).toBeTruthy();
    expect((await support.get('/api/walks/99999999999')).status).toBe(400);
  });
});
