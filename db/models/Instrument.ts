import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export class Instrument extends Model<InferAttributes<Instrument>, InferCreationAttributes<Instrument>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare kind: 'stokes-polarimeter' | 'rotating-plate' | 'direct-retardance';
  declare description: string;
  declare s3Sign: 1 | -1;
  declare angleSign: 1 | -1;
  declare uncertaintyWaves: number;
  declare uncertaintyDeg: number;
  /** The newest calibration record's dates, kept by a trigger (migration 1200); written only through
   * a record, the first one with the instrument's registration. */
  declare calibratedOn: string;
  declare calibrationDueOn: string;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  /** Whether the newest calibration covers `day` (YYYY-MM-DD). Bench files are checked against every
   * record instead (an older calibration covers the days it was in force). */
  newestCalibrationCovers(day: string) {
    return day >= this.calibratedOn && day <= this.calibrationDueOn;
  }

  static initModel(sequelize: Sequelize) {
    // pg returns numeric as strings; the getters give numbers back.
    const numeric = (name: 'uncertaintyWaves' | 'uncertaintyDeg', precision: [number, number]) => ({
      type: DataTypes.DECIMAL(...precision),
      allowNull: false,
      get(this: Instrument) {
        return Number(this.getDataValue(name));
      },
    });
    Instrument.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        code: { type: DataTypes.STRING(40), allowNull: false, unique: true },
        kind: { type: DataTypes.STRING(30), allowNull: false },
        description: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' },
        s3Sign: { type: DataTypes.SMALLINT, allowNull: false, defaultValue: 1 },
        angleSign: { type: DataTypes.SMALLINT, allowNull: false, defaultValue: 1 },
        uncertaintyWaves: numeric('uncertaintyWaves', [8, 6]),
        uncertaintyDeg: numeric('uncertaintyDeg', [8, 4]),
        calibratedOn: { type: DataTypes.DATEONLY, allowNull: false },
        calibrationDueOn: { type: DataTypes.DATEONLY, allowNull: false },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'instruments', underscored: true },
    );
  }
}
