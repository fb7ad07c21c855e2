import type { Transaction } from 'sequelize';
import { inTransaction } from '../../db';
import { PurchaseOrder, Supplier, User } from '../../db/models';
import { supplierInputSchema, type SupplierInput } from '../../shared/schemas/purchasing';
import { recordAudit, type AuditActor } from '../audit/record';
import { badRequest, notFound } from '../http/errors';

/** The owner must be an active buyer; without one, the buyer saving the supplier owns it. */
async function ownerFor(actor: AuditActor, ownerId: number | undefined, transaction: Transaction) {
  const id = ownerId ?? actor.id;
  if (id === null) throw badRequest('Name the buyer who owns the supplier');
  const owner = await User.findByPk(id, { transaction });
  if (!owner || !owner.active || !owner.hasRole('buyer'))
    throw badRequest('The owner of a supplier must be an active buyer', [{ path: 'ownerId', message: 'Choose an active buyer' }]);
  return owner.id;
}

const snapshot = (s: Supplier) => ({
  name: s.name,
  contactEmail: s.contactEmail,
  qualityContactEmail: s.qualityContactEmail,
  ownerId: s.ownerId,
  notes: s.notes,
  active: s.active,
});

export function createSupplier(actor: AuditActor, rawInput: SupplierInput) {
  const input = supplierInputSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    const supplier = await Supplier.create(
      { ...input, qualityContactEmail: input.qualityContactEmail || null, ownerId: await ownerFor(actor, input.ownerId, transaction) },
      { transaction },
    );
    await recordAudit(actor, { action: 'supplier.create', entityType: 'supplier', entityId: supplier.id, after: snapshot(supplier) }, transaction);
    return supplier;
  });
}

export function updateSupplier(actor: AuditActor, id: number, rawInput: SupplierInput) {
  const input = supplierInputSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    const supplier = await Supplier.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!supplier) throw notFound('Supplier');
    const before = snapshot(supplier);
    supplier.set({
      ...input,
      qualityContactEmail: input.qualityContactEmail || null,
      ownerId: await ownerFor(actor, input.ownerId ?? supplier.ownerId ?? undefined, transaction),
    });
    await supplier.save({ transaction });
    await recordAudit(actor, { action: 'supplier.update', entityType: 'supplier', entityId: id, before, after: snapshot(supplier) }, transaction);
    return supplier;
  });
}

export async function findSupplier(id: number) {
  const supplier = await Supplier.findByPk(id, { include: [{ model: User, as: 'owner' }] });
  if (!supplier) throw notFound('Supplier');
  const openOrders = await PurchaseOrder.count({ where: { supplierId: id, status: 'open' } });
  return { supplier, openOrders };
}
export type SupplierRecord = Awaited<ReturnType<typeof findSupplier>>;
