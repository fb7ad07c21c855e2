import { DataTypes } from 'sequelize';
import type { Migration } from '../migrator';

export const up: Migration = async ({ queryInterface }) => {
  await queryInterface.createTable('users', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    password_hash: { type: DataTypes.STRING(100), allowNull: false },
    roles: { type: DataTypes.ARRAY(DataTypes.STRING(20)), allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    last_sign_in_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.sequelize.query(`
    ALTER TABLE users ADD CONSTRAINT users_roles_known CHECK (
      cardinality(roles) > 0 AND roles <@ ARRAY['admin','clerk','inspector','quality','buyer','auditor']::varchar(20)[]
    )`);
};

export const down: Migration = async ({ queryInterface }) => {
  await queryInterface.dropTable('users');
};
