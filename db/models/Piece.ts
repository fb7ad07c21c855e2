import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { PieceState } from '../../shared/schemas/stock';
import type { Lot } from './Lot';

export class Piece extends Model<InferAttributes<Piece>, InferCreationAttributes<Piece>> {
  declare id: CreationOptional<number>;
  declare lotId: number;
  declare partId: number;
  declare serial: string;
  declare state: CreationOptional<PieceState>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare lot?: NonAttribute<Lot>;

  static initModel(sequelize: Sequelize) {
    Piece.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        lotId: { type: DataTypes.INTEGER, allowNull: false },
        partId: { type: DataTypes.INTEGER, allowNull: false },
        serial: { type: DataTypes.STRING(80), allowNull: false },
        state: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'quarantine' },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'pieces', underscored: true },
    );
  }
}
