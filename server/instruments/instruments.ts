import { inTransaction } from '../../db';
import { Instrument } from '../../db/models';
import { instrumentInputSchema, type InstrumentInput } from '../../shared/schemas/instruments';
import { recordAudit, type AuditActor } from '../audit/record';
import { notFound } from '../http/errors';
import { presentInstrument } from './views';

export const listInstruments = () => Instrument.findAll({ order: [['code', 'ASC']] });

export function registerInstrument(actor: AuditActor, input: InstrumentInput) {
  return inTransaction(async (transaction) => {
    const instrument = await Instrument.create(instrumentInputSchema.parse(input), { transaction });
    await recordAudit(
      actor,
      { action: 'instrument.create', entityType: 'instrument', entityId: instrument.id, after: presentInstrument(instrument) },
      transaction,
    );
    return instrument;
  });
}

export function updateInstrument(actor: AuditActor, id: number, input: InstrumentInput) {
  return inTransaction(async (transaction) => {
    const instrument = await Instrument.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!instrument) throw notFound('Instrument');
    const before = presentInstrument(instrument);
    instrument.set(instrumentInputSchema.parse(input));
    await instrument.save({ transaction });
    await recordAudit(
      actor,
      { action: 'instrument.update', entityType: 'instrument', entityId: id, before, after: presentInstrument(instrument) },
      transaction,
    );
    return instrument;
  });
}
