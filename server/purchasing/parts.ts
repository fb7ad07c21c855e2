import { QueryTypes } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { Part } from '../../db/models';
import { partInputSchema, type PartInput } from '../../shared/schemas/purchasing';
import { recordAudit, type AuditActor } from '../audit/record';
import { notFound } from '../http/errors';
import { onHandSql } from '../stock/onHand';

const snapshot = (p: Part) => ({ number: p.number, description: p.description, spec: p.spec, active: p.active });

export function createPart(actor: AuditActor, rawInput: PartInput) {
  const input = partInputSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    const part = await Part.create(input, { transaction });
    await recordAudit(actor, { action: 'part.create', entityType: 'part', entityId: part.id, after: snapshot(part) }, transaction);
    return part;
  });
}

/** Changes the part; PO lines already ordered keep the specification they were ordered with. */
export function updatePart(actor: AuditActor, id: number, rawInput: PartInput) {
  const input = partInputSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    const part = await Part.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!part) throw notFound('Part');
    const before = snapshot(part);
    part.set(input);
    await part.save({ transaction });
    await recordAudit(actor, { action: 'part.update', entityType: 'part', entityId: id, before, after: snapshot(part) }, transaction);
    return part;
  });
}

/** Pieces of the part now in stock bins. */
async function onHandOfPart(partId: number) {
  const [row] = await sequelize.query<{ onHand: string }>(`SELECT ${onHandSql(':partId')} AS "onHand"`, { type: QueryTypes.SELECT, replacements: { partId } });
  return Number(row.onHand);
}

export async function findPart(id: number) {
  const part = await Part.findByPk(id);
  if (!part) throw notFound('Part');
  return { part, onHand: await onHandOfPart(id) };
}
export type PartRecord = Awaited<ReturnType<typeof findPart>>;
