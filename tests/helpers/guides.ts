// A published guide straight in the database (no review workflow), for tests about walking it.
import type { Knex } from 'knex';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../../src/shared/guides/sample';

export async function publishSampleGuide(db: Knex, organisationId: number): Promise<number> {
  return db.transaction(async (trx) => {
    const [guide] = await trx('guides').insert({ organisation_id: organisationId }).returning('id');
    const [version] = await trx('guide_versions')
      .insert({
        guide_id: guide.id,
        number: 1,
        state: 'published',
        title: SAMPLE_GUIDE_META.title,
        symptom: SAMPLE_GUIDE_META.symptom,
        content: JSON.stringify(SAMPLE_GUIDE),
        published_at: trx.fn.now(),
      })
      .returning('id');
    await trx('guides').where({ id: guide.id }).update({ published_version_id: version.id });
    return guide.id as number;
  });
}
