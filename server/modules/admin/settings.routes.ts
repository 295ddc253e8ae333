// /api/admin/settings: organisation-wide settings (today: whether authors may publish their own work).
import type { Knex } from 'knex';
import { z } from 'zod';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import { audit } from '../../lib/audit';

export const SettingsInput = z.object({
  allowSelfPublish: z.boolean({ error: 'Allow self-publish must be true or false' }).optional(),
  name: z.string().trim().min(1, 'Organisation name is required').max(120).optional(),
});

export function settingsRoutes(deps: { db: Knex }) {
  const r = new ApiRouter('/api/admin/settings');
  const read = async (id: number) => {
    const org = await deps.db('organisations').where({ id }).first();
    return { name: org.name as string, allowSelfPublish: Boolean(org.settings?.allowSelfPublish) };
  };
  r.get('/', 'settings:manage', async (req, res) => {
    res.json({ settings: await read(req.user!.organisationId) });
  });
  r.patch('/', 'settings:manage', validate('body', SettingsInput), async (req, res) => {
    const { name, allowSelfPublish } = res.locals.body as z.output<typeof SettingsInput>;
    await deps.db.transaction(async (trx) => {
      const org = await trx('organisations').where({ id: req.user!.organisationId }).forUpdate().first();
      const settings = { ...(org.settings ?? {}), ...(allowSelfPublish !== undefined ? { allowSelfPublish } : {}) };
      await trx('organisations').where({ id: org.id }).update({ settings: JSON.stringify(settings), ...(name ? { name } : {}), updated_at: trx.fn.now() });
      await audit(trx, {
        organisationId: org.id,
        userId: req.user!.id,
        action: 'settings.update',
        entityKind: 'organisation',
        entityId: org.id,
        before: { name: org.name, allowSelfPublish: Boolean(org.settings?.allowSelfPublish) },
        after: { name: name ?? org.name, allowSelfPublish: Boolean(settings.allowSelfPublish) },
      });
    });
    res.json({ settings: await read(req.user!.organisationId) });
  });
  return r;
}
