// Sign-in, passwords and invitations: the rules, with the database behind the repository.
import { createHash, randomBytes } from 'node:crypto';
import type { Knex } from 'knex';
import type { SessionUser } from '../../../src/shared/schemas/auth';
import { AppError } from '../../lib/app-error';
import { hashPassword, verifyPassword } from '../../lib/passwords';
import { usersRepository, type UserRecord } from './auth.repository';

export function toSessionUser(u: UserRecord): SessionUser {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    roles: u.roles,
    unitSystem: u.unitSystem,
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

export function createAuthService(db: Knex) {
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

    async updateProfile(userId: number, patch: { name?: string; unitSystem?: 'metric' | 'imperial' }) {
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
  };
}

export type AuthService = ReturnType<typeof createAuthService>;
