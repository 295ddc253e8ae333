// Faults that fit in the test run: an answer that races another writer of the same walk (the
// stored log moves between reading it and writing), and the mail queue after PostgreSQL went away.
// The slow ones (a real PostgreSQL restart, server processes stopped and started) are in
// `npm run check:faults`.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { publishSampleGuide } from '../helpers/guides';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let tech: Agent;
let guideId: number;

beforeAll(async () => {
  t = await startTestApp();
  tech = (await t.signIn(['technician'])).agent;
  guideId = await publishSampleGuide(t.db, t.organisationId);
});
afterAll(async () => t?.close());

const entry = (stepId: string, rest: Record<string, unknown>) => ({ id: `f-${randomUUID()}`, answeredAt: new Date().toISOString(), stepId, ...rest });

/**
 * Another writer (a second server, say) holds the walk and stores the first step's answer; the
 * request under test is sent meanwhile and must see that answer, however far it had got.
 */
async function whileAnotherWriterAnswers(send: (walkId: number) => Promise<{ status: number; body: any }>) {
  const walkId = (await tech.post('/api/walks').send({ guideId })).body.walk.id as number;
  const other = entry('drip-when', { kind: 'choice', choiceId: 'between-shots' });
  const trx = await t.db.transaction();
  await trx('walks').where({ id: walkId }).forUpdate().first('id');
  await trx('walk_answers').insert({ walk_id: walkId, seq: 1, client_id: other.id, kind: 'choice', step_id: 'drip-when', payload: JSON.stringify(other), answered_at: other.answeredAt });
  await trx('walks').where({ id: walkId }).update({ answer_count: 1, current_step_id: 'clean-seat', updated_at: trx.fn.now() });
  let settled = false;
  const pending = send(walkId).then((r) => ((settled = true), r));
  await new Promise((r) => setTimeout(r, 400));
  const waitedForTheOther = !settled;
  await trx.commit();
  const res = await pending;
  const rows = await t.db('walk_answers').where({ walk_id: walkId }).orderBy('seq').select('seq', 'client_id');
  return { res, rows, other, waitedForTheOther, walk: await t.db('walks').where({ id: walkId }).first('answer_count') };
}

describe('answers racing another writer', () => {
  it('when the walk moves between reading it and storing an answer, then the answer is checked again against the stored log and refused, not stored twice', async () => {
    const mine = entry('drip-when', { kind: 'choice', choiceId: 'after-each-shot' });
    const { res, rows, other, waitedForTheOther, walk } = await whileAnotherWriterAnswers((id) =>
      tech
        .post(`/api/walks/${id}/answers`)
        .send(mine)
        .then((r) => r),
    );
    expect(waitedForTheOther).toBe(true);
    expect(res.status).toBe(409);
    expect(res.body.error.details.reason).toBe('already-answered');
    expect(rows).toEqual([{ seq: 1, client_id: other.id }]);
    expect(walk.answer_count).toBe(1);
  });

  it('when a queued batch waits for the walk while another writer answers, then the batch sees that answer once the wait ends', async () => {
    const mine = entry('drip-when', { kind: 'choice', choiceId: 'after-stop' });
    const { res, rows, other, waitedForTheOther } = await whileAnotherWriterAnswers((id) =>
      tech
        .post(`/api/walks/${id}/answers/batch`)
        .send({ answers: [mine] })
        .then((r) => r),
    );
    expect(waitedForTheOther).toBe(true);
    expect(res.status).toBe(409);
    expect(res.body.error.details).toMatchObject({ index: 0, reason: 'already-answered', applied: [] });
    expect(rows).toEqual([{ seq: 1, client_id: other.id }]);
  });

  it('when the other writer had stored the very same entry, then the request is told it is saved, and it is stored once', async () => {
    const walkId = (await tech.post('/api/walks').send({ guideId })).body.walk.id as number;
    const same = entry('drip-when', { kind: 'choice', choiceId: 'between-shots' });
    const replies = await Promise.all(
      Array.from({ length: 5 }, () =>
        tech
          .post(`/api/walks/${walkId}/answers`)
          .send(same)
          .then((r) => r),
      ),
    );
    expect(replies.map((r) => r.status).sort()).toEqual([200, 200, 200, 200, 201]);
    expect(await t.db('walk_answers').where({ walk_id: walkId }).count('* as n').first()).toMatchObject({ n: '1' });
  });
});

describe('the mail queue after PostgreSQL went away', () => {
  it('when PostgreSQL goes away and comes back, then a message asked for afterwards is delivered by the same server', async () => {
    const cut = await startTestApp({}, { viaProxy: true });
    try {
      const user = await cut.createUser(['technician']);
      await cut.mail.start();
      await cut.proxy!.cut();
      // Long enough for the queue's own connections to notice they are gone.
      await new Promise((r) => setTimeout(r, 1500));
      const down = await cut.agent().get('/api/health');
      expect(down.status).toBe(503);
      await cut.proxy!.restore();
      expect((await cut.agent().post('/api/auth/password-reset').send({ email: user.email })).status).toBe(202);
      const mail = await cut.waitForMail((m) => m.to.includes(user.email), 15_000);
      expect(mail.subject).toMatch(/password/i);
      const row = await cut.db('mail_messages').where({ to_address: user.email }).first('status');
      expect(row.status).toBe('sent');
    } finally {
      await cut.close();
    }
  });
});
