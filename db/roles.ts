// Two database roles: the owner, which runs the migrations and owns every table, and the application's
// role, which may only read and write rows. A role that owns no table cannot alter it, so it cannot
// switch off the audit trail's triggers; and it is granted no UPDATE, DELETE or TRUNCATE on the trail.
// Grants follow the owner's new tables by default privileges, and are laid again after each migration
// run, so a table made by any later migration is the application's to use without a step of its own.
import pg from 'pg';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';

/** Tables whose rows the application may add to but never change (the trail) or not touch at all. */
const APPEND_ONLY = ['audit_events'];
const OWNER_ONLY = ['"SequelizeMeta"'];

/** The role a connection string signs in as, asked of the server itself (the URL may leave it to PGUSER). */
export async function roleOf(connectionString: string): Promise<string> {
  const client = new pg.Client({ connectionString });
  await client.connect();
  try {
    return (await client.query<{ role: string }>('SELECT current_user AS role')).rows[0].role;
  } finally {
    await client.end();
  }
}

const quoteIdent = (name: string) => `"${name.replaceAll('"', '""')}"`;

/** Run by the owner before migrating: what it creates from now on is granted to the application. */
export async function setDefaultPrivileges(owner: Sequelize, appRole: string) {
  const app = quoteIdent(appRole);
  await owner.query(`
    ALTER DEFAULT PRIVILEGES GRANT USAGE ON SCHEMAS TO ${app};
    ALTER DEFAULT PRIVILEGES GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO ${app};
    ALTER DEFAULT PRIVILEGES GRANT USAGE, SELECT ON SEQUENCES TO ${app};
  `);
}

/** Run by the owner after migrating: rows of every table it owns, in one transaction, minus the exceptions above. */
export async function grantAppRole(owner: Sequelize, appRole: string) {
  const app = quoteIdent(appRole);
  await owner.transaction(async (transaction: Transaction) => {
    const schemas = await owner.query<{ name: string }>(
      `SELECT nspname AS name FROM pg_namespace WHERE nspowner = (SELECT oid FROM pg_roles WHERE rolname = current_user) OR nspname = 'public' ORDER BY 1`,
      { type: QueryTypes.SELECT, transaction },
    );
    for (const { name } of schemas) {
      const schema = quoteIdent(name);
      await owner.query(
        `GRANT USAGE ON SCHEMA ${schema} TO ${app};
         GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA ${schema} TO ${app};
         GRANT USAGE, SELECT ON ALL SEQUENCES IN SCHEMA ${schema} TO ${app};`,
        { transaction },
      );
    }
    for (const table of APPEND_ONLY) await owner.query(`REVOKE UPDATE, DELETE, TRUNCATE ON ${table} FROM ${app}`, { transaction });
    for (const table of OWNER_ONLY) await owner.query(`REVOKE ALL ON ${table} FROM ${app}`, { transaction });
  });
}

export type RoleCheck = { role: string; superuser: boolean; ownedTables: number };

/** What the application's own connection may do that it should not: be a superuser, or own tables. */
export async function checkAppRole(app: Sequelize): Promise<RoleCheck & { problem?: string }> {
  const [found] = await app.query<{ role: string; superuser: boolean; owned: string }>(
    `SELECT r.rolname AS role, r.rolsuper AS superuser,
            (SELECT count(*) FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
              WHERE c.relowner = r.oid AND c.relkind IN ('r', 'p') AND n.nspname NOT IN ('pg_catalog', 'information_schema')) AS owned
       FROM pg_roles r WHERE r.rolname = current_user`,
    { type: QueryTypes.SELECT },
  );
  const check = { role: found.role, superuser: found.superuser, ownedTables: Number(found.owned) };
  const problem = check.superuser
    ? `the application connects as ${check.role}, a superuser: it could switch off the audit trail's triggers`
    : check.ownedTables > 0
      ? `the application connects as ${check.role}, which owns ${check.ownedTables} table(s): it could switch off their triggers; let another role own them (MIGRATION_DATABASE_URL)`
      : undefined;
  return { ...check, problem };
}
