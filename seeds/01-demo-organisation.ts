// Demo mode only: the invented Larkfield Packaging organisation with one sign-in per role.
// Idempotent: existing rows are left as they are.
import type { Knex } from 'knex';
import type { Role } from '../src/shared/permissions';
import { hashPassword } from '../server/lib/passwords';

export const DEMO_PASSWORD = 'beadpath-demo';
export const DEMO_ORGANISATION = 'Larkfield Packaging Co. (demo)';

export const DEMO_USERS: { email: string; name: string; roles: Role[] }[] = [
  { email: 'admin@example.com', name: 'Imogen Tate', roles: ['admin'] },
  { email: 'author@example.com', name: 'Walt Brennan', roles: ['author', 'technician'] },
  { email: 'author2@example.com', name: 'Priya Okafor', roles: ['author'] },
  { email: 'tech@example.com', name: 'Dario Lindqvist', roles: ['technician'] },
  { email: 'support@example.com', name: 'Nell Fairweather', roles: ['support'] },
  { email: 'manager@example.com', name: 'Mateo Varga', roles: ['manager'] },
];

export async function seed(knex: Knex): Promise<void> {
  if (process.env.BEADPATH_DEMO !== '1') return;
  await knex.transaction(async (trx) => {
    let org = await trx('organisations').where({ name: DEMO_ORGANISATION }).first();
    if (!org) [org] = await trx('organisations').insert({ name: DEMO_ORGANISATION }).returning('*');
    const hash = await hashPassword(DEMO_PASSWORD);
    for (const u of DEMO_USERS) {
      const exists = await trx('users').whereRaw('lower(email) = ?', [u.email]).first();
      if (exists) continue;
      await trx('users').insert({
        organisation_id: org.id,
        email: u.email,
        name: u.name,
        roles: u.roles,
        password_hash: hash,
        password_changed_at: trx.fn.now(),
      });
    }
  });
}
