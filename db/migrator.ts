// Schema changes are migrations in db/migrations, applied in file-name order by the owner role and
// recorded in the SequelizeMeta table; the schema is never derived from the models.
import { Umzug, SequelizeStorage } from 'umzug';
import { Sequelize, type QueryInterface } from 'sequelize';
import { join } from 'node:path';
import { config } from '../server/config';
import { grantAppRole, roleOf, setDefaultPrivileges } from './roles';

export type MigrationContext = { queryInterface: QueryInterface; sequelize: Sequelize };
export type Migration = (context: MigrationContext) => Promise<void>;

export function createMigrator(sequelize: Sequelize) {
  return new Umzug<MigrationContext>({
    migrations: {
      glob: join(import.meta.dirname, 'migrations', '*.ts'),
      resolve: ({ name, path, context }) => ({
        name,
        up: async () => (await import(path!)).up(context),
        down: async () => (await import(path!)).down(context),
      }),
    },
    context: { queryInterface: sequelize.getQueryInterface(), sequelize },
    storage: new SequelizeStorage({ sequelize }),
    logger: undefined,
  });
}

/**
 * Applies the pending migrations as the owner role (MIGRATION_DATABASE_URL), then grants the
 * application's role (DATABASE_URL) the rows of every table: the application itself never creates,
 * alters or owns anything. With one URL for both (one role) it only migrates.
 */
export async function migrate(urls: { owner: string; app: string } = { owner: config.MIGRATION_DATABASE_URL, app: config.DATABASE_URL }) {
  const owner = new Sequelize(urls.owner, { dialect: 'postgres', logging: false, pool: { max: 1 } });
  try {
    const [ownerRole, appRole] = await Promise.all([roleOf(urls.owner), roleOf(urls.app)]);
    const separate = ownerRole !== appRole;
    if (separate) await setDefaultPrivileges(owner, appRole);
    const applied = await createMigrator(owner).up();
    if (separate) await grantAppRole(owner, appRole);
    return applied.map((m) => m.name);
  } finally {
    await owner.close();
  }
}
