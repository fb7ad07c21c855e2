import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { AttachmentKind } from '../../shared/schemas/receiving';

/** A file that came with a shipment; the bytes live in the blob store under their SHA-256. */
export class Attachment extends Model<InferAttributes<Attachment>, InferCreationAttributes<Attachment>> {
  declare id: CreationOptional<number>;
  declare shipmentId: number;
  declare lotId: number | null;
  declare kind: AttachmentKind;
  declare originalName: string;
  declare mediaType: string;
  declare sizeBytes: number;
  declare sha256: string;
  declare uploadedBy: number | null;
  declare uploadedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Attachment.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        shipmentId: { type: DataTypes.INTEGER, allowNull: false },
        lotId: { type: DataTypes.INTEGER, allowNull: true },
        uploadedBy: { type: DataTypes.INTEGER, allowNull: true },
        kind: { type: DataTypes.STRING(20), allowNull: false },
        originalName: { type: DataTypes.STRING(255), allowNull: false },
        mediaType: { type: DataTypes.STRING(60), allowNull: false },
        sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
        sha256: { type: DataTypes.CHAR(64), allowNull: false },
        uploadedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      },
      { sequelize, tableName: 'attachments', underscored: true, timestamps: false },
    );
  }
}
