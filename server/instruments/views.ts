// An instrument as the API shows it, which is also what the audit trail records of one.
import type { Instrument } from '../../db/models';
import { todayUtc } from '../../shared/calibration';
import type { InstrumentView } from '../../shared/schemas/instruments';

export function presentInstrument(i: Instrument): InstrumentView {
  return {
    id: i.id,
    code: i.code,
    kind: i.kind,
    description: i.description,
    s3Sign: i.s3Sign,
    angleSign: i.angleSign,
    uncertaintyWaves: i.uncertaintyWaves,
    uncertaintyDeg: i.uncertaintyDeg,
    calibratedOn: i.calibratedOn,
    calibrationDueOn: i.calibrationDueOn,
    active: i.active,
    calibrationCurrent: i.newestCalibrationCovers(todayUtc()),
  };
}
