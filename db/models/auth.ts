// Models of sign-in state (see migration 20261202-0500): server-side sessions and password reset
// links. The throttle and lock-out counters are counted in SQL where they are used (server/auth).
import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import { User } from './User';

export const SESSION_END_REASONS = ['sign-out', 'password-changed', 'password-reset', 'deactivated'] as const;
export type SessionEndReason = (typeof SESSION_END_REASONS)[number];

export class Session extends Model<InferAttributes<Session>, InferCreationAttributes<Session>> {
  declare id: string;
  declare userId: ForeignKey<number>;
  declare createdAt: CreationOptional<Date>;
  declare expiresAt: Date;
  declare endedAt: CreationOptional<Date | null>;
  declare endReason: CreationOptional<SessionEndReason | null>;
  declare user?: NonAttribute<User>;
}

export class PasswordResetToken extends Model<InferAttributes<PasswordResetToken>, InferCreationAttributes<PasswordResetToken>> {
  declare id: CreationOptional<number>;
  declare userId: ForeignKey<number>;
  declare tokenHash: string;
  declare requestedBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare expiresAt: Date;
  declare usedAt: CreationOptional<Date | null>;
  declare user?: NonAttribute<User>;
}

export function initAuthModels(sequelize: Sequelize) {
  Session.init(
    {
      id: { type: DataTypes.STRING(64), primaryKey: true },
      createdAt: DataTypes.DATE,
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      endedAt: DataTypes.DATE,
      endReason: DataTypes.STRING(30),
    },
    { sequelize, tableName: 'sessions', underscored: true, updatedAt: false },
  );
  PasswordResetToken.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      requestedBy: DataTypes.INTEGER,
      createdAt: DataTypes.DATE,
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      usedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'password_reset_tokens', underscored: true, updatedAt: false },
  );
  Session.belongsTo(User, { as: 'user', foreignKey: 'userId' });
  PasswordResetToken.belongsTo(User, { as: 'user', foreignKey: 'userId' });
  return { Session, PasswordResetToken };
}
