import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    CREATE TABLE instruments (
      id serial PRIMARY KEY,
      code varchar(40) NOT NULL UNIQUE,
      kind varchar(30) NOT NULL CHECK (kind IN ('stokes-polarimeter', 'rotating-plate', 'direct-retardance')),
      description varchar(200) NOT NULL DEFAULT '',
      s3_sign smallint NOT NULL DEFAULT 1 CHECK (s3_sign IN (1, -1)),
      angle_sign smallint NOT NULL DEFAULT 1 CHECK (angle_sign IN (1, -1)),
      uncertainty_waves numeric(8, 6) NOT NULL CHECK (uncertainty_waves >= 0),
      uncertainty_deg numeric(8, 4) NOT NULL CHECK (uncertainty_deg >= 0),
      calibrated_on date NOT NULL,
      calibration_due_on date NOT NULL CHECK (calibration_due_on > calibrated_on),
      active boolean NOT NULL DEFAULT true,
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL
    );
  `);
};

export const down: Migration = async ({ queryInterface }) => {
  await queryInterface.dropTable('instruments');
};
