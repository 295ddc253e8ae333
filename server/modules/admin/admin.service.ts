// User administration inside one organisation: invite, change roles, deactivate.
import type { Knex } from 'knex';
import type { InviteUserInput, UpdateUserInput } from '../../../src/shared/schemas/auth';
import { AppError } from '../../lib/app-error';
import { usersRepository, type UserRecord } from '../auth/auth.repository';
import { newInviteToken } from '../auth/auth.service';

export interface AdminUserView {
  id: number;
  email: string;
  name: string;
  roles: UserRecord['roles'];
  active: boolean;
  invitePending: boolean;
  inviteExpiresAt: string | null;
  lastSignInAt: string | null;
  createdAt: string;
}

function view(u: UserRecord): AdminUserView {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    roles: u.roles,
    active: u.active,
    invitePending: u.invitePending,
    inviteExpiresAt: u.inviteExpiresAt,
    lastSignInAt: u.lastSignInAt,
    createdAt: u.createdAt,
  };
}

export function createAdminService(db: Knex) {
  async function inOrg(trx: Knex, organisationId: number, id: number) {
    const user = await usersRepository.findById(trx, id);
    if (!user || user.organisationId !== organisationId) throw AppError.notFound('This user');
    return user;
  }

  return {
    async listUsers(organisationId: number) {
      return (await usersRepository.listByOrganisation(db, organisationId)).map(view);
    },

    async invite(organisationId: number, input: InviteUserInput) {
      const invite = newInviteToken();
      return db.transaction(async (trx) => {
        if (await usersRepository.findByEmail(trx, input.email)) {
          throw AppError.conflict(`A user with the e-mail ${input.email} already exists`, { email: 'This e-mail is already in use' });
        }
        const id = await usersRepository.insert(trx, {
          organisationId,
          email: input.email,
          name: input.name,
          roles: input.roles,
          inviteHash: invite.hash,
          inviteExpiresAt: invite.expiresAt,
        });
        return { user: view((await usersRepository.findById(trx, id))!), inviteToken: invite.token };
      });
    },

    async reissueInvite(organisationId: number, id: number) {
      const invite = newInviteToken();
      return db.transaction(async (trx) => {
        const user = await inOrg(trx, organisationId, id);
        if (user.passwordHash) throw AppError.conflict('This user has already set a password; no invitation is needed');
        await usersRepository.update(trx, id, { invite_token_hash: invite.hash, invite_expires_at: invite.expiresAt });
        return { user: view((await usersRepository.findById(trx, id))!), inviteToken: invite.token };
      });
    },

    async update(organisationId: number, actingUserId: number, id: number, patch: UpdateUserInput) {
      return db.transaction(async (trx) => {
        const user = await inOrg(trx, organisationId, id);
        const row: Record<string, unknown> = {};
        if (patch.name !== undefined) row.name = patch.name;
        if (patch.roles !== undefined) row.roles = patch.roles;
        if (patch.active !== undefined) row.active = patch.active;
        const losesAdmin =
          user.active &&
          user.roles.includes('admin') &&
          (patch.active === false || (patch.roles !== undefined && !patch.roles.includes('admin')));
        if (losesAdmin && (await usersRepository.countActiveAdmins(trx, organisationId)) <= 1) {
          throw AppError.conflict('This is the last active admin: make someone else an admin first', {
            [patch.active === false ? 'active' : 'roles']: 'The organisation needs at least one active admin',
          });
        }
        if (id === actingUserId && patch.active === false) {
          throw AppError.invalid('You cannot deactivate your own account', { active: 'You cannot deactivate yourself' });
        }
        await usersRepository.update(trx, id, row);
        if (patch.active === false) await usersRepository.deleteSessions(trx, id);
        return view((await usersRepository.findById(trx, id))!);
      });
    },
  };
}
