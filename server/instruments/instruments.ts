import { inTransaction } from '../../db';
import { Instrument } from '../../db/models';
import { instrumentInputSchema, instrumentUpdateSchema, type InstrumentInput, type InstrumentUpdate } from '../../shared/schemas/instruments';
import { recordAudit, type AuditActor } from '../audit/record';
import { notFound } from '../http/errors';
import { addCalibration } from './calibrations';
import { presentInstrument } from './views';

export const listInstruments = () => Instrument.findAll({ order: [['code', 'ASC']] });

/** Registers an instrument with its current calibration, which becomes its first calibration record. */
export function registerInstrument(actor: AuditActor, input: InstrumentInput, performedBy = 'Not stated at registration') {
  return inTransaction(async (transaction) => {
    const parsed = instrumentInputSchema.parse(input);
    const instrument = await Instrument.create(parsed, { transaction });
    await recordAudit(
      actor,
      { action: 'instrument.create', entityType: 'instrument', entityId: instrument.id, after: presentInstrument(instrument) },
      transaction,
    );
    await addCalibration(actor, instrument.id, { calibratedOn: parsed.calibratedOn, dueOn: parsed.calibrationDueOn, performedBy }, undefined, transaction);
    return instrument;
  });
}

/** Edits the entry; its calibration dates change only by recording a calibration. */
export function updateInstrument(actor: AuditActor, id: number, input: InstrumentUpdate) {
  return inTransaction(async (transaction) => {
    const instrument = await Instrument.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!instrument) throw notFound('Instrument');
    const before = presentInstrument(instrument);
    instrument.set(instrumentUpdateSchema.parse(input));
    await instrument.save({ transaction });
    await recordAudit(
      actor,
      { action: 'instrument.update', entityType: 'instrument', entityId: id, before, after: presentInstrument(instrument) },
      transaction,
    );
    return instrument;
  });
}
