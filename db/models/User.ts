import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { Role } from '../../shared/schemas/roles';

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare name: string;
  declare passwordHash: string;
  declare roles: Role[];
  declare active: CreationOptional<boolean>;
  declare lastSignInAt: CreationOptional<Date | null>;
  /** Signing is refused until then after too many wrong signature passwords (server/auth/signature.ts). */
  declare signingLockedUntil: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  hasRole(...roles: Role[]) {
    return this.roles.some((r) => roles.includes(r));
  }

  static initModel(sequelize: Sequelize) {
    User.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
        name: { type: DataTypes.STRING(120), allowNull: false },
        passwordHash: { type: DataTypes.STRING(100), allowNull: false },
        roles: { type: DataTypes.ARRAY(DataTypes.STRING(20)), allowNull: false },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        lastSignInAt: { type: DataTypes.DATE, allowNull: true },
        signingLockedUntil: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'users', underscored: true },
    );
  }
}
