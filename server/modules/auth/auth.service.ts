// Sign-in, passwords and invitations: the rules, with the database behind the repository.
import { createHash, randomBytes } from 'node:crypto';
import type { Knex } from 'knex';
import type { SessionUser } from '../../../src/shared/schemas/auth';
import type { Config } from '../../config/env';
import { AppError } from '../../lib/app-error';
import { hashPassword, verifyPassword } from '../../lib/passwords';
import type { MailService } from '../mail/mail.service';
import { linkOrigin } from '../mail/origin';
import { passwordResetMail } from '../mail/templates/password-reset';
import { passwordResetsRepository, usersRepository, type UserRecord } from './auth.repository';

export function toSessionUser(u: UserRecord): SessionUser {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    roles: u.roles,
    unitSystem: u.unitSystem,
    unitSystemSource: u.unitSystemSource,
    organisationUnitSystem: u.organisationUnitSystem,
    organisationId: u.organisationId,
    organisationName: u.organisationName,
  };
}

export const INVITE_DAYS = 7;

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export function newInviteToken() {
  const token = randomBytes(24).toString('base64url');
  return { token, hash: hashToken(token), expiresAt: new Date(Date.now() + INVITE_DAYS * 86400_000) };
}

/** A reset link works this long, and once. */
export const RESET_MINUTES = 60;

export function newResetToken() {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token), expiresAt: new Date(Date.now() + RESET_MINUTES * 60_000) };
}

const RESET_GONE = 'This password reset link is not valid; ask for a new one';

export function createAuthService(db: Knex, mailer?: { mail: MailService; config: Config }) {
  /** The reset row behind a token, if it can still be used. */
  async function usableReset(trx: Knex, token: string, lock = false) {
    const reset = await passwordResetsRepository.findByHash(trx, hashToken(token), lock);
    if (!reset) throw new AppError('not_found', RESET_GONE);
    if (reset.usedAt) throw new AppError('not_found', 'This password reset link was used already; ask for a new one if you need to');
    if (reset.expiresAt.getTime() < Date.now()) throw new AppError('not_found', `This password reset link has expired (links work for ${RESET_MINUTES} minutes); ask for a new one`);
    const user = await usersRepository.findById(trx, reset.userId);
    if (!user || !user.active) throw new AppError('not_found', RESET_GONE);
    return { reset, user };
  }

  return {
    /** Checks e-mail and password; the same message for every failure so it reveals nothing. */
    async authenticate(email: string, password: string): Promise<SessionUser | null> {
      const user = await usersRepository.findByEmail(db, email);
      const ok = await verifyPassword(password, user?.passwordHash);
      if (!user || !ok || !user.active) return null;
      await usersRepository.touchSignIn(db, user.id);
      return toSessionUser(user);
    },

    async loadSessionUser(id: number): Promise<SessionUser | null> {
      const user = await usersRepository.findById(db, id);
      return user && user.active ? toSessionUser(user) : null;
    },

    async changePassword(userId: number, current: string, next: string, keepSid: string) {
      const user = await usersRepository.findById(db, userId);
      if (!user) throw AppError.notFound('Your account');
      if (!(await verifyPassword(current, user.passwordHash))) {
        throw AppError.invalid('Current password is not correct', { currentPassword: 'Current password is not correct' });
      }
      const hash = await hashPassword(next);
      await db.transaction(async (trx) => {
        await usersRepository.update(trx, userId, { password_hash: hash, password_changed_at: trx.fn.now() });
        // Other devices signed in with the old password are signed out.
        await usersRepository.deleteSessions(trx, userId, keepSid);
      });
    },

    /** unitSystem null: back to following the organisation's default. */
    async updateProfile(userId: number, patch: { name?: string; unitSystem?: 'metric' | 'imperial' | null }) {
      const row: Record<string, unknown> = {};
      if (patch.name !== undefined) row.name = patch.name;
      if (patch.unitSystem !== undefined) row.unit_system = patch.unitSystem;
      if (Object.keys(row).length) await usersRepository.update(db, userId, row);
      const user = await usersRepository.findById(db, userId);
      return toSessionUser(user!);
    },

    async inviteInfo(token: string) {
      const user = await usersRepository.findByInviteHash(db, hashToken(token));
      if (!user || !user.active || !user.inviteExpiresAt || new Date(user.inviteExpiresAt) < new Date()) {
        throw AppError.notFound('This invitation (it may have expired or been used already)');
      }
      return { name: user.name, email: user.email, organisationName: user.organisationName };
    },

    async acceptInvite(token: string, password: string): Promise<SessionUser> {
      const hash = await hashPassword(password);
      return db.transaction(async (trx) => {
        const user = await usersRepository.findByInviteHash(trx, hashToken(token));
        if (!user || !user.active || !user.inviteExpiresAt || new Date(user.inviteExpiresAt) < new Date()) {
          throw AppError.notFound('This invitation (it may have expired or been used already)');
        }
        await usersRepository.update(trx, user.id, {
          password_hash: hash,
          password_changed_at: trx.fn.now(),
          invite_token_hash: null,
          invite_expires_at: null,
        });
        return toSessionUser(user);
      });
    },

    /**
     * Sends a reset link when the address belongs to an active account and does nothing otherwise;
     * the caller answers the same either way, so nobody learns which addresses have accounts.
     */
    async requestPasswordReset(email: string, origin?: string): Promise<void> {
      if (!mailer) throw new Error('password reset needs the mail service');
      const user = await usersRepository.findByEmail(db, email);
      if (!user || !user.active) return;
      const reset = newResetToken();
      const link = `${linkOrigin(mailer.config, origin)}/reset-password?token=${reset.token}`;
      const id = await db.transaction(async (trx) => {
        await passwordResetsRepository.insert(trx, user.id, reset.hash, reset.expiresAt);
        return mailer.mail.record(trx, {
          organisationId: user.organisationId,
          kind: 'password-reset',
          to: user.email,
          content: passwordResetMail({ organisationName: user.organisationName, name: user.name, email: user.email, link, minutes: RESET_MINUTES }),
          sensitive: true,
          fromName: user.organisationName,
        });
      });
      mailer.mail.dispatch([id]);
    },

    async resetInfo(token: string) {
      const { user } = await usableReset(db, token);
      return { name: user.name, email: user.email, organisationName: user.organisationName };
    },

    async confirmPasswordReset(token: string, password: string): Promise<SessionUser> {
      const hash = await hashPassword(password);
      return db.transaction(async (trx) => {
        const { reset, user } = await usableReset(trx, token, true);
        await usersRepository.update(trx, user.id, {
          password_hash: hash,
          password_changed_at: trx.fn.now(),
          // Proving the address also settles a pending invitation.
          invite_token_hash: null,
          invite_expires_at: null,
        });
        await passwordResetsRepository.useAll(trx, user.id, reset.id);
        // Whoever knew the old password is signed out everywhere.
        await usersRepository.deleteSessions(trx, user.id);
        return toSessionUser(user);
      });
    },
  };
}

export type AuthService = ReturnType<typeof createAuthService>;
