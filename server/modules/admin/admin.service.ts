// User administration inside one organisation: invite, change roles, deactivate.
import type { Knex } from 'knex';
import { ROLE_LABELS } from '../../../src/shared/permissions';
import type { InviteUserInput, UpdateUserInput } from '../../../src/shared/schemas/auth';
import type { Config } from '../../config/env';
import { AppError } from '../../lib/app-error';
import { usersRepository, type UserRecord } from '../auth/auth.repository';
import { INVITE_DAYS, newInviteToken } from '../auth/auth.service';
import type { MailService } from '../mail/mail.service';
import { linkOrigin } from '../mail/origin';
import { invitationMail } from '../mail/templates/invitation';
import { audit } from '../../lib/audit';

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

export function createAdminService(db: Knex, mailer?: { mail: MailService; config: Config }) {
  async function inOrg(trx: Knex, organisationId: number, id: number) {
    const user = await usersRepository.findById(trx, id);
    if (!user || user.organisationId !== organisationId) throw AppError.notFound('This user');
    return user;
  }

  /** The invitation e-mail, written in the same transaction as the token it carries. */
  async function recordInvitation(trx: Knex, user: UserRecord, token: string, origin?: string): Promise<number | null> {
    if (!mailer) return null;
    return mailer.mail.record(trx, {
      organisationId: user.organisationId,
      kind: 'invitation',
      to: user.email,
      content: invitationMail({
        organisationName: user.organisationName,
        name: user.name,
        email: user.email,
        invitedBy: null,
        roles: user.roles.map((r) => ROLE_LABELS[r]),
        link: `${linkOrigin(mailer.config, origin)}/invite/${token}`,
        days: INVITE_DAYS,
      }),
      fromName: user.organisationName,
    });
  }

  function send(mailId: number | null) {
    if (mailer && mailId !== null) mailer.mail.dispatch([mailId]);
  }

  return {
    async listUsers(organisationId: number) {
      return (await usersRepository.listByOrganisation(db, organisationId)).map(view);
    },

    async invite(organisationId: number, input: InviteUserInput, actorId: number | null = null, origin?: string) {
      const invite = newInviteToken();
      const out = await db.transaction(async (trx) => {
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
        const user = (await usersRepository.findById(trx, id))!;
        await audit(trx, { organisationId, userId: actorId, action: 'user.invite', entityKind: 'user', entityId: id, after: { email: user.email, roles: user.roles } });
        const mailId = await recordInvitation(trx, user, invite.token, origin);
        return { user: view(user), inviteToken: invite.token, emailed: mailId !== null, mailId };
      });
      send(out.mailId);
      return { user: out.user, inviteToken: out.inviteToken, emailed: out.emailed };
    },

    async reissueInvite(organisationId: number, id: number, actorId: number | null = null, origin?: string) {
      const invite = newInviteToken();
      const out = await db.transaction(async (trx) => {
        const user = await inOrg(trx, organisationId, id);
        if (user.passwordHash) throw AppError.conflict('This user has already set a password; no invitation is needed');
        await usersRepository.update(trx, id, { invite_token_hash: invite.hash, invite_expires_at: invite.expiresAt });
        const fresh = (await usersRepository.findById(trx, id))!;
        await audit(trx, { organisationId, userId: actorId, action: 'user.reinvite', entityKind: 'user', entityId: id, after: { email: fresh.email } });
        const mailId = await recordInvitation(trx, fresh, invite.token, origin);
        return { user: view(fresh), inviteToken: invite.token, emailed: mailId !== null, mailId };
      });
      send(out.mailId);
      return { user: out.user, inviteToken: out.inviteToken, emailed: out.emailed };
    },

    async update(organisationId: number, actingUserId: number, id: number, patch: UpdateUserInput) {
      return db.transaction(async (trx) => {
        const user = await inOrg(trx, organisationId, id);
        const row: Record<string, unknown> = {};
        if (patch.name !== undefined) row.name = patch.name;
        if (patch.roles !== undefined) row.roles = patch.roles;
        if (patch.active !== undefined) row.active = patch.active;
        const losesAdmin = user.active && user.roles.includes('admin') && (patch.active === false || (patch.roles !== undefined && !patch.roles.includes('admin')));
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
        const after = (await usersRepository.findById(trx, id))!;
        const summary = (u: UserRecord) => ({ name: u.name, roles: u.roles, active: u.active });
        const action = patch.active === false && user.active ? 'user.deactivate' : patch.active === true && !user.active ? 'user.reactivate' : patch.roles !== undefined ? 'user.roles' : 'user.update';
        await audit(trx, { organisationId, userId: actingUserId, action, entityKind: 'user', entityId: id, before: summary(user), after: summary(after) });
        return view(after);
      });
    },
  };
}
