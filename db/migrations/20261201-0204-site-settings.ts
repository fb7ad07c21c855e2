import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    CREATE TABLE site_settings (
      id smallint PRIMARY KEY DEFAULT 1 CHECK (id = 1),
      value jsonb NOT NULL,
      updated_at timestamptz NOT NULL DEFAULT now()
    );
  `);
};

export const down: Migration = async ({ queryInterface }) => {
  await queryInterface.dropTable('site_settings');
};
