import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { ExportFilter, ExportStatus } from '../../shared/schemas/exports';

export class ExportJob extends Model<InferAttributes<ExportJob>, InferCreationAttributes<ExportJob>> {
  declare id: CreationOptional<number>;
  declare requestedBy: number;
  declare filter: ExportFilter;
  declare status: CreationOptional<ExportStatus>;
  declare done: CreationOptional<number>;
  declare total: CreationOptional<number>;
  declare error: CreationOptional<string | null>;
  declare storageKey: CreationOptional<string | null>;
  declare size: CreationOptional<number | null>;
  declare sha256: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare finishedAt: CreationOptional<Date | null>;
  /** The queue's job that builds it, and the try (the queue's retry count) whose work counts. */
  declare queueJobId: CreationOptional<string | null>;
  declare attempt: CreationOptional<number>;

  static initModel(sequelize: Sequelize) {
    ExportJob.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        requestedBy: { type: DataTypes.INTEGER, allowNull: false },
        filter: { type: DataTypes.JSONB, allowNull: false },
        status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'queued' },
        done: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        total: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        error: DataTypes.TEXT,
        storageKey: DataTypes.STRING(64),
        // bigint arrives from pg as a string; ZIP sizes stay far below 2^53.
        size: {
          type: DataTypes.BIGINT,
          get() {
            const raw = this.getDataValue('size');
            return raw === null ? null : Number(raw);
          },
        },
        sha256: DataTypes.CHAR(64),
        createdAt: DataTypes.DATE,
        finishedAt: DataTypes.DATE,
        queueJobId: DataTypes.UUID,
        attempt: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      },
      { sequelize, tableName: 'export_jobs', underscored: true, updatedAt: false },
    );
  }
}
