// The organisation's tag lists (actuation, component, fluid): started from the defaults, edited by admins.
import type { Knex } from 'knex';
import { z } from 'zod';
import { DEFAULT_TAGS, TAG_GROUPS, type TagGroup } from '../../../src/shared/tags';
import { AppError } from '../../lib/app-error';
import { audit } from '../../lib/audit';

export interface TagView {
  group: TagGroup;
  slug: string;
  label: string;
  active: boolean;
}

export const TagListInput = z.object({
  tags: z
    .array(
      z.object({
        group: z.enum(TAG_GROUPS, { error: `Group must be one of ${TAG_GROUPS.join(', ')}` }),
        slug: z
          .string()
          .trim()
          .regex(/^[a-z0-9-]{1,60}$/, 'Slug uses lower-case letters, digits and hyphens'),
        label: z.string().trim().min(1, 'Label is required').max(80),
        active: z.boolean().default(true),
      }),
    )
    .max(300),
});

export function createTagsService(db: Knex) {
  async function ensure(trx: Knex, organisationId: number) {
    const any = await trx('tags').where({ organisation_id: organisationId }).first();
    if (any) return;
    await trx('tags')
      .insert(DEFAULT_TAGS.map((t, i) => ({ organisation_id: organisationId, group: t.group, slug: t.slug, label: t.label, position: i })))
      .onConflict(['organisation_id', 'group', 'slug'])
      .ignore();
  }
  return {
    async list(organisationId: number, opts: { includeInactive?: boolean } = {}): Promise<TagView[]> {
      await ensure(db, organisationId);
      const q = db('tags').where({ organisation_id: organisationId }).orderBy(['group', 'position', 'label']);
      if (!opts.includeInactive) q.andWhere({ active: true });
      return (await q).map((r) => ({ group: r.group, slug: r.slug, label: r.label, active: r.active }));
    },
    /** Slugs that may be attached to content now. */
    async activeSlugs(organisationId: number): Promise<Set<string>> {
      return new Set((await this.list(organisationId)).map((t) => t.slug));
    },
    /** Replaces the lists; tags left out are kept but made inactive so old content keeps its labels. */
    async replace(organisationId: number, tags: z.output<typeof TagListInput>['tags'], actorId: number | null = null) {
      const seen = new Set<string>();
      for (const [i, t] of tags.entries()) {
        if (seen.has(t.slug)) throw AppError.invalid(`The tag '${t.slug}' is listed twice`, { [`tags.${i}.slug`]: 'Listed twice' });
        seen.add(t.slug);
      }
      await db.transaction(async (trx) => {
        await ensure(trx, organisationId);
        const before = (await trx('tags').where({ organisation_id: organisationId, active: true }).orderBy('position').select('group', 'slug')).map((r) => `${r.group}:${r.slug}`);
        await trx('tags').where({ organisation_id: organisationId }).update({ active: false });
        for (const [i, t] of tags.entries()) {
          await trx('tags')
            .insert({ organisation_id: organisationId, group: t.group, slug: t.slug, label: t.label, active: t.active, position: i })
            .onConflict(['organisation_id', 'group', 'slug'])
            .merge(['label', 'active', 'position']);
        }
        const after = tags.filter((t) => t.active).map((t) => `${t.group}:${t.slug}`);
        await audit(trx, { organisationId, userId: actorId, action: 'tags.replace', entityKind: 'tags', before: { active: before }, after: { active: after } });
      });
      return this.list(organisationId, { includeInactive: true });
    },
  };
}
export type TagsService = ReturnType<typeof createTagsService>;
