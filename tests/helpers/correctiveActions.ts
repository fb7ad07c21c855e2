// Corrective-action requests for tests: a supplier's part with a quality contact and NCRs (written
// straight to the NCR tables, as receivedLot writes receiving's, so these tests do not depend on the
// NCR screens), a request raised through the buyer's API, and the link mailed to the supplier.
import { QueryTypes } from 'sequelize';
import { expect } from 'vitest';
import { sequelize } from '../../db';
import { OutboxMail } from '../../db/models';
import { as } from './api';
import { uniqueTag } from './purchasing';
import { supplierPart } from './switching';

const inDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

/** A supplier's part (with lots to receive) whose supplier has a quality contact. */
export async function supplierWithQualityContact() {
  const pair = await supplierPart();
  const buyer = await as('buyer');
  const supplier = (await buyer.get(`/api/suppliers/${pair.supplierId}`).expect(200)).body;
  const qualityContactEmail = `quality-${pair.tag.toLowerCase()}@example.test`;
  await buyer.put(`/api/suppliers/${pair.supplierId}`).send({ name: supplier.name, contactEmail: supplier.contactEmail, qualityContactEmail }).expect(200);
  return { ...pair, qualityContactEmail };
}

/** An NCR of the supplier's part naming pieces of a received lot. */
export async function ncrOf(
  pair: { supplierId: number; partId: number; receive(quantity?: number): Promise<{ lotId: number }> },
  description = 'Retardance 0.006 λ long on two plates',
) {
  const { lotId } = await pair.receive(10);
  const [ncr] = await sequelize.query<{ id: number; number: string }>(
    `INSERT INTO nonconformances (number, origin, supplier_id, part_id, lot_id, description) VALUES (:number, 'found-later', :supplierId, :partId, :lotId, :description) RETURNING id, number`,
    { type: QueryTypes.SELECT, replacements: { number: `NCR-T-${uniqueTag()}`, supplierId: pair.supplierId, partId: pair.partId, lotId, description } },
  );
  await sequelize.query(
    `INSERT INTO nonconformance_pieces (nonconformance_id, piece_id) SELECT :ncr, id FROM pieces WHERE lot_id = :lotId ORDER BY serial LIMIT 2`,
    { replacements: { ncr: ncr.id, lotId } },
  );
  const serials = await sequelize.query<{ serial: string }>(`SELECT serial FROM pieces WHERE lot_id = :lotId ORDER BY serial LIMIT 2`, {
    type: QueryTypes.SELECT,
    replacements: { lotId },
  });
  return { ...ncr, lotId, serials: serials.map((s) => s.serial) };
}

/** The token of the newest link mailed for a request (read from the outbox, as the supplier reads the mail). */
export async function mailedToken(requestId: number) {
  const mail = await OutboxMail.findOne({ where: { relatedType: 'corrective-action', relatedId: String(requestId) }, order: [['id', 'DESC']] });
  const token = mail?.bodyText.match(/\/respond#token=(\S+)/)?.[1];
  if (!token) throw new Error(`no link mailed for request ${requestId}`);
  return { token, mail: mail! };
}

export async function raiseRequest(ncrIds: number[], problem = 'Retardance of quarter-wave plates runs long: find the cause and stop it.') {
  const response = await (await as('buyer')).post('/api/corrective-actions').send({ nonconformanceIds: ncrIds, problem, responseDueOn: inDays(14) });
  expect(response.status, JSON.stringify(response.body)).toBe(201);
  return response.body as { id: number; number: string; status: string };
}
