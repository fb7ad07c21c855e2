import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { INSPECTION_LEVELS } from '../../shared/schemas/purchasing';
import type { PartSpec } from '../../shared/schemas/spec';
import type { Part } from './Part';
import type { PurchaseOrder } from './PurchaseOrder';

/** A line of a PO. `spec` is the part's specification as it was when the line was ordered. */
export class PurchaseOrderLine extends Model<InferAttributes<PurchaseOrderLine>, InferCreationAttributes<PurchaseOrderLine>> {
  declare id: CreationOptional<number>;
  declare purchaseOrderId: number;
  declare lineNumber: number;
  declare partId: number;
  declare quantity: number;
  declare unitPrice: number;
  declare inspectionLevel: (typeof INSPECTION_LEVELS)[number];
  declare aql: number;
  declare hundredPercent: CreationOptional<boolean>;
  declare spec: PartSpec;
  /** When the supplier promised the line's pieces (YYYY-MM-DD); null when no date was agreed. */
  declare dueOn: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare part?: NonAttribute<Part>;
  declare purchaseOrder?: NonAttribute<PurchaseOrder>;

  static initModel(sequelize: Sequelize) {
    // pg returns numeric as strings; the getters give numbers back.
    const numeric = (name: 'unitPrice' | 'aql', precision: [number, number]) => ({
      type: DataTypes.DECIMAL(...precision),
      allowNull: false,
      get(this: PurchaseOrderLine) {
        return Number(this.getDataValue(name));
      },
    });
    PurchaseOrderLine.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        purchaseOrderId: { type: DataTypes.INTEGER, allowNull: false },
        partId: { type: DataTypes.INTEGER, allowNull: false },
        lineNumber: { type: DataTypes.INTEGER, allowNull: false },
        quantity: { type: DataTypes.INTEGER, allowNull: false },
        unitPrice: numeric('unitPrice', [12, 2]),
        inspectionLevel: { type: DataTypes.STRING(4), allowNull: false },
        aql: numeric('aql', [6, 3]),
        hundredPercent: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        spec: { type: DataTypes.JSONB, allowNull: false },
        dueOn: { type: DataTypes.DATEONLY, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'purchase_order_lines', underscored: true },
    );
  }
}
