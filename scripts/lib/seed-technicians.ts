// For the load bench and the fault checks: one organisation with `count` technicians (all with the
// same password) and the sample guide, published, so walks can be started on it at once.
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../../src/shared/guides/sample';
import type { Db } from '../../server/db/knex';
import { hashPassword } from '../../server/lib/passwords';

export interface SeededTechnicians {
  organisationId: number;
  emails: string[];
  guideId: number;
  versionId: number;
}

/** Emails are `tech<i>@<label>.invalid`; the organisation is "<Label> works". */
export async function seedTechnicians(db: Db, count: number, label: string, password: string): Promise<SeededTechnicians> {
  const [org] = await db('organisations')
    .insert({ name: `${label[0].toUpperCase()}${label.slice(1)} works` })
    .returning('id');
  const hash = await hashPassword(password);
  const emails = Array.from({ length: count }, (_, i) => `tech${i}@${label}.invalid`);
  await db('users').insert(emails.map((email, i) => ({ organisation_id: org.id, email, name: `Technician ${i}`, roles: ['technician'], password_hash: hash })));
  const [guide] = await db('guides').insert({ organisation_id: org.id, status: 'active' }).returning('id');
  const [version] = await db('guide_versions')
    .insert({
      guide_id: guide.id,
      number: 1,
      state: 'published',
      title: SAMPLE_GUIDE_META.title,
      symptom: SAMPLE_GUIDE_META.symptom,
      summary: SAMPLE_GUIDE_META.summary ?? '',
      tags: SAMPLE_GUIDE_META.tags,
      content: JSON.stringify(SAMPLE_GUIDE),
      published_at: db.fn.now(),
    })
    .returning('id');
  await db('guides').where({ id: guide.id }).update({ published_version_id: version.id });
  return { organisationId: org.id, emails, guideId: guide.id, versionId: version.id };
}
