// The organisation's list of causes that findings carry, so insights can count one cause across
// guides. Started from the defaults on first use; causes left out of a new list turn inactive
// rather than disappear, so old findings keep their labels.
import type { Knex } from 'knex';
import type { CauseListInput, CauseView } from '../../../src/shared/schemas/guides';
import { DEFAULT_CAUSES } from '../../../src/shared/tags';
import { AppError } from '../../lib/app-error';
import { audit } from '../../lib/audit';

interface CauseRow {
  code: string;
  label: string;
  component: string | null;
  active: boolean;
}

function toCause(r: CauseRow): CauseView {
  return { code: r.code, label: r.label, component: r.component ?? null, active: r.active };
}

export function createCausesService(db: Knex) {
  // Inside the caller's transaction when given one, so a first use never leaves half a list.
  async function ensure(trx: Knex, organisationId: number) {
    const any = await trx('causes').where({ organisation_id: organisationId }).first();
    if (any) return;
    await trx('causes')
      .insert(DEFAULT_CAUSES.map((c, i) => ({ organisation_id: organisationId, code: c.code, label: c.label, component: c.component ?? null, position: i })))
      .onConflict(['organisation_id', 'code'])
      .ignore();
  }

  async function list(trx: Knex, organisationId: number, opts: { includeInactive?: boolean } = {}): Promise<CauseView[]> {
    await ensure(trx, organisationId);
    const q = trx('causes')
      .where({ organisation_id: organisationId })
      .orderBy([{ column: 'active', order: 'desc' }, 'position', 'code']);
    if (!opts.includeInactive) q.andWhere({ active: true });
    return (await q).map(toCause);
  }

  return {
    list(organisationId: number, opts: { includeInactive?: boolean } = {}, trx: Knex = db) {
      return list(trx, organisationId, opts);
    },

    /** Codes a finding may use now. */
    async activeCodes(organisationId: number, trx: Knex = db): Promise<string[]> {
      return (await list(trx, organisationId)).map((c) => c.code);
    },

    /** Replaces the active list; codes left out become inactive. */
    async replace(organisationId: number, causes: CauseListInput['causes'], actorId: number | null = null): Promise<CauseView[]> {
      const fields: Record<string, string> = {};
      const seen = new Set<string>();
      causes.forEach((c, i) => {
        if (seen.has(c.code)) fields[`causes.${i}.code`] = `The cause code '${c.code}' is listed twice`;
        seen.add(c.code);
      });
      if (Object.keys(fields).length) throw AppError.invalid(Object.values(fields)[0], fields);
      return db.transaction(async (trx) => {
        // Two admins replacing the list at once would otherwise leave the union of both lists.
        await trx('organisations').where({ id: organisationId }).forUpdate().first();
        await ensure(trx, organisationId);
        const before = (await list(trx, organisationId)).map((c) => c.code);
        await trx('causes').where({ organisation_id: organisationId }).update({ active: false });
        for (const [i, c] of causes.entries()) {
          await trx('causes')
            .insert({ organisation_id: organisationId, code: c.code, label: c.label, component: c.component ?? null, active: true, position: i })
            .onConflict(['organisation_id', 'code'])
            .merge(['label', 'component', 'active', 'position']);
        }
        await audit(trx, { organisationId, userId: actorId, action: 'causes.replace', entityKind: 'causes', before: { active: before }, after: { active: causes.map((c) => c.code) } });
        return list(trx, organisationId, { includeInactive: true });
      });
    },

    /**
     * Adds the causes the organisation has never had (an imported guide's), at the end of the list.
     * A cause the organisation switched off stays off: that was its choice. Returns the codes added.
     */
    async addMissing(trx: Knex, organisationId: number, causes: readonly { code: string; label: string }[]): Promise<string[]> {
      await ensure(trx, organisationId);
      const known = new Set((await trx('causes').where({ organisation_id: organisationId }).select('code')).map((r) => r.code as string));
      const missing = causes.filter((c) => !known.has(c.code));
      if (!missing.length) return [];
      const last = await trx('causes').where({ organisation_id: organisationId }).max('position as p').first();
      const start = Number(last?.p ?? -1) + 1;
      await trx('causes')
        .insert(missing.map((c, i) => ({ organisation_id: organisationId, code: c.code, label: c.label, active: true, position: start + i })))
        .onConflict(['organisation_id', 'code'])
        .ignore();
      return missing.map((c) => c.code);
    },
  };
}
export type CausesService = ReturnType<typeof createCausesService>;
