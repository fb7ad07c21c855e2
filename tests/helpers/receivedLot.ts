// A received lot for inspection tests: supplier, part, PO line with its frozen specification,
// shipment, lot in quarantine and its serialised pieces with their receipt moves, written straight
// to the receiving tables (the demo seed provides the locations) so these tests do not depend on the
// receiving screens; then its sampling plan, drawn as at receipt.
import { faker } from '@faker-js/faker';
import { QueryTypes } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { drawPlanAtReceipt } from '../../server/inspection/sampling';
import { partSpecSchema, type PartSpecInput } from '../../shared/schemas/spec';

export const QUARTER_WAVE_633: PartSpecInput = {
  nominalWaves: 0.25,
  designWavelengthNm: 632.8,
  retardanceTolWaves: 0.003,
  axisTolDeg: 0.5,
  construction: 'zero-order',
  material: 'quartz',
  clearApertureMm: 10,
  diameterMm: 12.7,
  decisionRule: 'simple',
};

type Options = { quantity: number; spec?: PartSpecInput; level?: string; aql?: number; hundredPercent?: boolean; serialPrefix?: string; buyerEmail?: string };

async function one<T extends object>(sql: string, replacements: Record<string, unknown>): Promise<T> {
  const [row] = await sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });
  if (!row) throw new Error(`no row from: ${sql}`);
  return row;
}

export async function receivedLot(options: Options) {
  const tag = faker.string.alphanumeric(6).toUpperCase();
  const spec = partSpecSchema.parse(options.spec ?? QUARTER_WAVE_633);
  const buyer = await one<{ id: number }>('SELECT id FROM users WHERE email = :email', { email: options.buyerEmail ?? 'buyer@phaselot.test' });
  const supplier = await one<{ id: number }>(`INSERT INTO suppliers (name, contact_email, owner_id) VALUES (:name, :email, :owner) RETURNING id`, {
    name: `Test supplier ${tag}`,
    email: `sales-${tag.toLowerCase()}@example.test`,
    owner: buyer.id,
  });
  const part = await one<{ id: number }>(`INSERT INTO parts (number, description, spec) VALUES (:number, :description, :spec::jsonb) RETURNING id`, {
    number: `WP-T-${tag}`,
    description: 'Test retarder',
    spec: JSON.stringify(spec),
  });
  const po = await one<{ id: number; number: string }>(
    `INSERT INTO purchase_orders (number, supplier_id, buyer_id, ordered_on, currency) VALUES (:number, :supplier, :buyer, '2026-11-01', 'EUR') RETURNING id, number`,
    { number: `PO-T-${tag}`, supplier: supplier.id, buyer: buyer.id },
  );
  const line = await one<{ id: number }>(
    `INSERT INTO purchase_order_lines (purchase_order_id, line_number, part_id, quantity, unit_price, inspection_level, aql, hundred_percent, spec)
     VALUES (:po, 1, :part, :quantity, 120, :level, :aql, :hundred, :spec::jsonb) RETURNING id`,
    {
      po: po.id,
      part: part.id,
      quantity: options.quantity,
      level: options.level ?? 'II',
      aql: options.aql ?? 1,
      hundred: options.hundredPercent ?? false,
      spec: JSON.stringify(spec),
    },
  );
  const shipment = await one<{ id: number }>(
    `INSERT INTO shipments (purchase_order_id, packing_slip, received_at) VALUES (:po, :slip, now() - interval '3 days') RETURNING id`,
    {
      po: po.id,
      slip: `PS-${tag}`,
    },
  );
  const lot = await one<{ id: number }>(
    `INSERT INTO lots (shipment_id, po_line_id, part_id, supplier_lot, quantity) VALUES (:shipment, :line, :part, :supplierLot, :quantity) RETURNING id`,
    { shipment: shipment.id, line: line.id, part: part.id, supplierLot: `SL-${tag}`, quantity: options.quantity },
  );
  const prefix = options.serialPrefix ?? `T${tag}-`;
  const serials = Array.from({ length: options.quantity }, (_, i) => `${prefix}${String(i + 1).padStart(4, '0')}`);
  await sequelize.query(`INSERT INTO pieces (lot_id, part_id, serial) SELECT :lot, :part, unnest(ARRAY[:serials]::varchar[])`, {
    replacements: { lot: lot.id, part: part.id, serials },
  });
  await sequelize.query(
    `INSERT INTO stock_moves (piece_id, to_location_id, reason)
     SELECT p.id, (SELECT id FROM locations WHERE kind = 'quarantine' ORDER BY code LIMIT 1), 'receipt' FROM pieces p WHERE p.lot_id = :lot ORDER BY p.id`,
    { replacements: { lot: lot.id } },
  );
  // As at receipt: the plan and sample are drawn now, at the supplier and part's severity.
  await inTransaction((transaction) => drawPlanAtReceipt(lot.id, transaction));
  return { lotId: lot.id, partId: part.id, supplierId: supplier.id, poNumber: po.number, serials, spec };
}
