// Demo mode only: a first published guide (drips after close) and a first article, so a new
// demo shows a walk end to end. Idempotent: skipped when the organisation already has guides.
import type { Knex } from 'knex';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../src/shared/guides/sample';
import { validateGuide } from '../src/shared/guides/validate';
import { prepareRichText } from '../server/lib/rich-text';
import { DEMO_ORGANISATION } from './01-demo-organisation';

const p = (text: string) => ({ type: 'paragraph', content: [{ type: 'text', text }] });

const SEAT_ARTICLE = {
  title: 'Reading a worn seat under a loupe',
  summary: 'How to tell debris from wear before you order a seat.',
  tags: ['seat', 'electric'],
  keywords: ['loupe', 'drips', 'seat wear'],
  body: {
    type: 'doc',
    content: [
      { type: 'caution', attrs: { hazard: 'fluid-pressure' }, content: [p('Lock out the valve driver and relieve fluid pressure at the tank before you loosen the nozzle nut.')] },
      { type: 'heading', attrs: { level: 2 }, content: [{ type: 'text', text: 'What a good seat looks like' }] },
      p('Under a 10x loupe a good stainless seat shows a thin, even, bright contact ring where the carbide tip closes on it.'),
      { type: 'heading', attrs: { level: 2 }, content: [{ type: 'text', text: 'Debris or wear?' }] },
      {
        type: 'table',
        content: [
          { type: 'tableRow', content: [{ type: 'tableHeader', content: [p('What you see')] }, { type: 'tableHeader', content: [p('Likely cause')] }, { type: 'tableHeader', content: [p('What to do')] }] },
          { type: 'tableRow', content: [{ type: 'tableCell', content: [p('Dark spots or a film that wipes off')] }, { type: 'tableCell', content: [p('Debris or cured fluid on the seat')] }, { type: 'tableCell', content: [p('Clean with the solvent from the fluid’s data sheet; check the filter')] }] },
          { type: 'tableRow', content: [{ type: 'tableCell', content: [p('A wide, frosted band all round')] }, { type: 'tableCell', content: [p('Seat worn (rule of thumb: about 100 million cycles with most adhesives)')] }, { type: 'tableCell', content: [p('Replace the seat; look at the needle tip too')] }] },
          { type: 'tableRow', content: [{ type: 'tableCell', content: [p('A notch or a chip in the ring')] }, { type: 'tableCell', content: [p('Hard particle or a chipped needle tip')] }, { type: 'tableCell', content: [p('Replace seat and needle; find where the particle came from')] }] },
        ],
      },
      p('These wear figures are common practice in the trade, not maker data: your valve maker’s service intervals come first.'),
    ],
  },
};

export async function seed(knex: Knex): Promise<void> {
  if (process.env.BEADPATH_DEMO !== '1') return;
  const org = await knex('organisations').where({ name: DEMO_ORGANISATION }).first();
  if (!org) return;
  if (await knex('guides').where({ organisation_id: org.id }).first()) return;
  const author = await knex('users').where({ email: 'author@example.com' }).first();
  const reviewer = await knex('users').where({ email: 'author2@example.com' }).first();
  await knex.transaction(async (trx) => {
    const counts = validateGuide(SAMPLE_GUIDE);
    const [guide] = await trx('guides').insert({ organisation_id: org.id, status: 'active', created_by: author.id }).returning('id');
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
        error_count: counts.errors.length,
        warning_count: counts.warnings.length,
        created_by: author.id,
        updated_by: author.id,
        submitted_by: author.id,
        submitted_at: trx.fn.now(),
        reviewed_by: reviewer.id,
        published_at: trx.fn.now(),
      })
      .returning('id');
    await trx('guides').where({ id: guide.id }).update({ published_version_id: version.id });
    await trx('guide_events').insert([
      { guide_id: guide.id, version_number: 1, kind: 'created', user_id: author.id },
      { guide_id: guide.id, version_number: 1, kind: 'approved', user_id: reviewer.id },
    ]);

    if (!(await trx('articles').where({ organisation_id: org.id }).first())) {
      const rich = prepareRichText(SEAT_ARTICLE.body);
      const [a] = await trx('articles').insert({ organisation_id: org.id, slug: 'reading-a-worn-seat-under-a-loupe', workflow: 'published', created_by: author.id, submitted_by: author.id, submitted_at: trx.fn.now(), reviewed_by: reviewer.id, reviewed_at: trx.fn.now() }).returning('id');
      const [r] = await trx('article_revisions')
        .insert({ article_id: a.id, number: 1, title: SEAT_ARTICLE.title, summary: SEAT_ARTICLE.summary, body_json: JSON.stringify(rich.doc), body_html: rich.html, body_text: rich.text, tags: SEAT_ARTICLE.tags, keywords: SEAT_ARTICLE.keywords, hazards: rich.hazards, author_id: author.id })
        .returning('id');
      await trx('articles').where({ id: a.id }).update({ head_revision_id: r.id, published_revision_id: r.id });
    }
  });
}
