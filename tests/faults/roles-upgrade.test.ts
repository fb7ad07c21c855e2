// A developer's database from before the owner and application roles (everything owned by the
// cluster's superuser, the application connected as it) is taken over on the next `npm start`
// (ensureDatabase, then migrate) with its data, its audit chain and its sequences intact.
import pg from 'pg';
import { afterAll, describe, expect, it } from 'vitest';
import { migrate } from '../../db/migrator';
import { databaseUrl, dropDatabase, ensureDatabase, ROLES } from '../../scripts/lib/postgres';
import { config } from '../../server/config';

const port = Number(new URL(config.DATABASE_URL).port);
const legacy = `${new URL(config.DATABASE_URL).pathname.slice(1)}_legacy`;

async function withClient<T>(url: string, work: (client: pg.Client) => Promise<T>) {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    return await work(client);
  } finally {
    await client.end();
  }
}

const admin = databaseUrl(port, legacy, 'admin');
const count = async (client: pg.Client, sql: string) => Number((await client.query(sql)).rows[0].count);

/** Everything outside the system schemas whose owner is not the owner role. */
const FOREIGN_OWNED = `
  SELECT count(*) FROM (
    SELECT c.relowner AS owner FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
     WHERE c.relkind IN ('r', 'p', 'S', 'v', 'm') AND n.nspname <> 'information_schema' AND n.nspname NOT LIKE 'pg\\_%'
    UNION ALL
    SELECT p.proowner FROM pg_proc p JOIN pg_namespace n ON n.oid = p.pronamespace WHERE n.nspname <> 'information_schema' AND n.nspname NOT LIKE 'pg\\_%'
    UNION ALL
    SELECT nspowner FROM pg_namespace WHERE nspname NOT IN ('public', 'information_schema') AND nspname NOT LIKE 'pg\\_%'
  ) owned WHERE owner <> '${ROLES.owner}'::regrole`;

afterAll(() => dropDatabase(port, legacy));

describe('a database from before the roles', () => {
  it('is handed to the owner role on start, keeping its rows, its audit chain and its sequences', async () => {
    await dropDatabase(port, legacy);
    await withClient(databaseUrl(port, 'postgres', 'admin'), (client) => client.query(`CREATE DATABASE "${legacy}"`));
    // As it used to be: migrated and used by the superuser.
    await migrate({ owner: admin, app: admin });
    const written = await withClient(admin, async (client) => {
      for (const action of ['legacy.one', 'legacy.two', 'legacy.three']) {
        await client.query("INSERT INTO audit_events (actor_email, action, entity_type) VALUES ('system', $1, 'test')", [action]);
      }
      await client.query("SELECT nextval('certificate_numbers'), nextval('certificate_numbers')");
      return {
        events: await count(client, 'SELECT count(*) FROM audit_events'),
        foreign: await count(client, FOREIGN_OWNED),
      };
    });
    expect(written.foreign).toBeGreaterThan(0);

    // `npm start` on it: ensureDatabase, then migrate; twice, as a second start changes nothing.
    for (let start = 0; start < 2; start++) {
      await ensureDatabase(port, legacy);
      await migrate({ owner: databaseUrl(port, legacy, 'owner'), app: databaseUrl(port, legacy, 'app') });
    }

    await withClient(databaseUrl(port, legacy, 'owner'), async (client) => {
      expect(await count(client, FOREIGN_OWNED)).toBe(0);
      expect((await client.query('SELECT pg_catalog.pg_get_userbyid(datdba) AS owner FROM pg_database WHERE datname = current_database()')).rows[0].owner).toBe(
        ROLES.owner,
      );
      expect(await count(client, 'SELECT count(*) FROM audit_events')).toBe(written.events);
    });
    await withClient(databaseUrl(port, legacy, 'app'), async (client) => {
      // The chain's digests still hold, and the application extends it as before.
      await client.query("INSERT INTO audit_events (actor_email, action, entity_type) VALUES ('system', 'after.upgrade', 'test')");
      const { rows } = await client.query(
        `SELECT (SELECT bool_and(audit_event_digest(a.prev_hash, a) = a.hash) FROM audit_events a) AS digests,
                (SELECT bool_and(prev_hash IS NOT DISTINCT FROM previous)
                   FROM (SELECT prev_hash, lag(hash) OVER (ORDER BY seq) AS previous FROM audit_events) chain) AS linked`,
      );
      expect(rows[0]).toEqual({ digests: true, linked: true });
      expect(Number((await client.query("SELECT nextval('certificate_numbers') AS next")).rows[0].next)).toBe(3);
      await expect(client.query('ALTER TABLE audit_events DISABLE TRIGGER ALL')).rejects.toThrow(/must be owner/);
      await expect(client.query("UPDATE audit_events SET action = 'x'")).rejects.toThrow(/permission denied/);
    });
  });
});
