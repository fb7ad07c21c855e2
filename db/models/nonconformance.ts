// Models of nonconformance (see migration 1000): the defect-code catalogue, the NCR with its defect
// codes and pieces, the signed per-piece dispositions and the return-to-vendor shipments.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export type NcrOrigin = 'rejection' | 'sort' | 'accepted-lot' | 'found-later';
export type NcrStatus = 'open' | 'dispositioned' | 'closed';
export type NcrDecision = 'return-to-vendor' | 'scrap' | 'rework' | 'use-as-is' | 'rework-release';

export class RecordCounter extends Model<InferAttributes<RecordCounter>, InferCreationAttributes<RecordCounter>> {
  declare series: string;
  declare year: number;
  declare last: number;
}

export class DefectCode extends Model<InferAttributes<DefectCode>, InferCreationAttributes<DefectCode>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare label: string;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Nonconformance extends Model<InferAttributes<Nonconformance>, InferCreationAttributes<Nonconformance>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare origin: NcrOrigin;
  declare supplierId: number;
  declare partId: number;
  declare lotId: number | null;
  /** The signed lot decision that opened it (automatic NCRs only). */
  declare lotDispositionId: number | null;
  declare description: string;
  declare containment: CreationOptional<string>;
  declare ownerId: number | null;
  declare status: CreationOptional<NcrStatus>;
  declare openedBy: number | null;
  declare openedAt: CreationOptional<Date>;
  declare closedBy: CreationOptional<number | null>;
  declare closedAt: CreationOptional<Date | null>;
  declare closingNote: CreationOptional<string | null>;
  declare updatedAt: CreationOptional<Date>;
}

export class NonconformanceDefect extends Model<InferAttributes<NonconformanceDefect>, InferCreationAttributes<NonconformanceDefect>> {
  declare nonconformanceId: number;
  declare defectCodeId: number;
}

export class NonconformancePiece extends Model<InferAttributes<NonconformancePiece>, InferCreationAttributes<NonconformancePiece>> {
  declare nonconformanceId: number;
  declare pieceId: number;
  declare reasons: string[];
  declare dispositionId: CreationOptional<number | null>;
  declare returnId: CreationOptional<number | null>;
  /** The signed release of the piece after rework (migration 1001). */
  declare reworkReleaseId: CreationOptional<number | null>;
}

/** The pieces a signed NCR act covered (migration 1003). */
export class NcrDispositionPiece extends Model<InferAttributes<NcrDispositionPiece>, InferCreationAttributes<NcrDispositionPiece>> {
  declare dispositionId: number;
  declare pieceId: number;
}

export class NcrDisposition extends Model<InferAttributes<NcrDisposition>, InferCreationAttributes<NcrDisposition>> {
  declare id: CreationOptional<number>;
  declare nonconformanceId: number;
  declare decision: NcrDecision;
  declare meaning: string;
  declare deviationNumber: string | null;
  declare justification: string | null;
  declare note: string | null;
  declare signerId: number;
  declare signedAt: CreationOptional<Date>;
}

export class VendorReturn extends Model<InferAttributes<VendorReturn>, InferCreationAttributes<VendorReturn>> {
  declare id: CreationOptional<number>;
  declare nonconformanceId: number;
  declare rmaNumber: string;
  declare shipDate: string;
  declare carrier: string;
  declare tracking: CreationOptional<string>;
  declare remedy: 'credit' | 'replacement';
  declare creditAmount: number | null;
  declare note: CreationOptional<string>;
  declare createdBy: number;
  declare createdAt: CreationOptional<Date>;
}

export function initNonconformanceModels(sequelize: Sequelize) {
  const common = { sequelize, underscored: true };
  RecordCounter.init(
    {
      series: { type: DataTypes.STRING(20), primaryKey: true },
      year: { type: DataTypes.INTEGER, primaryKey: true },
      last: { type: DataTypes.INTEGER, allowNull: false },
    },
    { ...common, tableName: 'record_counters', timestamps: false },
  );
  DefectCode.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      code: { type: DataTypes.STRING(30), allowNull: false, unique: true },
      label: { type: DataTypes.STRING(120), allowNull: false },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { ...common, tableName: 'defect_codes' },
  );
  Nonconformance.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
      origin: { type: DataTypes.STRING(20), allowNull: false },
      supplierId: { type: DataTypes.INTEGER, allowNull: false },
      partId: { type: DataTypes.INTEGER, allowNull: false },
      lotId: DataTypes.INTEGER,
      lotDispositionId: DataTypes.INTEGER,
      description: { type: DataTypes.TEXT, allowNull: false },
      containment: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      ownerId: DataTypes.INTEGER,
      status: { type: DataTypes.STRING(14), allowNull: false, defaultValue: 'open' },
      openedBy: DataTypes.INTEGER,
      openedAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
      closedBy: DataTypes.INTEGER,
      closedAt: DataTypes.DATE,
      closingNote: DataTypes.TEXT,
      updatedAt: DataTypes.DATE,
    },
    { ...common, tableName: 'nonconformances', createdAt: false },
  );
  NonconformanceDefect.init(
    { nonconformanceId: { type: DataTypes.INTEGER, primaryKey: true }, defectCodeId: { type: DataTypes.INTEGER, primaryKey: true } },
    { ...common, tableName: 'nonconformance_defects', timestamps: false },
  );
  NonconformancePiece.init(
    {
      nonconformanceId: { type: DataTypes.INTEGER, primaryKey: true },
      pieceId: { type: DataTypes.INTEGER, primaryKey: true },
      reasons: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
      dispositionId: DataTypes.INTEGER,
      returnId: DataTypes.INTEGER,
      reworkReleaseId: DataTypes.INTEGER,
    },
    { ...common, tableName: 'nonconformance_pieces', timestamps: false },
  );
  NcrDisposition.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      nonconformanceId: { type: DataTypes.INTEGER, allowNull: false },
      decision: { type: DataTypes.STRING(20), allowNull: false },
      meaning: { type: DataTypes.TEXT, allowNull: false },
      deviationNumber: DataTypes.STRING(60),
      justification: DataTypes.TEXT,
      note: DataTypes.TEXT,
      signerId: { type: DataTypes.INTEGER, allowNull: false },
      signedAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
    },
    { ...common, tableName: 'ncr_dispositions', timestamps: false },
  );
  NcrDispositionPiece.init(
    { dispositionId: { type: DataTypes.INTEGER, primaryKey: true }, pieceId: { type: DataTypes.INTEGER, primaryKey: true } },
    { ...common, tableName: 'ncr_disposition_pieces', timestamps: false },
  );
  VendorReturn.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      nonconformanceId: { type: DataTypes.INTEGER, allowNull: false },
      rmaNumber: { type: DataTypes.STRING(40), allowNull: false },
      shipDate: { type: DataTypes.DATEONLY, allowNull: false },
      carrier: { type: DataTypes.STRING(80), allowNull: false },
      tracking: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
      remedy: { type: DataTypes.STRING(12), allowNull: false },
      creditAmount: {
        type: DataTypes.DECIMAL(12, 2),
        get(this: VendorReturn) {
          const raw = this.getDataValue('creditAmount');
          return raw === null || raw === undefined ? raw : Number(raw);
        },
      },
      note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      createdBy: { type: DataTypes.INTEGER, allowNull: false },
      createdAt: DataTypes.DATE,
    },
    { ...common, tableName: 'vendor_returns', updatedAt: false },
  );
  return { RecordCounter, DefectCode, Nonconformance, NonconformanceDefect, NonconformancePiece, NcrDisposition, NcrDispositionPiece, VendorReturn };
}
