import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { LotState } from '../../shared/schemas/stock';
import type { Part } from './Part';
import type { Piece } from './Piece';
import type { PurchaseOrderLine } from './PurchaseOrderLine';
import type { Shipment } from './Shipment';

export class Lot extends Model<InferAttributes<Lot>, InferCreationAttributes<Lot>> {
  declare id: CreationOptional<number>;
  declare shipmentId: number;
  declare poLineId: number;
  declare partId: number;
  declare supplierLot: string;
  declare quantity: number;
  declare state: CreationOptional<LotState>;
  declare overReceiptReason: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare shipment?: NonAttribute<Shipment>;
  declare line?: NonAttribute<PurchaseOrderLine>;
  declare part?: NonAttribute<Part>;
  declare pieces?: NonAttribute<Piece[]>;

  static initModel(sequelize: Sequelize) {
    Lot.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        shipmentId: { type: DataTypes.INTEGER, allowNull: false },
        poLineId: { type: DataTypes.INTEGER, allowNull: false },
        partId: { type: DataTypes.INTEGER, allowNull: false },
        supplierLot: { type: DataTypes.STRING(60), allowNull: false },
        quantity: { type: DataTypes.INTEGER, allowNull: false },
        state: { type: DataTypes.STRING(24), allowNull: false, defaultValue: 'quarantine' },
        overReceiptReason: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'lots', underscored: true },
    );
  }
}
