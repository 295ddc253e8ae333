// HTML the server writes itself, with people's text inside: search headlines (PostgreSQL's
// ts_headline and Meilisearch's highlights) and e-mails. With OWASP filter-evasion vectors in
// every field, the headlines hold no markup but <mark>, and each e-mail has exactly the element
// and attribute structure it has with plain words, with the vectors shown as text.
import { JSDOM } from 'jsdom';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { handoffMail } from '../../server/modules/mail/templates/case-handoff';
import { caseSummaryMail } from '../../server/modules/mail/templates/case-summary';
import { insightsDigestMail } from '../../server/modules/mail/templates/insights-digest';
import { invitationMail } from '../../server/modules/mail/templates/invitation';
import { passwordResetMail } from '../../server/modules/mail/templates/password-reset';
import { syncSearch } from '../../server/modules/search/search.routes';
import { XSS_VECTORS } from '../fixtures/xss-vectors';
import { startFakeMeili, type FakeMeili } from '../fakes/meilisearch';
import { dangers } from '../helpers/html-safety';
import { startTestApp, type TestApp } from '../helpers/test-app';

type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
const WORD = 'flange';
/** A vector with the search word beside it, so the field is both found and highlighted. */
const vec = (i: number, max = 400) => {
  let out = `${WORD} ${XSS_VECTORS[i % XSS_VECTORS.length]}`;
  for (let k = 1; out.length < max; k++) {
    const next = XSS_VECTORS[(i + k) % XSS_VECTORS.length];
    if (out.length + next.length + 1 > max || k >= XSS_VECTORS.length) break;
    out += ` ${next}`;
  }
  return out;
};

/** Element names with their attribute names, in document order: what markup a message is made of. */
function structure(html: string): string[] {
  const doc = new JSDOM(html).window.document;
  return Array.from(doc.querySelectorAll('*')).map(
    (el) =>
      `${el.tagName.toLowerCase()}[${Array.from(el.attributes, (a) => a.name)
        .sort()
        .join(',')}]`,
  );
}
function textOf(html: string): string {
  return new JSDOM(html).window.document.body.textContent ?? '';
}

/** Headline HTML may carry <mark> and escaped text only; unescaped, it is the stored text. */
function checkHeadline(html: string, label: string) {
  const bare = html.replace(/<\/?mark>/g, '');
  expect(bare, `${label}: only <mark> is markup`).not.toMatch(/[<>]/);
  expect(dangers(html), label).toEqual([]);
  const dom = new JSDOM(`<body>${html}</body>`).window.document.body;
  expect(
    Array.from(dom.querySelectorAll('*')).every((e) => e.tagName === 'MARK'),
    label,
  ).toBe(true);
}

const para = (text: string) => ({ type: 'paragraph', content: [{ type: 'text', text }] });
const bare = { cautions: [], photoIds: [], articleIds: [] };

async function publish(t: TestApp) {
  const author = (await t.signIn(['author'])).agent;
  const reviewer = (await t.signIn(['author'])).agent;
  const g = await author.post('/api/guides').send({
    title: vec(0, 120),
    symptom: vec(1, 200),
    summary: vec(2, 400),
    tags: [],
    content: {
      startStepId: 'start',
      steps: [
        {
          kind: 'ask',
          id: 'start',
          title: vec(3, 200),
          ...bare,
          choices: [
            { id: 'yes', label: vec(4, 100), next: 'found' },
            { id: 'no', label: 'No', next: 'call' },
          ],
        },
        { kind: 'finding', id: 'found', title: vec(5, 200), ...bare, causeCode: 'seat-debris', cause: vec(6, 400), remedy: [vec(7, 200)], parts: [] },
        { kind: 'handoff', id: 'call', title: vec(8, 200), ...bare, contact: 'Application engineer', message: vec(9, 200) },
      ],
    },
  });
  expect(g.status, JSON.stringify(g.body)).toBe(201);
  await author.post(`/api/guides/${g.body.guide.id}/submit`).send({}).expect(200);
  await reviewer.post(`/api/guides/${g.body.guide.id}/approve`).send({}).expect(200);
  const a = await author.post('/api/articles').send({ title: vec(10, 160), summary: vec(11, 400), body: { type: 'doc', content: [para(vec(12, 2000)), para(vec(13, 2000))] } });
  expect(a.status, JSON.stringify(a.body)).toBe(201);
  await author.post(`/api/articles/${a.body.article.id}/submit`).expect(200);
  await reviewer.post(`/api/articles/${a.body.article.id}/approve`).send({}).expect(200);
  return { guideId: g.body.guide.id as number, articleId: a.body.article.id as number };
}

describe('search headlines with script vectors', () => {
  let pgApp: TestApp;
  let meiliApp: TestApp;
  let fake: FakeMeili;
  beforeAll(async () => {
    fake = await startFakeMeili();
    [pgApp, meiliApp] = await Promise.all([startTestApp(), startTestApp({ MEILI_URL: fake.url, MEILI_API_KEY: fake.apiKey, MEILI_TIMEOUT_MS: '2000' })]);
  }, 60_000);
  afterAll(async () => {
    await pgApp?.close();
    await meiliApp?.close();
    await fake?.close();
  });

  for (const engine of ['postgres', 'meilisearch'] as const) {
    it(`when guides and articles full of vectors are found through ${engine}, then titles and snippets hold only <mark> and escaped text`, async () => {
      const t = engine === 'postgres' ? pgApp : meiliApp;
      const { guideId, articleId } = await publish(t);
      await syncSearch(t.db);
      const tech: Agent = (await t.signIn(['technician'])).agent;
      let checked = 0;
      for (const q of [WORD, 'img onerror', 'script', 'javascript alert']) {
        const res = await tech.get('/api/search').query({ q });
        expect(res.status).toBe(200);
        expect(res.body.engine).toBe(engine);
        for (const hit of res.body.results as { kind: string; id: number; titleHtml: string; snippetHtml: string; title: string }[]) {
          checkHeadline(hit.titleHtml, `${engine} ${q} ${hit.kind} title`);
          checkHeadline(hit.snippetHtml, `${engine} ${q} ${hit.kind} snippet`);
          checked++;
        }
      }
      const found = await tech.get('/api/search').query({ q: WORD });
      const kinds = (found.body.results as { kind: string; id: number }[]).map((h) => `${h.kind}:${h.id}`);
      expect(kinds).toEqual(expect.arrayContaining([`guide:${guideId}`, `article:${articleId}`]));
      const guideHit = found.body.results.find((h: { kind: string }) => h.kind === 'guide');
      // Escaped, the vector is still there as text: "<" reaches the page as a character, not a tag.
      expect(guideHit.titleHtml).toContain('&lt;');
      expect(guideHit.titleHtml).toMatch(/<mark>flange<\/mark>/i);
      expect(checked).toBeGreaterThanOrEqual(4);
    }, 60_000);
  }
});

describe('e-mails with script vectors', () => {
  // Every string a person can type goes in as a vector in one run and as a plain word in the other.
  const texts = (mode: 'vector' | 'plain') => (i: number) => (mode === 'plain' ? `word${i}` : XSS_VECTORS[i % XSS_VECTORS.length]);
  const LINK = 'https://beadpath.example/x';
  const builds: Record<string, (s: (i: number) => string) => { html: string; text: string; subject: string }> = {
    invitation: (s) => invitationMail({ organisationName: s(0), name: s(1), email: 'a@example.com', invitedBy: s(2), roles: ['technician'], link: LINK, days: 7 }),
    'password reset': (s) => passwordResetMail({ organisationName: s(3), name: s(4), email: 'a@example.com', link: LINK, minutes: 60 }),
    'case hand-off': (s) =>
      handoffMail({
        organisationName: s(5),
        assigneeName: s(6),
        fromName: s(7),
        caseId: 12,
        caseLink: LINK,
        symptom: s(8),
        priority: 'high',
        caller: s(9),
        callerContact: s(10),
        place: s(11),
        note: s(12),
        walk: { guideTitle: s(13), result: s(14), text: s(15), link: LINK },
      }),
    'case summary': (s) =>
      caseSummaryMail({
        organisationName: s(16),
        caseId: 12,
        callerName: s(17),
        symptom: s(18),
        place: s(19),
        supportName: s(20),
        note: s(21),
        walk: {
          guideTitle: s(22),
          steps: [
            { title: s(23), answer: s(24) },
            { title: s(25), answer: null },
          ],
          result: { kind: 'finding', title: s(26), cause: s(27), remedy: [s(28)], parts: [{ name: s(29), partNumber: s(30), quantity: 1 }], outcome: 'fixed-by-other', outcomeNote: s(31) },
          cautions: [{ text: s(32), action: s(33) }],
        },
      }),
    'insights digest': (s) =>
      insightsDigestMail({
        organisationName: s(34),
        recipientName: s(35),
        weekOf: '2026-11-30',
        today: '2026-11-30',
        dueIn7: [{ tag: s(36), site: s(37), line: s(38), part: 'seat', dueOn: '2026-12-03', overdue: false, link: LINK }],
        dueIn30: [{ tag: s(39), site: s(40), line: s(41), part: 'needle', dueOn: '2026-12-20', overdue: true, link: LINK }],
        repeats: [{ tag: s(42), cause: s(43), times: 2, lastOn: '2026-11-20', link: LINK }],
        moreServices: 0,
        forecastLink: LINK,
        causesLink: LINK,
        settingsLink: LINK,
        preview: false,
      }),
  };

  for (const [name, build] of Object.entries(builds)) {
    it(`when the ${name} e-mail carries vectors in every field, then its HTML has the same elements and attributes as with plain words and shows the vectors as text`, () => {
      const plain = build(texts('plain'));
      const withVectors = build(texts('vector'));
      expect(structure(withVectors.html)).toEqual(structure(plain.html));
      const shown = textOf(withVectors.html);
      const used = [...plain.text.matchAll(/word(\d+)/g)].map((m) => Number(m[1]));
      expect(used.length).toBeGreaterThan(2);
      for (const i of used) expect(shown, `field ${i}`).toContain(XSS_VECTORS[i % XSS_VECTORS.length].replace(/\s+/g, ' ').trim().slice(0, 20).split(/\s/)[0]);
      expect(withVectors.subject).not.toMatch(/[\r\n]/);
    });
  }

  it('when an admin with a vector for a name invites a person with a vector for a name, through the API, then the message sent has the plain structure', async () => {
    const t = await startTestApp();
    try {
      const admin = (await t.signIn(['admin'])).agent;
      await admin
        .patch('/api/admin/settings')
        .send({ name: XSS_VECTORS[1].slice(0, 120) })
        .expect(200);
      await admin.patch('/api/auth/me').send({ name: XSS_VECTORS[30].slice(0, 120) });
      const res = await admin.post('/api/admin/users').send({ name: XSS_VECTORS[13].slice(0, 120), email: 'vector.person@example.com', roles: ['technician'] });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      const mail = await t.waitForMail((m) => m.to.includes('vector.person@example.com'));
      const plain = invitationMail({
        organisationName: 'word',
        name: 'word',
        email: 'vector.person@example.com',
        invitedBy: 'word',
        roles: ['technician'],
        link: 'https://beadpath.example/invite/x',
        days: 7,
      });
      expect(structure(mail.html!)).toEqual(structure(plain.html));
      expect(dangers(new JSDOM(mail.html!).window.document.body.innerHTML).filter((d) => !/\[style\]/.test(d))).toEqual([]);
      expect(textOf(mail.html!)).toContain(XSS_VECTORS[13].slice(0, 120));
    } finally {
      await t.close();
    }
  }, 30_000);
});
