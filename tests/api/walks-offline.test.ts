// The phone's offline queue over HTTP: a batch of queued entries applied in order, re-sent after
// a lost response without duplicates, stopped at the first refused entry with the ones before kept.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { publishSampleGuide } from '../helpers/guides';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let tech: Agent;
let colleague: Agent;
let guideId: number;

async function publishGuide() {
  return publishSampleGuide(t.db, t.organisationId);
}

beforeAll(async () => {
  t = await startTestApp();
  tech = (await t.signIn(['technician'])).agent;
  colleague = (await t.signIn(['technician'])).agent;
  guideId = await publishGuide();
});
afterAll(async () => t?.close());

let clock = Date.parse('2026-03-02T08:00:00Z');
/** An entry as the device queues it: its own id and the time it was given, one second apart. */
function queued(draft: { stepId: string } & Record<string, unknown>) {
  clock += 1000;
  return { id: `q-${randomUUID()}`, answeredAt: new Date(clock).toISOString(), ...draft };
}

async function startWalk(agent: Agent = tech): Promise<number> {
  const res = await agent.post('/api/walks').send({ guideId });
  expect(res.status).toBe(201);
  return res.body.walk.id;
}

const stored = async (walkId: number) => (await t.db('walk_answers').where({ walk_id: walkId }).orderBy('seq').select('client_id', 'seq')).map((r) => r.client_id);
const send = (walkId: number, answers: unknown[], agent: Agent = tech) => agent.post(`/api/walks/${walkId}/answers/batch`).send({ answers });

/** Between shots → clean the seat (three cautions) → not fixed → seat looks fine → off-voltage. */
function seatQueue() {
  return [
    queued({ stepId: 'drip-when', kind: 'choice', choiceId: 'between-shots' }),
    queued({ stepId: 'clean-seat', kind: 'acknowledge', cautionIds: ['lock-out', 'relieve-pressure', 'solvent'] }),
    queued({ stepId: 'clean-seat', kind: 'try', fixed: false }),
    queued({ stepId: 'seat-inspect', kind: 'choice', choiceId: 'both-fine' }),
  ];
}

describe('the offline queue', () => {
  it('when a queue is sent, then it is applied in order; sent again, then nothing is stored twice', async () => {
    const walkId = await startWalk();
    const queue = seatQueue();
    const res = await send(walkId, queue);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.applied).toEqual(queue.map((e, index) => ({ index, id: e.id, duplicate: false })));
    expect(res.body.state).toMatchObject({ at: 'off-voltage', unacknowledged: ['live-leads'] });
    expect(res.body.walk).toMatchObject({ answerCount: 4, currentStepId: 'off-voltage', status: 'open' });
    expect(await stored(walkId)).toEqual(queue.map((e) => e.id));

    const again = await send(walkId, queue);
    expect(again.status).toBe(200);
    expect(again.body.applied.every((a: { duplicate: boolean }) => a.duplicate)).toBe(true);
    expect(again.body.state).toEqual(res.body.state);
    expect(await stored(walkId)).toEqual(queue.map((e) => e.id));

    const walk = (await tech.get(`/api/walks/${walkId}`)).body.walk;
    expect(walk.state.path.map((p: { stepId: string }) => p.stepId)).toEqual(['drip-when', 'clean-seat', 'seat-inspect', 'off-voltage']);
    expect(walk.answers.map((a: { answeredAt: string }) => a.answeredAt)).toEqual(queue.map((e) => e.answeredAt));
  });

  it('when part of a queue reached the server before the connection dropped, then re-sending the whole queue stores only the rest', async () => {
    const walkId = await startWalk();
    const queue = seatQueue();
    await send(walkId, queue.slice(0, 2)).expect(200);
    const res = await send(walkId, queue);
    expect(res.status).toBe(200);
    expect(res.body.applied.map((a: { duplicate: boolean }) => a.duplicate)).toEqual([true, true, false, false]);
    expect(await stored(walkId)).toEqual(queue.map((e) => e.id));
  });

  it('when an entry in the queue is refused, then the batch stops there, names it, and keeps the entries before it', async () => {
    const walkId = await startWalk();
    const queue = [
      queued({ stepId: 'drip-when', kind: 'choice', choiceId: 'after-each-shot' }),
      queued({ stepId: 'fluid-pressure', kind: 'reading', value: 4, unit: 'mm' }),
      queued({ stepId: 'purge-air', kind: 'acknowledge', cautionIds: ['injection', 'solvent'] }),
    ];
    const res = await send(walkId, queue);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_input');
    expect(res.body.error.message).toMatch(/^Answer 2 of 3 was refused: 'mm' is a length unit/);
    expect(res.body.error.fields['answers.1.unit']).toMatch(/this step needs a pressure/);
    expect(res.body.error.details).toMatchObject({
      index: 1,
      id: queue[1].id,
      reason: 'reading-unit',
      stepId: 'fluid-pressure',
      applied: [{ index: 0, id: queue[0].id, duplicate: false }],
      state: { at: 'fluid-pressure' },
      walk: { answerCount: 1 },
    });
    expect(await stored(walkId)).toEqual([queue[0].id]);

    // The device fixes the entry it was told about and sends the rest again.
    const fixed = { ...queue[1], id: `q-${randomUUID()}`, unit: 'bar' };
    const rest = await send(walkId, [queue[0], fixed, queue[2]]);
    expect(rest.status).toBe(200);
    expect(rest.body.applied.map((a: { duplicate: boolean }) => a.duplicate)).toEqual([true, false, false]);
    expect(await stored(walkId)).toEqual([queue[0].id, fixed.id, queue[2].id]);
  });

  it('when a queued entry is out of order or malformed, then the batch stops at it with the reason', async () => {
    const walkId = await startWalk();
    const outOfOrder = [queued({ stepId: 'drip-when', kind: 'choice', choiceId: 'between-shots' }), queued({ stepId: 'seat-inspect', kind: 'choice', choiceId: 'both-fine' })];
    const res = await send(walkId, outOfOrder);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/not on the walk's current path/);
    expect(res.body.error.details).toMatchObject({ index: 1, reason: 'not-on-path', applied: [{ index: 0 }] });
    expect(await stored(walkId)).toEqual([outOfOrder[0].id]);

    const malformed = await send(walkId, [queued({ stepId: 'clean-seat', kind: 'acknowledge', cautionIds: ['lock-out'] }), { id: 'q-broken-entry', stepId: 'clean-seat', kind: 'try' }]);
    expect(malformed.status).toBe(400);
    expect(malformed.body.error.fields['answers.1.fixed']).toBeTruthy();
    expect(malformed.body.error.fields['answers.1.answeredAt']).toBeTruthy();
    expect(malformed.body.error.details).toMatchObject({ index: 1, id: 'q-broken-entry', reason: 'invalid-entry' });
    expect(await stored(walkId)).toHaveLength(2);

    const reused = await send(walkId, [{ ...outOfOrder[0], choiceId: 'after-stop' }]);
    expect(reused.status).toBe(409);
    expect(reused.body.error.fields['answers.0.id']).toBeTruthy();
    expect(await stored(walkId)).toHaveLength(2);
  });

  it('when the queue ends the walk and carries more, then the extra entry is refused as the walk has ended', async () => {
    const walkId = await startWalk();
    const queue = [
      queued({ stepId: 'drip-when', kind: 'choice', choiceId: 'after-each-shot' }),
      queued({ stepId: 'fluid-pressure', kind: 'reading', value: 100, unit: 'psi' }),
      queued({ stepId: 'finding-pressure-high', kind: 'finding-outcome', outcome: 'fixed' }),
      queued({ stepId: 'finding-pressure-high', kind: 'back' }),
    ];
    const res = await send(walkId, queue);
    expect(res.status).toBe(409);
    expect(res.body.error.details).toMatchObject({ index: 3, reason: 'walk-closed', walk: { status: 'ended', outcome: 'fixed', causeCode: 'fluid-pressure-high' } });
    expect(await stored(walkId)).toEqual(queue.slice(0, 3).map((e) => e.id));
    // The device resending what was stored gets a clean answer.
    expect((await send(walkId, queue.slice(0, 3))).status).toBe(200);
  });

  it("when someone sends a queue to another technician's walk, then 403 and nothing is stored", async () => {
    const walkId = await startWalk();
    const res = await send(walkId, seatQueue(), colleague);
    expect(res.status).toBe(403);
    expect(await stored(walkId)).toEqual([]);
  });

  it('when the batch itself is not a list, empty or too long, then 400 names answers', async () => {
    const walkId = await startWalk();
    for (const body of [{}, { answers: [] }, { answers: 'x' }, { answers: Array.from({ length: 101 }, () => queued({ stepId: 'drip-when', kind: 'back' })) }]) {
      const res = await tech.post(`/api/walks/${walkId}/answers/batch`).send(body);
      expect(res.status, JSON.stringify(body).slice(0, 40)).toBe(400);
      expect(res.body.error.fields.answers).toBeTruthy();
    }
  });

  it('when the same queue arrives several times at once from retries, then every entry is stored exactly once', async () => {
    const walkId = await startWalk();
    const queue = seatQueue();
    const responses = await Promise.all(Array.from({ length: 6 }, () => send(walkId, queue)));
    expect(responses.map((r) => r.status)).toEqual(responses.map(() => 200));
    const fresh = responses.flatMap((r) => r.body.applied).filter((x: { duplicate: boolean }) => !x.duplicate);
    expect(fresh.map((x: { id: string }) => x.id).sort()).toEqual(queue.map((e) => e.id).sort());
    expect(await stored(walkId)).toEqual(queue.map((e) => e.id));
  });
});
