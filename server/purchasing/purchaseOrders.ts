// Purchase orders. A line copies its part's specification when it is ordered; editing the PO later
// never rewrites that copy (only a line whose part is changed before anything arrived takes the new
// part's). Lines that have received pieces keep their part and cannot fall below what arrived.
import { QueryTypes, type Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { Part, PurchaseOrder, PurchaseOrderLine, Supplier, User } from '../../db/models';
import { purchaseOrderInputSchema, type PurchaseOrderInput } from '../../shared/schemas/purchasing';
import { recordAudit, type AuditActor } from '../audit/record';
import { badRequest, conflict, notFound } from '../http/errors';
import { containing } from '../http/list';
import { pieceQuantities, pieceQuantitiesSql, receivedAsOrderedSql, replacedPiecesSql } from '../stock/standing';

type ParsedInput = ReturnType<typeof purchaseOrderInputSchema.parse>;

async function checkSupplier(supplierId: number, transaction: Transaction) {
  const supplier = await Supplier.findByPk(supplierId, { transaction });
  if (!supplier) throw badRequest('The supplier does not exist', [{ path: 'supplierId', message: 'Choose a supplier' }]);
  return supplier;
}

/** The parts of the lines, refusing unknown or retired ones with the line they are on. */
async function partsOf(input: ParsedInput, transaction: Transaction, existing: Map<number, PurchaseOrderLine>) {
  const parts = new Map((await Part.findAll({ where: { id: [...new Set(input.lines.map((l) => l.partId))] }, transaction })).map((p) => [p.id, p]));
  const problems = input.lines.flatMap((line, index) => {
    const part = parts.get(line.partId);
    const unchanged = line.id !== undefined && existing.get(line.id)?.partId === line.partId;
    if (!part) return [{ path: `lines.${index}.partId`, message: 'This part does not exist' }];
    if (!part.active && !unchanged) return [{ path: `lines.${index}.partId`, message: `Part ${part.number} is no longer ordered` }];
    return [];
  });
  if (problems.length) throw badRequest('Some lines name parts that cannot be ordered', problems);
  return parts;
}

/** Pieces received so far as ordered per line of a PO (replacements apart). */
export async function receivedByLine(purchaseOrderId: number, transaction?: Transaction) {
  const rows = await sequelize.query<{ lineId: number; received: string }>(
    `SELECT pol.id AS "lineId", ${receivedAsOrderedSql('ol.po_line_id = pol.id')} AS received
       FROM purchase_order_lines pol WHERE pol.purchase_order_id = :purchaseOrderId`,
    { type: QueryTypes.SELECT, replacements: { purchaseOrderId }, transaction },
  );
  return new Map(rows.map((r) => [Number(r.lineId), Number(r.received)]));
}

/** Accepted, nonconforming, returned and replacement pieces per line of a PO. */
async function outcomesByLine(purchaseOrderId: number) {
  const rows = await sequelize.query<Record<string, unknown>>(
    `SELECT pol.id AS "lineId", q.*, ${replacedPiecesSql('rl.po_line_id = pol.id')} AS replaced
       FROM purchase_order_lines pol CROSS JOIN LATERAL ${pieceQuantitiesSql('ql.po_line_id = pol.id')} AS q
      WHERE pol.purchase_order_id = :purchaseOrderId`,
    { type: QueryTypes.SELECT, replacements: { purchaseOrderId } },
  );
  return new Map(rows.map((r) => [Number(r.lineId), { ...pieceQuantities(r), replaced: Number(r.replaced) }]));
}

const lineFields = (line: ParsedInput['lines'][number]) => ({
  partId: line.partId,
  quantity: line.quantity,
  unitPrice: line.unitPrice,
  inspectionLevel: line.inspectionLevel,
  aql: line.aql,
  hundredPercent: line.hundredPercent,
  dueOn: line.dueOn ?? null,
});

export function createPurchaseOrder(actor: AuditActor, rawInput: PurchaseOrderInput) {
  const input = purchaseOrderInputSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    const supplier = await checkSupplier(input.supplierId, transaction);
    if (!supplier.active) throw badRequest(`${supplier.name} is no longer an active supplier`, [{ path: 'supplierId', message: 'Choose an active supplier' }]);
    if (input.lines.some((l) => l.id !== undefined)) throw badRequest('A new PO cannot name existing lines');
    const parts = await partsOf(input, transaction, new Map());
    const order = await PurchaseOrder.create(
      {
        number: input.number,
        supplierId: supplier.id,
        buyerId: actor.id,
        orderedOn: input.orderedOn,
        currency: input.currency,
        status: input.status,
        notes: input.notes,
      },
      { transaction },
    );
    await PurchaseOrderLine.bulkCreate(
      input.lines.map((line, index) => ({ ...lineFields(line), purchaseOrderId: order.id, lineNumber: index + 1, spec: parts.get(line.partId)!.spec })),
      { transaction },
    );
    await recordAudit(actor, { action: 'purchase-order.create', entityType: 'purchase-order', entityId: order.id, after: input }, transaction);
    return order;
  });
}

export function updatePurchaseOrder(actor: AuditActor, id: number, rawInput: PurchaseOrderInput) {
  const input = purchaseOrderInputSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    const order = await PurchaseOrder.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!order) throw notFound('Purchase order');
    const lines = await PurchaseOrderLine.findAll({ where: { purchaseOrderId: id }, order: [['lineNumber', 'ASC']], transaction });
    const existing = new Map(lines.map((l) => [l.id, l]));
    const received = await receivedByLine(id, transaction);
    const anythingReceived = [...received.values()].some((n) => n > 0);
    if (input.supplierId !== order.supplierId) {
      if (anythingReceived) throw conflict('Shipments have been received against this PO; its supplier cannot change');
      await checkSupplier(input.supplierId, transaction);
    }
    const parts = await partsOf(input, transaction, existing);
    const before = { ...order.get({ plain: true }), lines: lines.map((l) => l.get({ plain: true })) };

    const problems: { path: string; message: string }[] = [];
    input.lines.forEach((line, index) => {
      if (line.id === undefined) return;
      const current = existing.get(line.id);
      const got = received.get(line.id) ?? 0;
      if (!current) problems.push({ path: `lines.${index}.id`, message: 'This line is not on the PO' });
      else if (got > 0 && current.partId !== line.partId)
        problems.push({ path: `lines.${index}.partId`, message: `Line ${current.lineNumber} has received pieces; its part cannot change` });
      else if (line.quantity < got) problems.push({ path: `lines.${index}.quantity`, message: `Line ${current.lineNumber} has already received ${got}` });
    });
    const kept = new Set(input.lines.map((l) => l.id).filter((lineId) => lineId !== undefined));
    for (const line of lines) {
      if (!kept.has(line.id) && (received.get(line.id) ?? 0) > 0)
        problems.push({ path: 'lines', message: `Line ${line.lineNumber} has received pieces and cannot be removed` });
    }
    if (problems.length) throw conflict('The PO cannot be changed that way', problems);

    await PurchaseOrderLine.destroy({ where: { id: lines.filter((l) => !kept.has(l.id)).map((l) => l.id) }, transaction });
    let nextNumber = Math.max(0, ...lines.map((l) => l.lineNumber)) + 1;
    for (const line of input.lines) {
      const current = line.id === undefined ? undefined : existing.get(line.id);
      if (current) {
        const partChanged = current.partId !== line.partId;
        current.set({ ...lineFields(line), ...(partChanged ? { spec: parts.get(line.partId)!.spec } : {}) });
        await current.save({ transaction });
      } else {
        await PurchaseOrderLine.create(
          { ...lineFields(line), purchaseOrderId: id, lineNumber: nextNumber++, spec: parts.get(line.partId)!.spec },
          { transaction },
        );
      }
    }
    order.set({
      number: input.number,
      supplierId: input.supplierId,
      orderedOn: input.orderedOn,
      currency: input.currency,
      status: input.status,
      notes: input.notes,
    });
    await order.save({ transaction });
    await recordAudit(actor, { action: 'purchase-order.update', entityType: 'purchase-order', entityId: id, before, after: input }, transaction);
    return order;
  });
}

export async function findPurchaseOrder(id: number) {
  const order = await PurchaseOrder.findByPk(id, {
    include: [
      { model: Supplier, as: 'supplier' },
      { model: User, as: 'buyer' },
      { model: PurchaseOrderLine, as: 'lines', include: [{ model: Part, as: 'part' }] },
    ],
    order: [[{ model: PurchaseOrderLine, as: 'lines' }, 'lineNumber', 'ASC']],
  });
  if (!order) throw notFound('Purchase order');
  return { order, received: await receivedByLine(id), outcomes: await outcomesByLine(id) };
}
export type PurchaseOrderRecord = Awaited<ReturnType<typeof findPurchaseOrder>>;

/** Lines of open POs, for the clerk to receive against; `q` matches PO, supplier or part. */
export async function openLines(q?: string) {
  return sequelize.query<Record<string, unknown>>(
    `SELECT pol.id, po.number AS "poNumber", pol.line_number AS "lineNumber", s.name AS "supplierName", p.number AS "partNumber",
            p.description AS "partDescription", pol.quantity,
            ${receivedAsOrderedSql('ol.po_line_id = pol.id')} AS received
       FROM purchase_order_lines pol
       JOIN purchase_orders po ON po.id = pol.purchase_order_id
       JOIN suppliers s ON s.id = po.supplier_id
       JOIN parts p ON p.id = pol.part_id
      WHERE po.status = 'open' ${q ? 'AND (po.number ILIKE :q OR s.name ILIKE :q OR p.number ILIKE :q)' : ''}
      ORDER BY po.number, pol.line_number
      LIMIT 200`,
    { type: QueryTypes.SELECT, replacements: { q: containing(q ?? '') } },
  );
}
