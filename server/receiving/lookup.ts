// What a scanned or typed code names: a serial, a lot (L-8) or a PO number, limited to what the user
// may read. A code may name several things (a serial used by two parts, a PO numbered like a
// serial): every match is answered and the client lets the user choose. Look-ups are exact (each
// by its unique index); a PO number typed in lower case is also tried in upper case.
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import { can } from '../../shared/policies';
import type { LookupMatch } from '../../shared/schemas/labels';
import type { Role } from '../../shared/schemas/roles';
import { lotName } from '../../shared/schemas/stock';

const LOT_NAME = /^L-(\d{1,9})$/i;

export async function lookupCode(user: { roles: readonly Role[] }, code: string): Promise<LookupMatch[]> {
  const matches: LookupMatch[] = [];
  if (can(user, 'lots.read')) {
    const pieces = await sequelize.query<{ serial: string; partNumber: string; lotId: number }>(
      `SELECT p.serial, pt.number AS "partNumber", p.lot_id AS "lotId" FROM pieces p JOIN parts pt ON pt.id = p.part_id
        WHERE p.serial = :code ORDER BY pt.number`,
      { type: QueryTypes.SELECT, replacements: { code } },
    );
    for (const piece of pieces) matches.push({ kind: 'piece', ...piece, path: `/pieces/${encodeURIComponent(piece.serial)}` });
    const lotId = LOT_NAME.exec(code)?.[1];
    if (lotId) {
      const [lot] = await sequelize.query<{ id: number; partNumber: string }>(
        'SELECT l.id, pt.number AS "partNumber" FROM lots l JOIN parts pt ON pt.id = l.part_id WHERE l.id = :id',
        { type: QueryTypes.SELECT, replacements: { id: Number(lotId) } },
      );
      if (lot) matches.push({ kind: 'lot', lotId: lot.id, name: lotName(lot.id), partNumber: lot.partNumber, path: `/lots/${lot.id}` });
    }
  }
  if (can(user, 'catalog.read')) {
    const orders = await sequelize.query<{ id: number; number: string; supplierName: string }>(
      `SELECT po.id, po.number, s.name AS "supplierName" FROM purchase_orders po JOIN suppliers s ON s.id = po.supplier_id
        WHERE po.number IN (:code, upper(:code))`,
      { type: QueryTypes.SELECT, replacements: { code } },
    );
    for (const order of orders)
      matches.push({
        kind: 'purchase-order',
        purchaseOrderId: order.id,
        number: order.number,
        supplierName: order.supplierName,
        path: `/purchasing/orders/${order.id}`,
      });
  }
  return matches;
}
