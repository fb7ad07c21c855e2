// An instrument's page: its entry and its calibration records, newest first, each with its standing.
import { standingOf } from '../../../shared/calibration';
import type { CalibrationView, InstrumentDetailView } from '../../../shared/schemas/instruments';
import type { CalibrationRecord, InstrumentRecord } from '../../instruments/calibrations';
import { presentInstrument } from '../../instruments/views';

function presentCalibration(c: CalibrationRecord, newest: CalibrationRecord | undefined): CalibrationView {
  return {
    id: c.id,
    calibratedOn: c.calibratedOn,
    dueOn: c.dueOn,
    performedBy: c.performedBy,
    certificateNumber: c.certificateNumber,
    uncertaintyRetardance: c.uncertaintyRetardance,
    uncertaintyRetardanceUnit: c.uncertaintyRetardanceUnit,
    uncertaintyAngleDeg: c.uncertaintyAngleDeg,
    uncertaintyNote: c.uncertaintyNote,
    certificate: c.certificateName && c.certificateSizeBytes !== null ? { name: c.certificateName, sizeBytes: c.certificateSizeBytes } : null,
    carriedOver: c.carriedOver,
    recordedBy: c.recorder,
    recordedAt: c.recordedAt.toISOString(),
    standing: standingOf(c, newest),
  };
}

export function presentInstrumentDetail({ instrument, calibrations }: InstrumentRecord): InstrumentDetailView {
  return { ...presentInstrument(instrument), calibrations: calibrations.map((c) => presentCalibration(c, calibrations[0])) };
}
