// Schema changes are migrations in db/migrations, applied in file-name order and recorded in
// the SequelizeMeta table; the schema is never derived from the models.
import { Umzug, SequelizeStorage } from 'umzug';
import type { QueryInterface, Sequelize } from 'sequelize';
import { join } from 'node:path';

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

export async function migrate(sequelize: Sequelize) {
  const applied = await createMigrator(sequelize).up();
  return applied.map((m) => m.name);
}
