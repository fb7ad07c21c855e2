// Models of inspection (see migration 0205): plan and sample, bench files, readings, results,
// switching state, dispositions and the documents they issue.
import type { Disposition } from '../../shared/inspection/lotVerdict';
import type { LotResult } from '../../shared/sampling';
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

const numberGetter = (field: string) => ({
  get(this: Model) {
    const raw = this.getDataValue(field);
    return raw === null || raw === undefined ? raw : Number(raw);
  },
});

export class LotInspection extends Model<InferAttributes<LotInspection>, InferCreationAttributes<LotInspection>> {
  declare id: CreationOptional<number>;
  declare lotId: number;
  declare severity: 'normal' | 'tightened' | 'reduced';
  declare inspectionLevel: string;
  declare aql: number;
  /** Table 1's code letter of the lot size at the inspection level. */
  declare codeLetter: string;
  /** The letter whose plan is used: the row the table's arrow leads to (codeLetter when no arrow). */
  declare planLetter: string;
  declare sampleSize: number;
  declare acceptNumber: number;
  declare rejectNumber: number;
  declare hundredPercent: boolean;
  declare sampleSeed: string;
  declare createdAt: CreationOptional<Date>;
}

export class SamplePiece extends Model<InferAttributes<SamplePiece>, InferCreationAttributes<SamplePiece>> {
  declare inspectionId: number;
  declare pieceId: number;
}

export class SwitchingStateRecord extends Model<InferAttributes<SwitchingStateRecord>, InferCreationAttributes<SwitchingStateRecord>> {
  declare supplierId: number;
  declare partId: number;
  declare state: unknown;
  declare updatedAt: CreationOptional<Date>;
}

export class SwitchingEvent extends Model<InferAttributes<SwitchingEvent>, InferCreationAttributes<SwitchingEvent>> {
  declare id: CreationOptional<number>;
  declare supplierId: number;
  declare partId: number;
  declare lotId: number | null;
  declare kind: 'lot' | 'resume' | 'override';
  /** Place in the supplier-part's sequence; a superseding lot result takes the place of the one it replaces. */
  declare position: number;
  declare result: LotResult | null;
  declare reducedEnabled: boolean | null;
  declare dispositionId: number | null;
  declare severity: 'normal' | 'tightened' | 'reduced' | null;
  declare reason: string | null;
  declare reference: string | null;
  /** A resumption's accepted corrective-action request, when it rests on one. */
  declare correctiveActionId: CreationOptional<number | null>;
  declare actorId: number | null;
  declare before: unknown;
  declare after: unknown;
  declare explanation: string;
  declare supersededAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
}

export class MeasurementFile extends Model<InferAttributes<MeasurementFile>, InferCreationAttributes<MeasurementFile>> {
  declare id: CreationOptional<number>;
  declare lotId: number;
  declare instrumentId: number;
  declare originalName: string;
  declare sha256: string;
  declare sizeBytes: number;
  declare method: string;
  declare metadata: Record<string, string>;
  declare rowCount: number;
  declare warnings: { line: number; message: string }[];
  declare storageKey: string;
  declare uploadedBy: number;
  declare uploadedAt: CreationOptional<Date>;
}

export class Reading extends Model<InferAttributes<Reading>, InferCreationAttributes<Reading>> {
  declare id: CreationOptional<number>;
  declare fileId: number;
  declare line: number;
  declare serial: string;
  declare wavelengthNm: number | null;
  declare fields: Record<string, string>;
}

export class PieceResult extends Model<InferAttributes<PieceResult>, InferCreationAttributes<PieceResult>> {
  declare id: CreationOptional<number>;
  declare pieceId: number;
  declare fileId: number;
  declare wavelengthNm: number;
  declare verdict: 'pass' | 'fail' | 'incomplete';
  declare result: Record<string, unknown> & { reasons: string[] };
  declare supersededByFileId: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
}

export class DispositionRecord extends Model<InferAttributes<DispositionRecord>, InferCreationAttributes<DispositionRecord>> {
  declare id: CreationOptional<number>;
  declare lotId: number;
  declare decision: Disposition;
  declare meaning: string;
  declare deviationNumber: string | null;
  declare deviationId: number | null;
  declare justification: string | null;
  declare lotVerdict: unknown;
  declare signerId: number;
  declare signedAt: CreationOptional<Date>;
  declare supersedesId: number | null;
  declare supersededAt: CreationOptional<Date | null>;
}

export class LotDocument extends Model<InferAttributes<LotDocument>, InferCreationAttributes<LotDocument>> {
  declare id: CreationOptional<number>;
  declare lotId: number;
  declare dispositionId: number;
  declare kind: 'certificate' | 'inspection-report';
  declare number: string;
  declare dataHash: string;
  declare pdfSha256: string;
  declare storageKey: string;
  declare issuedAt: CreationOptional<Date>;
  declare revokedAt: CreationOptional<Date | null>;
}

export function initInspectionModels(sequelize: Sequelize) {
  const common = { sequelize, underscored: true };
  LotInspection.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      lotId: { type: DataTypes.INTEGER, allowNull: false },
      severity: { type: DataTypes.STRING(10), allowNull: false },
      inspectionLevel: { type: DataTypes.STRING(4), allowNull: false },
      aql: { type: DataTypes.DECIMAL(6, 3), allowNull: false, ...numberGetter('aql') },
      codeLetter: { type: DataTypes.CHAR(1), allowNull: false },
      planLetter: { type: DataTypes.CHAR(1), allowNull: false },
      sampleSize: { type: DataTypes.INTEGER, allowNull: false },
      acceptNumber: { type: DataTypes.INTEGER, allowNull: false },
      rejectNumber: { type: DataTypes.INTEGER, allowNull: false },
      hundredPercent: { type: DataTypes.BOOLEAN, allowNull: false },
      sampleSeed: { type: DataTypes.STRING(64), allowNull: false },
      createdAt: DataTypes.DATE,
    },
    { ...common, tableName: 'lot_inspections', updatedAt: false },
  );
  SamplePiece.init(
    { inspectionId: { type: DataTypes.INTEGER, primaryKey: true }, pieceId: { type: DataTypes.INTEGER, primaryKey: true } },
    { ...common, tableName: 'sample_pieces', timestamps: false },
  );
  SwitchingStateRecord.init(
    {
      supplierId: { type: DataTypes.INTEGER, primaryKey: true },
      partId: { type: DataTypes.INTEGER, primaryKey: true },
      state: { type: DataTypes.JSONB, allowNull: false },
      updatedAt: DataTypes.DATE,
    },
    { ...common, tableName: 'switching_states', createdAt: false },
  );
  SwitchingEvent.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      supplierId: { type: DataTypes.INTEGER, allowNull: false },
      partId: { type: DataTypes.INTEGER, allowNull: false },
      lotId: DataTypes.INTEGER,
      kind: { type: DataTypes.STRING(10), allowNull: false },
      position: { type: DataTypes.INTEGER, allowNull: false },
      result: DataTypes.JSONB,
      reducedEnabled: DataTypes.BOOLEAN,
      dispositionId: DataTypes.INTEGER,
      severity: DataTypes.STRING(10),
      reason: DataTypes.TEXT,
      reference: DataTypes.STRING(80),
      correctiveActionId: DataTypes.INTEGER,
      actorId: DataTypes.INTEGER,
      before: { type: DataTypes.JSONB, allowNull: false },
      after: { type: DataTypes.JSONB, allowNull: false },
      explanation: { type: DataTypes.TEXT, allowNull: false },
      supersededAt: DataTypes.DATE,
      createdAt: DataTypes.DATE,
    },
    { ...common, tableName: 'switching_events', updatedAt: false },
  );
  MeasurementFile.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      lotId: { type: DataTypes.INTEGER, allowNull: false },
      instrumentId: { type: DataTypes.INTEGER, allowNull: false },
      originalName: { type: DataTypes.STRING(255), allowNull: false },
      sha256: { type: DataTypes.CHAR(64), allowNull: false },
      sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
      method: { type: DataTypes.STRING(10), allowNull: false },
      metadata: { type: DataTypes.JSONB, allowNull: false },
      rowCount: { type: DataTypes.INTEGER, allowNull: false },
      warnings: { type: DataTypes.JSONB, allowNull: false },
      storageKey: { type: DataTypes.STRING(80), allowNull: false },
      uploadedBy: { type: DataTypes.INTEGER, allowNull: false },
      uploadedAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
    },
    { ...common, tableName: 'measurement_files', timestamps: false },
  );
  Reading.init(
    {
      id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
      fileId: { type: DataTypes.INTEGER, allowNull: false },
      line: { type: DataTypes.INTEGER, allowNull: false },
      serial: { type: DataTypes.STRING(80), allowNull: false },
      wavelengthNm: { type: DataTypes.DECIMAL(9, 3), ...numberGetter('wavelengthNm') },
      fields: { type: DataTypes.JSONB, allowNull: false },
    },
    { ...common, tableName: 'readings', timestamps: false },
  );
  PieceResult.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      pieceId: { type: DataTypes.INTEGER, allowNull: false },
      fileId: { type: DataTypes.INTEGER, allowNull: false },
      wavelengthNm: { type: DataTypes.DECIMAL(9, 3), allowNull: false, ...numberGetter('wavelengthNm') },
      verdict: { type: DataTypes.STRING(12), allowNull: false },
      result: { type: DataTypes.JSONB, allowNull: false },
      supersededByFileId: DataTypes.INTEGER,
      createdAt: DataTypes.DATE,
    },
    { ...common, tableName: 'piece_results', updatedAt: false },
  );
  DispositionRecord.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      lotId: { type: DataTypes.INTEGER, allowNull: false },
      decision: { type: DataTypes.STRING(12), allowNull: false },
      meaning: { type: DataTypes.TEXT, allowNull: false },
      deviationNumber: DataTypes.STRING(60),
      deviationId: DataTypes.INTEGER,
      justification: DataTypes.TEXT,
      lotVerdict: { type: DataTypes.JSONB, allowNull: false },
      signerId: { type: DataTypes.INTEGER, allowNull: false },
      signedAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
      supersedesId: DataTypes.INTEGER,
      supersededAt: DataTypes.DATE,
    },
    { ...common, tableName: 'dispositions', timestamps: false },
  );
  LotDocument.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      lotId: { type: DataTypes.INTEGER, allowNull: false },
      dispositionId: { type: DataTypes.INTEGER, allowNull: false },
      kind: { type: DataTypes.STRING(20), allowNull: false },
      number: { type: DataTypes.STRING(40), allowNull: false },
      dataHash: { type: DataTypes.CHAR(64), allowNull: false },
      pdfSha256: { type: DataTypes.CHAR(64), allowNull: false },
      storageKey: { type: DataTypes.STRING(80), allowNull: false },
      issuedAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
      revokedAt: DataTypes.DATE,
    },
    { ...common, tableName: 'lot_documents', timestamps: false },
  );
  return { LotInspection, SamplePiece, SwitchingStateRecord, SwitchingEvent, MeasurementFile, Reading, PieceResult, DispositionRecord, LotDocument };
}
