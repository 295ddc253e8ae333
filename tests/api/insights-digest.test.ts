// The weekly digest for managers over a real database and the local fake SMTP server: services due
// in the coming 7 and 30 days and the repeat failures of the last 30, with links, in plain text and
// escaped HTML; once per organisation and week; not to managers who switched it off; a preview
// sent to oneself on request.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { localToday } from '../../src/shared/schemas/assets';
import { weekStart, type InsightsDigest } from '../../server/modules/insights/insights.jobs';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let reader: Agent;
let quitter: Agent;
let readerEmail: string;
let quitterEmail: string;
let digest: InsightsDigest;
const today = localToday();
const shift = (date: string, days: number) => new Date(Date.parse(`${date}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
const ids: Record<string, number> = {};

beforeAll(async () => {
  t = await startTestApp();
  digest = t.app.locals.insights.digest;
  const r = await t.signIn(['manager']);
  reader = r.agent;
  readerEmail = r.user.email;
  const q = await t.signIn(['manager']);
  quitter = q.agent;
  quitterEmail = q.user.email;
  await t.createUser(['manager'], { active: false });
  await t.createUser(['technician']);
  await t.db('causes').insert({ organisation_id: t.organisationId, code: 'seat-worn', label: 'Worn seat' });
  const [s] = await t.db('sites').insert({ organisation_id: t.organisationId, name: 'Plant <North> & Co' }).returning('id');
  const [l] = await t.db('lines').insert({ organisation_id: t.organisationId, site_id: s.id, name: 'Line "B"' }).returning('id');
  // 100 cycles/min × 10 h × 7/7 = 60,000 a day; seat renewed 900 days after installation at 6 M, so 54 M since.
  // Intervals 54.33 M, 55.23 M and 57.03 M put the seats 5, 20 and 50 days away.
  for (const [tag, interval] of [
    ['DG-SOON', 54_330_000],
    ['DG-MONTH', 55_230_000],
    ['DG-LATER', 57_030_000],
  ] as const) {
    const [a] = await t
      .db('applicators')
      .insert({
        organisation_id: t.organisationId,
        site_id: s.id,
        line_id: l.id,
        tag,
        actuation: 'electric',
        status: 'running',
        cycles_per_minute: 100,
        hours_per_day: 10,
        days_per_week: 7,
        installed_on: shift(today, -1000),
        seat_interval_cycles: interval,
      })
      .returning('id');
    ids[tag] = a.id;
    await t.db('service_events').insert({ organisation_id: t.organisationId, applicator_id: a.id, performed_on: shift(today, -900), actions: ['seat-replaced'] });
  }
  // The seat wore twice on one applicator within 30 days, both in the last 30.
  for (const days of [20, 5])
    await t.db('service_events').insert({ organisation_id: t.organisationId, applicator_id: ids['DG-LATER'], performed_on: shift(today, -days), actions: ['cleaned'], cause_code: 'seat-worn' });
});

afterAll(async () => t?.close());

describe('weekly digest', () => {
  it('when a date falls mid-week, then its digest week starts on the Monday before (UTC)', () => {
    expect(weekStart('2026-12-02')).toBe('2026-11-30');
    expect(weekStart('2026-11-30')).toBe('2026-11-30');
    expect(weekStart('2026-12-06')).toBe('2026-11-30');
  });

  it('when a manager switches the digest off, then it says so, and a bad value gives 400 naming enabled', async () => {
    expect((await quitter.get('/api/insights/digest')).body).toMatchObject({ enabled: true, eligible: true });
    const off = await quitter.put('/api/insights/digest').send({ enabled: false });
    expect(off.status).toBe(200);
    expect(off.body.enabled).toBe(false);
    const bad = await quitter.put('/api/insights/digest').send({ enabled: 'yes' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.enabled).toMatch(/true or false/);
  });

  it('when the weekly job runs, then each active manager still subscribed gets the services due and the repeats, with links, and HTML escaped', async () => {
    const result = await digest.sendWeekly(t.organisationId, today);
    expect(result).toEqual({ sent: 1, skipped: false });
    const sent = await t.db('mail_messages').where({ organisation_id: t.organisationId, kind: 'insights-digest' });
    expect(sent.map((m) => m.to_address)).toEqual([readerEmail]);
    const m = sent[0];
    expect(m.subject).toBe(`Services due and repeat failures, week of ${weekStart(today)}`);
    const text: string = m.text_body;
    const seven = text.slice(text.indexOf('Due in the next 7 days'), text.indexOf('Due in 8 to 30 days'));
    const thirty = text.slice(text.indexOf('Due in 8 to 30 days'), text.indexOf('Repeat failures'));
    expect(seven).toContain('Due in the next 7 days (1)');
    expect(seven).toContain(`DG-SOON (Plant <North> & Co / Line "B"): seat due ${shift(today, 5)} - http`);
    expect(seven).toContain(`/applicators/${ids['DG-SOON']}`);
    expect(thirty).toContain('Due in 8 to 30 days (1)');
    expect(thirty).toContain(`DG-MONTH (Plant <North> & Co / Line "B"): seat due ${shift(today, 20)}`);
    expect(text).not.toContain('DG-LATER (Plant');
    expect(text).toContain(`DG-LATER: Worn seat, 2 times (last on ${shift(today, -5)})`);
    expect(text).toContain('/insights/forecast?days=30');
    expect(text).toMatch(/maker’s manual/);
    const html: string = m.html_body;
    expect(html).toContain('Plant &lt;North&gt; &amp; Co / Line &quot;B&quot;');
    expect(html).not.toContain('<North>');
    expect(html).toContain(`/applicators/${ids['DG-SOON']}`);
    await t.waitForMail((c) => c.to.includes(readerEmail) && /Services due and repeat failures/.test(c.subject ?? ''));
  });

  it('when the job runs again in the same week, then nothing more is sent; the next week sends again', async () => {
    expect(await digest.sendWeekly(t.organisationId, today)).toEqual({ sent: 0, skipped: true });
    expect(await digest.sendWeekly(t.organisationId, shift(weekStart(today), 6))).toEqual({ sent: 0, skipped: true });
    expect(await t.db('mail_messages').where({ organisation_id: t.organisationId, kind: 'insights-digest' }).count('* as n').first()).toMatchObject({ n: '1' });
    expect(await digest.sendWeekly(t.organisationId, shift(weekStart(today), 7))).toEqual({ sent: 1, skipped: false });
    const runs = await t.db('insight_digest_runs').where({ organisation_id: t.organisationId }).orderBy('week_start');
    expect(runs.map((r) => r.recipients)).toEqual([1, 1]);
  });

  it('when a manager asks for a preview, then it reaches them marked as a preview, even with the weekly one switched off', async () => {
    const res = await quitter.post('/api/insights/digest/preview');
    expect(res.status).toBe(202);
    expect(res.body).toEqual({ to: quitterEmail });
    const got = await t.waitForMail((c) => c.to.includes(quitterEmail));
    expect(got.subject).toMatch(/^\[Preview\] Services due and repeat failures/);
    expect((await quitter.get('/api/insights/digest')).body.enabled).toBe(false);
    expect((await reader.get('/api/insights/digest')).body.lastSentAt).not.toBeNull();
  });
});
