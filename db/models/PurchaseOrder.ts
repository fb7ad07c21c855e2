import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { PoStatus } from '../../shared/schemas/purchasing';
import type { PurchaseOrderLine } from './PurchaseOrderLine';
import type { Supplier } from './Supplier';
import type { User } from './User';

export class PurchaseOrder extends Model<InferAttributes<PurchaseOrder>, InferCreationAttributes<PurchaseOrder>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare supplierId: number;
  declare buyerId: number | null;
  declare orderedOn: string;
  declare currency: string;
  declare status: CreationOptional<PoStatus>;
  declare notes: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare supplier?: NonAttribute<Supplier>;
  declare buyer?: NonAttribute<User | null>;
  declare lines?: NonAttribute<PurchaseOrderLine[]>;

  static initModel(sequelize: Sequelize) {
    PurchaseOrder.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
        supplierId: { type: DataTypes.INTEGER, allowNull: false },
        buyerId: { type: DataTypes.INTEGER, allowNull: true },
        orderedOn: { type: DataTypes.DATEONLY, allowNull: false },
        currency: { type: DataTypes.CHAR(3), allowNull: false },
        status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'purchase_orders', underscored: true },
    );
  }
}
