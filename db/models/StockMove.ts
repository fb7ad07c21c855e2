import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { MoveReason } from '../../shared/schemas/stock';

const refuseRewrite = () => {
  throw new Error('The stock ledger is append-only: record a new move instead');
};

/** One row of the stock ledger. Rows are only ever added (the table refuses UPDATE and DELETE too). */
export class StockMove extends Model<InferAttributes<StockMove>, InferCreationAttributes<StockMove>> {
  declare id: CreationOptional<number>;
  declare pieceId: number;
  declare fromLocationId: number | null;
  declare toLocationId: number | null;
  declare reason: MoveReason;
  declare workOrder: string | null;
  declare note: string | null;
  declare actorId: number | null;
  declare movedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    StockMove.init(
      {
        id: {
          type: DataTypes.BIGINT,
          autoIncrement: true,
          primaryKey: true,
          get(this: StockMove) {
            return Number(this.getDataValue('id'));
          },
        },
        pieceId: { type: DataTypes.INTEGER, allowNull: false },
        fromLocationId: { type: DataTypes.INTEGER, allowNull: true },
        toLocationId: { type: DataTypes.INTEGER, allowNull: true },
        actorId: { type: DataTypes.INTEGER, allowNull: true },
        reason: { type: DataTypes.STRING(20), allowNull: false },
        workOrder: { type: DataTypes.STRING(40), allowNull: true },
        note: { type: DataTypes.TEXT, allowNull: true },
        movedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      },
      {
        sequelize,
        tableName: 'stock_moves',
        underscored: true,
        timestamps: false,
        hooks: { beforeUpdate: refuseRewrite, beforeDestroy: refuseRewrite, beforeBulkUpdate: refuseRewrite, beforeBulkDestroy: refuseRewrite },
      },
    );
  }
}
