import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** An attached file, kept in the file store under its SHA-256. */
export type OutboxAttachment = { filename: string; contentType: string; storageKey: string };

export class OutboxMail extends Model<InferAttributes<OutboxMail>, InferCreationAttributes<OutboxMail>> {
  declare id: CreationOptional<number>;
  declare recipients: string[];
  declare subject: string;
  declare bodyText: string;
  declare attachments: CreationOptional<OutboxAttachment[]>;
  declare relatedType: string | null;
  declare relatedId: string | null;
  declare status: CreationOptional<'queued' | 'sent'>;
  declare attempts: CreationOptional<number>;
  declare nextAttemptAt: CreationOptional<Date>;
  declare lastError: CreationOptional<string | null>;
  declare sentAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    OutboxMail.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        recipients: { type: DataTypes.ARRAY(DataTypes.STRING(254)), allowNull: false },
        subject: { type: DataTypes.STRING(300), allowNull: false },
        bodyText: { type: DataTypes.TEXT, allowNull: false },
        attachments: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        relatedType: DataTypes.STRING(60),
        relatedId: DataTypes.STRING(120),
        status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'queued' },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        nextAttemptAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        lastError: DataTypes.TEXT,
        sentAt: DataTypes.DATE,
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'mail_outbox', underscored: true, updatedAt: false },
    );
  }
}
