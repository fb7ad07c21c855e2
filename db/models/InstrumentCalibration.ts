import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** One calibration of an instrument (migration 1200). The newest record's dates are copied onto the
 * instrument by a trigger; records carried over from the instrument's former two dates have no
 * certificate and no recorder. */
export class InstrumentCalibration extends Model<InferAttributes<InstrumentCalibration>, InferCreationAttributes<InstrumentCalibration>> {
  declare id: CreationOptional<number>;
  declare instrumentId: number;
  declare calibratedOn: string;
  declare dueOn: string;
  declare performedBy: CreationOptional<string>;
  declare certificateNumber: CreationOptional<string>;
  declare uncertaintyRetardance: number | null;
  declare uncertaintyRetardanceUnit: 'waves' | 'nm' | null;
  declare uncertaintyAngleDeg: number | null;
  declare uncertaintyNote: CreationOptional<string>;
  declare certificateStorageKey: string | null;
  declare certificateName: string | null;
  declare certificateSizeBytes: number | null;
  declare carriedOver: CreationOptional<boolean>;
  declare recordedBy: number | null;
  declare recordedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    // pg returns numeric as strings; the getters give numbers (or null) back.
    const numeric = (name: 'uncertaintyRetardance' | 'uncertaintyAngleDeg', precision: [number, number]) => ({
      type: DataTypes.DECIMAL(...precision),
      allowNull: true,
      get(this: InstrumentCalibration) {
        const value = this.getDataValue(name);
        return value === null || value === undefined ? null : Number(value);
      },
    });
    InstrumentCalibration.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        instrumentId: { type: DataTypes.INTEGER, allowNull: false },
        calibratedOn: { type: DataTypes.DATEONLY, allowNull: false },
        dueOn: { type: DataTypes.DATEONLY, allowNull: false },
        performedBy: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' },
        certificateNumber: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
        uncertaintyRetardance: numeric('uncertaintyRetardance', [12, 6]),
        uncertaintyRetardanceUnit: { type: DataTypes.STRING(5), allowNull: true },
        uncertaintyAngleDeg: numeric('uncertaintyAngleDeg', [8, 4]),
        uncertaintyNote: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
        certificateStorageKey: { type: DataTypes.STRING(80), allowNull: true },
        certificateName: { type: DataTypes.STRING(255), allowNull: true },
        certificateSizeBytes: { type: DataTypes.INTEGER, allowNull: true },
        carriedOver: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        recordedBy: { type: DataTypes.INTEGER, allowNull: true },
        recordedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      },
      { sequelize, tableName: 'instrument_calibrations', underscored: true, timestamps: false },
    );
  }
}
