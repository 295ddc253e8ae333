// Users and their organisation, as plain typed objects.
import type { Knex } from 'knex';
import type { Role } from '../../../src/shared/permissions';
import type { SessionUser } from '../../../src/shared/schemas/auth';

export interface UserRecord extends SessionUser {
  active: boolean;
  passwordHash: string | null;
  invitePending: boolean;
  inviteExpiresAt: string | null;
  lastSignInAt: string | null;
  createdAt: string;
}

export interface UserRow {
  id: number;
  organisation_id: number;
  organisation_name: string;
  email: string;
  name: string;
  password_hash: string | null;
  roles: Role[];
  active: boolean;
  unit_system: 'metric' | 'imperial' | null;
  organisation_unit_system: string | null;
  invite_token_hash: string | null;
  invite_expires_at: Date | null;
  last_sign_in_at: Date | null;
  created_at: Date;
}

export function toUser(row: UserRow): UserRecord {
  // The same rule as orgSettingsFrom: anything but 'imperial' (or nothing set) means metric.
  const organisationUnitSystem = row.organisation_unit_system === 'imperial' ? 'imperial' : 'metric';
  return {
    id: row.id,
    organisationId: row.organisation_id,
    organisationName: row.organisation_name,
    email: row.email,
    name: row.name,
    roles: row.roles,
    unitSystem: row.unit_system ?? organisationUnitSystem,
    unitSystemSource: row.unit_system ? 'own' : 'organisation',
    organisationUnitSystem,
    active: row.active,
    passwordHash: row.password_hash,
    invitePending: Boolean(row.invite_token_hash),
    inviteExpiresAt: row.invite_expires_at?.toISOString() ?? null,
    lastSignInAt: row.last_sign_in_at?.toISOString() ?? null,
    createdAt: row.created_at.toISOString(),
  };
}

function base(db: Knex) {
  return db('users as u').join('organisations as o', 'o.id', 'u.organisation_id').select('u.*', 'o.name as organisation_name', db.raw(`o.settings->>'defaultUnitSystem' as organisation_unit_system`));
}

export const usersRepository = {
  async findById(db: Knex, id: number) {
    const row = await base(db).where('u.id', id).first();
    return row ? toUser(row) : null;
  },
  async findByEmail(db: Knex, email: string) {
    const row = await base(db).whereRaw('lower(u.email) = ?', [email.toLowerCase()]).first();
    return row ? toUser(row) : null;
  },
  async findByInviteHash(db: Knex, hash: string) {
    const row = await base(db).where('u.invite_token_hash', hash).first();
    return row ? toUser(row) : null;
  },
  async listByOrganisation(db: Knex, organisationId: number) {
    const rows = await base(db)
      .where('u.organisation_id', organisationId)
      .orderBy([{ column: 'u.active', order: 'desc' }, 'u.name']);
    return rows.map(toUser);
  },
  async insert(db: Knex, u: { organisationId: number; email: string; name: string; roles: Role[]; passwordHash?: string | null; inviteHash?: string | null; inviteExpiresAt?: Date | null }) {
    const [row] = await db('users')
      .insert({
        organisation_id: u.organisationId,
        email: u.email,
        name: u.name,
        roles: u.roles,
        password_hash: u.passwordHash ?? null,
        invite_token_hash: u.inviteHash ?? null,
        invite_expires_at: u.inviteExpiresAt ?? null,
        password_changed_at: u.passwordHash ? db.fn.now() : null,
      })
      .returning('id');
    return row.id as number;
  },
  async update(db: Knex, id: number, patch: Record<string, unknown>) {
    await db('users')
      .where({ id })
      .update({ ...patch, updated_at: db.fn.now() });
  },
  async touchSignIn(db: Knex, id: number) {
    await db('users').where({ id }).update({ last_sign_in_at: db.fn.now() });
  },
  async countActiveAdmins(db: Knex, organisationId: number) {
    const row = await db('users').where({ organisation_id: organisationId, active: true }).whereRaw(`'admin' = any(roles)`).count<{ count: string }[]>('* as count').first();
    return Number(row?.count ?? 0);
  },
  /** Ends every session of a user at once (deactivation, password change elsewhere). */
  async deleteSessions(db: Knex, userId: number, exceptSid?: string) {
    const q = db('user_sessions').whereRaw(`(sess->'passport'->>'user') = ?`, [String(userId)]);
    if (exceptSid) q.whereNot('sid', exceptSid);
    await q.delete();
  },
};

export const passwordResetsRepository = {
  async insert(db: Knex, userId: number, tokenHash: string, expiresAt: Date) {
    // Old, spent links are of no use to anyone; dropping them keeps the table small.
    await db('password_resets')
      .where({ user_id: userId })
      .where((w) => w.whereNotNull('used_at').orWhere('expires_at', '<', db.fn.now()))
      .delete();
    await db('password_resets').insert({ user_id: userId, token_hash: tokenHash, expires_at: expiresAt });
  },
  async findByHash(db: Knex, tokenHash: string, lock = false) {
    const q = db('password_resets').where({ token_hash: tokenHash }).first();
    if (lock) q.forUpdate();
    const row = await q;
    return row ? { id: row.id as number, userId: row.user_id as number, expiresAt: row.expires_at as Date, usedAt: (row.used_at as Date | null) ?? null } : null;
  },
  /** Marks this link used and spends every other open link of the user with it. */
  async useAll(db: Knex, userId: number, usedId: number) {
    await db('password_resets').where({ user_id: userId }).whereNull('used_at').update({ used_at: db.fn.now() });
    await db('password_resets').where({ id: usedId }).update({ used_at: db.fn.now() });
  },
};
