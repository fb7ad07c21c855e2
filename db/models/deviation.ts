// Models of the deviation register (migration 1050): the entry, its two signed approvals and the
// uses of its quantity by signed decisions.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

const numberGetter = (field: string) => ({
  get(this: Model) {
    const raw = this.getDataValue(field);
    return raw === null || raw === undefined ? raw : Number(raw);
  },
});

export type ApprovalSlot = 'quality' | 'second';

export class Deviation extends Model<InferAttributes<Deviation>, InferCreationAttributes<Deviation>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare supplierId: number;
  declare partId: number;
  declare allowed: string;
  declare retardanceTolWaves: number | null;
  declare axisTolDeg: number | null;
  declare quantityLimit: number | null;
  /** The last day (UTC, YYYY-MM-DD) it may cover a decision. */
  declare expiresOn: string | null;
  declare recordedBeforeRegister: CreationOptional<boolean>;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare withdrawnAt: CreationOptional<Date | null>;
  declare withdrawnBy: CreationOptional<number | null>;
  declare withdrawalReason: CreationOptional<string | null>;
}

export class DeviationApproval extends Model<InferAttributes<DeviationApproval>, InferCreationAttributes<DeviationApproval>> {
  declare deviationId: number;
  declare slot: ApprovalSlot;
  declare approverId: number;
  declare meaning: string;
  declare signedAt: CreationOptional<Date>;
}

export class DeviationUse extends Model<InferAttributes<DeviationUse>, InferCreationAttributes<DeviationUse>> {
  declare id: CreationOptional<number>;
  declare deviationId: number;
  declare quantity: number;
  declare lotId: number | null;
  declare dispositionId: number | null;
  declare ncrDispositionId: number | null;
  declare usedAt: CreationOptional<Date>;
  declare releasedAt: CreationOptional<Date | null>;
}

export function initDeviationModels(sequelize: Sequelize) {
  const common = { sequelize, underscored: true };
  Deviation.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      number: { type: DataTypes.STRING(60), allowNull: false },
      supplierId: { type: DataTypes.INTEGER, allowNull: false },
      partId: { type: DataTypes.INTEGER, allowNull: false },
      allowed: { type: DataTypes.TEXT, allowNull: false },
      retardanceTolWaves: { type: DataTypes.DECIMAL(8, 5), ...numberGetter('retardanceTolWaves') },
      axisTolDeg: { type: DataTypes.DECIMAL(6, 3), ...numberGetter('axisTolDeg') },
      quantityLimit: DataTypes.INTEGER,
      expiresOn: DataTypes.DATEONLY,
      recordedBeforeRegister: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      createdBy: DataTypes.INTEGER,
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
      withdrawnAt: DataTypes.DATE,
      withdrawnBy: DataTypes.INTEGER,
      withdrawalReason: DataTypes.TEXT,
    },
    { ...common, tableName: 'deviations' },
  );
  DeviationApproval.init(
    {
      deviationId: { type: DataTypes.INTEGER, primaryKey: true },
      slot: { type: DataTypes.STRING(8), primaryKey: true },
      approverId: { type: DataTypes.INTEGER, allowNull: false },
      meaning: { type: DataTypes.TEXT, allowNull: false },
      signedAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
    },
    { ...common, tableName: 'deviation_approvals', timestamps: false },
  );
  DeviationUse.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      deviationId: { type: DataTypes.INTEGER, allowNull: false },
      quantity: { type: DataTypes.INTEGER, allowNull: false },
      lotId: DataTypes.INTEGER,
      dispositionId: DataTypes.INTEGER,
      ncrDispositionId: DataTypes.INTEGER,
      usedAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
      releasedAt: DataTypes.DATE,
    },
    { ...common, tableName: 'deviation_uses', timestamps: false },
  );
  return { Deviation, DeviationApproval, DeviationUse };
}
