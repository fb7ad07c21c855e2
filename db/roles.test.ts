import { afterAll, describe, expect, it } from 'vitest';
import { QueryTypes, Sequelize } from 'sequelize';
import { sequelize } from '.';
import { config } from '../server/config';
import { checkAppRole } from './roles';

// The owner runs migrations; the application's connection (db/index.ts) may only read and write rows.
const owner = new Sequelize(config.MIGRATION_DATABASE_URL, { dialect: 'postgres', logging: false, pool: { max: 1 } });
afterAll(() => owner.close());

const one = <T extends object>(db: Sequelize, sql: string) => db.query<T>(sql, { type: QueryTypes.SELECT }).then((rows) => rows[0]);

describe('database roles', () => {
  it('connects the application as a role that is no superuser and owns no table, apart from the owner', async () => {
    const app = await checkAppRole(sequelize);
    expect(app).toMatchObject({ superuser: false, ownedTables: 0 });
    expect(app.problem).toBeUndefined();
    const { role } = await one<{ role: string }>(owner, 'SELECT current_user AS role');
    expect(role).not.toBe(app.role);
    const { tables } = await one<{ tables: string }>(
      owner,
      `SELECT count(*) AS tables FROM pg_tables WHERE schemaname = 'public' AND tableowner <> current_user`,
    );
    expect(Number(tables)).toBe(0);
  });

  it('cannot switch off the audit triggers, rewrite the trail, change the schema or become the owner', async () => {
    await expect(sequelize.query('ALTER TABLE audit_events DISABLE TRIGGER ALL')).rejects.toThrow(/must be owner of table audit_events/);
    await expect(sequelize.query("UPDATE audit_events SET action = 'x' WHERE id = (SELECT max(id) FROM audit_events)")).rejects.toThrow(
      /permission denied for table audit_events/,
    );
    await expect(sequelize.query('DELETE FROM audit_events')).rejects.toThrow(/permission denied for table audit_events/);
    await expect(sequelize.query('TRUNCATE audit_events')).rejects.toThrow(/permission denied for table audit_events/);
    await expect(sequelize.query('DROP TRIGGER audit_events_no_rewrite ON audit_events')).rejects.toThrow(/must be owner/);
    await expect(sequelize.query('CREATE TABLE role_probe (id int)')).rejects.toThrow(/permission denied for schema public/);
    await expect(sequelize.query(`SET ROLE ${(await one<{ role: string }>(owner, 'SELECT current_user AS role')).role}`)).rejects.toThrow(
      /permission denied to set role/,
    );
    await expect(sequelize.query('SELECT * FROM "SequelizeMeta"')).rejects.toThrow(/permission denied for table SequelizeMeta/);
    // Adding to the trail is what the application does all day.
    const { count } = await one<{ count: string }>(sequelize, 'SELECT count(*) FROM audit_events');
    expect(Number(count)).toBeGreaterThan(0);
  });

  it('may use a table and its sequence that a later migration creates, without a grant of its own', async () => {
    const table = `role_probe_${process.pid}`;
    await owner.query(`CREATE TABLE ${table} (id serial PRIMARY KEY, note text NOT NULL)`);
    try {
      await sequelize.query(`INSERT INTO ${table} (note) VALUES ('written by the application')`);
      await sequelize.query(`UPDATE ${table} SET note = 'changed'`);
      expect(await sequelize.query(`SELECT note FROM ${table}`, { type: QueryTypes.SELECT })).toEqual([{ note: 'changed' }]);
      await sequelize.query(`DELETE FROM ${table}`);
      await expect(sequelize.query(`ALTER TABLE ${table} ADD COLUMN extra int`)).rejects.toThrow(/must be owner/);
    } finally {
      await owner.query(`DROP TABLE ${table}`);
    }
  });
});
