// /api/admin/settings: organisation-wide settings (self-publishing, default unit system,
// default service intervals). Read elsewhere through readOrgSettings.
import type { Knex } from 'knex';
import { ApiRouter } from '../../lib/routes';
import { validate } from '../../lib/validate';
import { audit } from '../../lib/audit';
import { SettingsInput, orgSettingsFrom, type OrgSettings, type SettingsPatch } from '../../../src/shared/schemas/settings';

export { SettingsInput };

export async function readOrgSettings(db: Knex | Knex.Transaction, organisationId: number): Promise<OrgSettings> {
  const org = await db('organisations').where({ id: organisationId }).first('name', 'settings');
  return orgSettingsFrom(org);
}

export function settingsRoutes(deps: { db: Knex }) {
  const r = new ApiRouter('/api/admin/settings');
  r.get('/', 'settings:manage', async (req, res) => {
    res.json({ settings: await readOrgSettings(deps.db, req.user!.organisationId) });
  });
  r.patch('/', 'settings:manage', validate('body', SettingsInput), async (req, res) => {
    const patch = res.locals.body as SettingsPatch;
    await deps.db.transaction(async (trx) => {
      const org = await trx('organisations').where({ id: req.user!.organisationId }).forUpdate().first();
      const before = orgSettingsFrom(org);
      const settings: Record<string, unknown> = { ...(org.settings ?? {}) };
      if (patch.allowSelfPublish !== undefined) settings.allowSelfPublish = patch.allowSelfPublish;
      if (patch.defaultUnitSystem !== undefined) settings.defaultUnitSystem = patch.defaultUnitSystem;
      if (patch.serviceIntervals === null) delete settings.serviceIntervals;
      else if (patch.serviceIntervals !== undefined) settings.serviceIntervals = patch.serviceIntervals;
      await trx('organisations')
        .where({ id: org.id })
        .update({ settings: JSON.stringify(settings), ...(patch.name ? { name: patch.name } : {}), updated_at: trx.fn.now() });
      const after = orgSettingsFrom({ name: patch.name ?? org.name, settings });
      await audit(trx, {
        organisationId: org.id,
        userId: req.user!.id,
        action: 'settings.update',
        entityKind: 'organisation',
        entityId: org.id,
        before: { name: before.name, allowSelfPublish: before.allowSelfPublish, defaultUnitSystem: before.defaultUnitSystem, serviceIntervals: before.serviceIntervals },
        after: { name: after.name, allowSelfPublish: after.allowSelfPublish, defaultUnitSystem: after.defaultUnitSystem, serviceIntervals: after.serviceIntervals },
      });
    });
    res.json({ settings: await readOrgSettings(deps.db, req.user!.organisationId) });
  });
  return r;
}
