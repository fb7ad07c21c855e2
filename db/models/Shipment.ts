import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { PurchaseOrder } from './PurchaseOrder';
import type { User } from './User';

export class Shipment extends Model<InferAttributes<Shipment>, InferCreationAttributes<Shipment>> {
  declare id: CreationOptional<number>;
  declare purchaseOrderId: number;
  declare packingSlip: string;
  declare carrier: CreationOptional<string>;
  declare receivedAt: Date;
  declare receivedBy: number | null;
  /** The NCR whose returned pieces this shipment replaces. */
  declare replacementForNcrId: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
  declare purchaseOrder?: NonAttribute<PurchaseOrder>;
  declare receiver?: NonAttribute<User | null>;

  static initModel(sequelize: Sequelize) {
    Shipment.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        purchaseOrderId: { type: DataTypes.INTEGER, allowNull: false },
        receivedBy: { type: DataTypes.INTEGER, allowNull: true },
        packingSlip: { type: DataTypes.STRING(60), allowNull: false },
        carrier: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
        receivedAt: { type: DataTypes.DATE, allowNull: false },
        replacementForNcrId: DataTypes.INTEGER,
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'shipments', underscored: true, updatedAt: false },
    );
  }
}
