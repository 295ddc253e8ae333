// A user's unit system: their own choice when they made one, otherwise the organisation's default
// that an admin sets; /api/auth/me says which system applies and where it comes from.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { register } from 'tsx/esm/api';
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { createDb, migrationsDir } from '../../server/db/knex';
import { startTestApp, type TestApp } from '../helpers/test-app';

register();

type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let t: TestApp;
let admin: Agent;

beforeAll(async () => {
  t = await startTestApp();
  admin = (await t.signIn(['admin'])).agent;
});
afterAll(async () => t?.close());

const me = async (agent: Agent) => (await agent.get('/api/auth/me').expect(200)).body.user;

describe('unit system: own choice or the organisation default', () => {
  it('when a new user has made no choice, then they follow the organisation: metric, then imperial once the admin sets it', async () => {
    const { agent, user } = await t.signIn(['technician']);
    expect((await t.db('users').where({ id: user.id }).first()).unit_system).toBeNull();
    expect(await me(agent)).toMatchObject({ unitSystem: 'metric', unitSystemSource: 'organisation', organisationUnitSystem: 'metric' });

    await admin.patch('/api/admin/settings').send({ defaultUnitSystem: 'imperial' }).expect(200);
    // Read on every request: the change applies without signing in again.
    expect(await me(agent)).toMatchObject({ unitSystem: 'imperial', unitSystemSource: 'organisation', organisationUnitSystem: 'imperial' });
    await admin.patch('/api/admin/settings').send({ defaultUnitSystem: 'metric' }).expect(200);
  });

  it('when a user chose their own system, then it wins over the organisation default either way', async () => {
    const { agent } = await t.signIn(['technician']);
    await admin.patch('/api/admin/settings').send({ defaultUnitSystem: 'imperial' }).expect(200);
    const chosen = await agent.patch('/api/auth/me').send({ unitSystem: 'metric' }).expect(200);
    expect(chosen.body.user).toMatchObject({ unitSystem: 'metric', unitSystemSource: 'own', organisationUnitSystem: 'imperial' });
    expect(await me(agent)).toMatchObject({ unitSystem: 'metric', unitSystemSource: 'own' });

    await admin.patch('/api/admin/settings').send({ defaultUnitSystem: 'metric' }).expect(200);
    await agent.patch('/api/auth/me').send({ unitSystem: 'imperial' }).expect(200);
    expect(await me(agent)).toMatchObject({ unitSystem: 'imperial', unitSystemSource: 'own', organisationUnitSystem: 'metric' });
  });

  it('when a user goes back to the default (null), then they follow the organisation again and their row holds null', async () => {
    const { agent, user } = await t.signIn(['technician']);
    await admin.patch('/api/admin/settings').send({ defaultUnitSystem: 'imperial' }).expect(200);
    await agent.patch('/api/auth/me').send({ unitSystem: 'metric' }).expect(200);
    const back = await agent.patch('/api/auth/me').send({ unitSystem: null }).expect(200);
    expect(back.body.user).toMatchObject({ unitSystem: 'imperial', unitSystemSource: 'organisation' });
    expect((await t.db('users').where({ id: user.id }).first()).unit_system).toBeNull();
    await admin.patch('/api/admin/settings').send({ defaultUnitSystem: 'metric' }).expect(200);
    expect(await me(agent)).toMatchObject({ unitSystem: 'metric', unitSystemSource: 'organisation' });
  });

  it('when the profile change names an unknown system, then it is refused by field name and nothing changes', async () => {
    const { agent, user } = await t.signIn(['technician']);
    await agent.patch('/api/auth/me').send({ unitSystem: 'imperial' }).expect(200);
    const bad = await agent.patch('/api/auth/me').send({ unitSystem: 'organisation' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.unitSystem).toMatch(/metric, imperial or null/);
    expect((await t.db('users').where({ id: user.id }).first()).unit_system).toBe('imperial');
  });
});

describe('migration 20261202001000_user_unit_system_default', () => {
  it('when rolled back, then users who followed the organisation get its default as their own and the column is required again', async () => {
    const name = `units_${randomBytes(5).toString('hex')}`;
    const adminClient = new pg.Client({ connectionString: inject('pgAdminUrl') });
    await adminClient.connect();
    await adminClient.query(`create database "${name}"`);
    const db = createDb(inject('pgUrlPrefix') + name, { max: 1 });
    const opts = { directory: migrationsDir, loadExtensions: ['.ts'] };
    try {
      await db.migrate.latest(opts);
      const [imperialOrg] = await db('organisations')
        .insert({ name: 'Imperial works', settings: JSON.stringify({ defaultUnitSystem: 'imperial' }) })
        .returning('id');
      const [metricOrg] = await db('organisations').insert({ name: 'Metric works' }).returning('id');
      await db('users').insert([
        { organisation_id: imperialOrg.id, email: 'follows@imperial.invalid', name: 'Follows', roles: ['technician'] },
        { organisation_id: imperialOrg.id, email: 'own@imperial.invalid', name: 'Own', roles: ['technician'], unit_system: 'metric' },
        { organisation_id: metricOrg.id, email: 'follows@metric.invalid', name: 'Follows too', roles: ['technician'] },
      ]);
      await db.migrate.down(opts);
      const rows = await db('users').orderBy('email').select('email', 'unit_system');
      expect(rows).toEqual([
        { email: 'follows@imperial.invalid', unit_system: 'imperial' },
        { email: 'follows@metric.invalid', unit_system: 'metric' },
        { email: 'own@imperial.invalid', unit_system: 'metric' },
      ]);
      await expect(db('users').where({ email: 'own@imperial.invalid' }).update({ unit_system: null })).rejects.toThrow(/not-null|null value/);
      await db.migrate.latest(opts);
      const [{ is_nullable }] = (await db.raw(`select is_nullable from information_schema.columns where table_name = 'users' and column_name = 'unit_system'`)).rows;
      expect(is_nullable).toBe('YES');
    } finally {
      await db.destroy();
      await adminClient.query(`drop database if exists "${name}" with (force)`);
      await adminClient.end();
    }
  });
});
