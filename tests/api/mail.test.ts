// E-mail as the recipient gets it, read from what the local fake SMTP server captured:
// invitations and password resets with their one-time links, retries when the mail server is down,
// refusals shown on the admin outbox, and the outbox itself.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TEST_PASSWORD, startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let admin: Agent;

beforeAll(async () => {
  t = await startTestApp({ RESET_RATE_LIMIT: '3' });
  admin = (await t.signIn(['admin'])).agent;
});
afterAll(async () => t?.close());

const linkIn = (text: string | null, path: RegExp) => {
  const m = new RegExp(`https?://[^\\s"<>]+${path.source}`).exec(text ?? '');
  if (!m) throw new Error(`no link matching ${path} in:\n${text}`);
  return m[0];
};

async function waitForStatus(id: number, status: string, timeoutMs = 10_000) {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const row = await t.db('mail_messages').where({ id }).first();
    if (row?.status === status) return row;
    if (Date.now() > until) throw new Error(`message ${id} is ${row?.status}, not ${status}, after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('invitation e-mail', () => {
  it('when an admin invites someone, then they receive a text and HTML message whose link sets a password once', async () => {
    const res = await admin.post('/api/admin/users').send({ name: 'Rosa Quill', email: 'rosa.quill@example.com', roles: ['technician'] });
    expect(res.status).toBe(201);
    expect(res.body.emailed).toBe(true);
    const mail = await t.waitForMail((m) => m.to.includes('rosa.quill@example.com'));
    expect(mail.subject).toBe('Your Beadpath account at Test works');
    expect(mail.text).toContain('Hello Rosa Quill,');
    expect(mail.text).toContain('The link works once, for 7 days');
    expect(mail.html).toContain('Set my password');
    expect(mail.html).toContain('Test works');

    const link = linkIn(mail.text, /\/invite\/[\w-]+/);
    // No PUBLIC_ORIGIN here, so links point where the admin's request came from.
    expect(link.startsWith(`${t.url}/invite/`)).toBe(true);
    expect(mail.html).toContain(link);
    const token = link.split('/invite/')[1];
    expect(token).toBe(res.body.inviteToken);

    const invitee = t.agent();
    expect((await invitee.post('/api/auth/invite/accept').send({ token, password: 'a long enough passphrase' })).status).toBe(200);
    const again = await t.agent().post('/api/auth/invite/accept').send({ token, password: 'another long passphrase' });
    expect(again.status).toBe(404);
  });

  it('when an admin asks for a new invitation link, then a second message carries the new link and the old one stops working', async () => {
    const created = await admin.post('/api/admin/users').send({ name: 'Ivo Marsh', email: 'ivo.marsh@example.com', roles: ['support'] });
    const first = await t.waitForMail((m) => m.to.includes('ivo.marsh@example.com'));
    const again = await admin.post(`/api/admin/users/${created.body.user.id}/invite`).send({});
    expect(again.status).toBe(200);
    const second = await t.waitForMail((m) => m.to.includes('ivo.marsh@example.com') && m.id !== first.id);
    const oldToken = linkIn(first.text, /\/invite\/[\w-]+/).split('/invite/')[1];
    const newToken = linkIn(second.text, /\/invite\/[\w-]+/).split('/invite/')[1];
    expect(newToken).not.toBe(oldToken);
    expect((await t.agent().get(`/api/auth/invite/${oldToken}`)).status).toBe(404);
    expect((await t.agent().get(`/api/auth/invite/${newToken}`)).status).toBe(200);
  });
});

describe('password reset', () => {
  it('when a known and an unknown address ask, then both get the same answer and only the account holder gets a message', async () => {
    const user = await t.createUser(['technician'], { email: 'kit.harrow@example.com' });
    const unknown = await t.agent().post('/api/auth/password-reset').send({ email: 'nobody-here@example.com' });
    const known = await t.agent().post('/api/auth/password-reset').send({ email: 'Kit.Harrow@example.com' });
    expect(unknown.status).toBe(202);
    expect(known.status).toBe(202);
    expect(known.body).toEqual(unknown.body);
    const mail = await t.waitForMail((m) => m.to.includes(user.email));
    expect(mail.subject).toBe('Reset your Beadpath password');
    expect(mail.text).toContain('for 60 minutes');
    await t.mail.settled();
    const toUnknown = await t.db('mail_messages').where({ to_address: 'nobody-here@example.com' });
    expect(toUnknown).toEqual([]);
    expect((await t.db('mail_captures').whereRaw(`'nobody-here@example.com' = any(envelope_to)`)).length).toBe(0);
  });

  it('when the link is used, then the new password works, the old one and every other session stop, and the link cannot be used again', async () => {
    const user = await t.createUser(['support'], { email: 'mae.olsen@example.com' });
    const other = t.agent();
    await other.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD }).expect(200);
    await t.agent().post('/api/auth/password-reset').send({ email: user.email }).expect(202);
    const mail = await t.waitForMail((m) => m.to.includes(user.email));
    const link = linkIn(mail.text, /\/reset-password\?token=[\w-]+/);
    expect(link.startsWith(`${t.url}/reset-password?token=`)).toBe(true);
    const token = new URL(link).searchParams.get('token')!;

    const info = await t.agent().get(`/api/auth/password-reset/${token}`);
    expect(info.status).toBe(200);
    expect(info.body).toMatchObject({ email: user.email, organisationName: 'Test works' });

    const weak = await t.agent().post('/api/auth/password-reset/confirm').send({ token, password: 'short' });
    expect(weak.status).toBe(400);
    expect(weak.body.error.fields.password).toBeTruthy();

    const browser = t.agent();
    const done = await browser.post('/api/auth/password-reset/confirm').send({ token, password: 'a brand new passphrase' });
    expect(done.status).toBe(200);
    expect(done.body.user.email).toBe(user.email);
    expect((await browser.get('/api/cases')).status).toBe(200);
    expect((await other.get('/api/cases')).status).toBe(401);
    expect((await t.agent().post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD })).status).toBe(401);
    expect((await t.agent().post('/api/auth/login').send({ email: user.email, password: 'a brand new passphrase' })).status).toBe(200);

    const reused = await t.agent().post('/api/auth/password-reset/confirm').send({ token, password: 'yet another passphrase' });
    expect(reused.status).toBe(404);
    expect(reused.body.error.message).toMatch(/used already/);
  });

  it('when the link is older than an hour, then it is refused with a message that says it expired', async () => {
    const user = await t.createUser(['author'], { email: 'ned.ashby@example.com' });
    await t.agent().post('/api/auth/password-reset').send({ email: user.email }).expect(202);
    const mail = await t.waitForMail((m) => m.to.includes(user.email));
    const token = new URL(linkIn(mail.text, /\/reset-password\?token=[\w-]+/)).searchParams.get('token')!;
    await t
      .db('password_resets')
      .where({ user_id: user.id })
      .update({ expires_at: t.db.raw(`now() - interval '1 second'`) });
    const info = await t.agent().get(`/api/auth/password-reset/${token}`);
    expect(info.status).toBe(404);
    expect(info.body.error.message).toMatch(/expired/);
    const confirm = await t.agent().post('/api/auth/password-reset/confirm').send({ token, password: 'a brand new passphrase' });
    expect(confirm.status).toBe(404);
    expect((await t.agent().post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD })).status).toBe(200);
  });

  it('when one address asks again and again, then after the limit the answer is 429, the same for an unknown address', async () => {
    for (const email of ['lots.of.asking@example.com', 'nobody-either@example.com']) {
      for (let i = 0; i < 3; i++) expect((await t.agent().post('/api/auth/password-reset').send({ email })).status).toBe(202);
      const res = await t.agent().post('/api/auth/password-reset').send({ email });
      expect(res.status).toBe(429);
      expect(res.body.error.code).toBe('rate_limited');
    }
  });

  it('when the address is not an e-mail, then 400 names the field', async () => {
    const res = await t.agent().post('/api/auth/password-reset').send({ email: 'not an address' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.email).toMatch(/name@example.com/);
  });
});

describe('sending with retries', () => {
  it('when the mail server is down, then the message waits, is retried and arrives once the server is back', async () => {
    await t.mail.start();
    const fake = t.mail.fake!;
    await fake.stop();
    const res = await admin.post('/api/admin/users').send({ name: 'Otto Vance', email: 'otto.vance@example.com', roles: ['manager'] });
    // The request does not wait for the mail server.
    expect(res.status).toBe(201);
    const row = await t.db('mail_messages').where({ to_address: 'otto.vance@example.com' }).first();
    await waitForStatus(row.id, 'retrying');
    const outbox = await admin.get(`/api/admin/outbox/${row.id}`);
    expect(outbox.body.message.status).toBe('retrying');
    expect(outbox.body.message.lastError).toMatch(/Could not connect to the mail server/);

    await fake.start();
    const mail = await t.waitForMail((m) => m.to.includes('otto.vance@example.com'));
    expect(mail.subject).toBe('Your Beadpath account at Test works');
    const sent = await waitForStatus(row.id, 'sent');
    expect(sent.attempts).toBeGreaterThanOrEqual(2);
    expect(sent.last_error).toBeNull();
    const shown = await admin.get(`/api/admin/outbox/${row.id}`);
    expect(shown.body.message.capturedAt).toBeTruthy();
  });

  it('when the mail server refuses the recipient, then the message fails at once with the reason on the outbox, and can be sent again', async () => {
    await t.mail.start();
    t.mail.fake!.refuse({ code: 550, message: 'Mailbox unavailable' });
    try {
      await admin
        .post('/api/admin/users')
        .send({ name: 'Pia Rook', email: 'pia.rook@example.com', roles: ['author'] })
        .expect(201);
      const row = await t.db('mail_messages').where({ to_address: 'pia.rook@example.com' }).first();
      const failed = await waitForStatus(row.id, 'failed');
      expect(failed.attempts).toBe(1);
      const list = await admin.get('/api/admin/outbox?status=failed');
      expect(list.status).toBe(200);
      const item = list.body.messages.find((m: { id: number }) => m.id === row.id);
      expect(item.lastError).toMatch(/refused the message \(550\).*Mailbox unavailable/);
      expect(list.body.counts.failed).toBeGreaterThanOrEqual(1);
    } finally {
      t.mail.fake!.refuse(null);
    }
    const row = await t.db('mail_messages').where({ to_address: 'pia.rook@example.com' }).first();
    const again = await admin.post(`/api/admin/outbox/${row.id}/resend`).send({});
    expect(again.status).toBe(200);
    await waitForStatus(row.id, 'sent');
    await t.waitForMail((m) => m.to.includes('pia.rook@example.com'));
    const twice = await admin.post(`/api/admin/outbox/${row.id}/resend`).send({});
    expect(twice.status).toBe(409);
  });
});

describe('the outbox', () => {
  it('when an admin opens a message, then they see its text and HTML; messages of another organisation are not found', async () => {
    await admin
      .post('/api/admin/users')
      .send({ name: 'Lena Stroud', email: 'lena.stroud@example.com', roles: ['technician'] })
      .expect(201);
    const row = await t.db('mail_messages').where({ to_address: 'lena.stroud@example.com' }).first();
    await waitForStatus(row.id, 'sent');
    const res = await admin.get(`/api/admin/outbox/${row.id}`);
    expect(res.status).toBe(200);
    expect(res.body.message).toMatchObject({ kind: 'invitation', to: 'lena.stroud@example.com', status: 'sent', hidden: false });
    expect(res.body.message.text).toContain('Set my password');
    expect(res.body.message.html).toContain('<!doctype html>');
    expect(res.body.message.from).toBe('"Test works" <beadpath@example.com>');

    const [org] = await t.db('organisations').insert({ name: 'Elsewhere works' }).returning('id');
    await t.db('users').where({ email: 'lena.stroud@example.com' }).update({ organisation_id: org.id });
    await t.db('mail_messages').where({ id: row.id }).update({ organisation_id: org.id });
    expect((await admin.get(`/api/admin/outbox/${row.id}`)).status).toBe(404);
    const list = await admin.get('/api/admin/outbox');
    expect(list.body.messages.map((m: { id: number }) => m.id)).not.toContain(row.id);
    expect(list.body.fake).toBe(true);
  });
});

describe('links to the configured public address', () => {
  it('when PUBLIC_ORIGIN is set, then links in messages point there, whatever host the request named', async () => {
    const other = await startTestApp({ PUBLIC_ORIGIN: 'https://beadpath.example.net' });
    try {
      const user = await other.createUser(['manager'], { email: 'vera.lund@example.com' });
      await other.agent().post('/api/auth/password-reset').send({ email: user.email }).expect(202);
      const mail = await other.waitForMail((m) => m.to.includes(user.email));
      expect(linkIn(mail.text, /\/reset-password\?token=[\w-]+/).startsWith('https://beadpath.example.net/reset-password?token=')).toBe(true);
    } finally {
      await other.close();
    }
  });
});
