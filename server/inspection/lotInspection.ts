// What the inspection page of a lot reads: the lot with its evaluation, its bench files, decisions and
// documents, the supplier/part's switching state, and the names of the people and instruments named.
import { DispositionRecord, Instrument, LotDocument, MeasurementFile, User } from '../../db/models';
import { evaluateLot } from './evaluation';
import { lotForInspection } from './lotAccess';
import { switchingStateOf } from './sampling';

export async function findLotInspection(lotId: number) {
  const lot = await lotForInspection(lotId);
  const evaluation = await evaluateLot(lot);
  const [files, dispositions, documents, switching] = await Promise.all([
    MeasurementFile.findAll({ where: { lotId }, order: [['id', 'DESC']] }),
    DispositionRecord.findAll({ where: { lotId }, order: [['id', 'DESC']] }),
    LotDocument.findAll({ where: { lotId }, order: [['id', 'DESC']] }),
    switchingStateOf(lot.supplier.id, lot.part.id),
  ]);
  const people = new Map(
    (await User.findAll({ where: { id: [...new Set([...files.map((f) => f.uploadedBy), ...dispositions.map((d) => d.signerId)])] } })).map((u) => [
      u.id,
      u.name,
    ]),
  );
  const instruments = new Map((await Instrument.findAll()).map((i) => [i.id, i.code]));
  return { lot, evaluation, files, dispositions, documents, switching, people, instruments };
}
export type LotInspectionRecord = Awaited<ReturnType<typeof findLotInspection>>;
