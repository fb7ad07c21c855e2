// Corrective-action requests (CARs): raised by a buyer or quality manager from NCRs of one supplier's
// part and mailed to the supplier's quality contact with a link to answer; the link can be revoked
// and a new one sent; quality accepts the answer (signed) or returns it with a note (a fresh link
// goes out), then names the later lots that show the action worked and closes the request (signed).
// Each step is one transaction with its mail and audit entry.
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { CorrectiveAction, CorrectiveActionLink, CorrectiveActionResponse, Nonconformance, Part, Supplier, User } from '../../db/models';
import {
  CAR_ACCEPT_MEANING,
  CAR_CLOSE_MEANING,
  carCloseSchema,
  carRaiseSchema,
  type CarCloseInput,
  type CarRaiseInput,
  type CarReviewInput,
} from '../../shared/schemas/correctiveActions';
import { lotName } from '../../shared/schemas/stock';
import { actorFromUser, recordAudit, type AuditActor } from '../audit/record';
import { verifySignature } from '../auth/signature';
import { badRequest, conflict, notFound } from '../http/errors';
import { queueMail } from '../mail/outbox';
import { nextYearlyNumber } from './numbers';
import { issueLink, LINK_DAYS } from './responseLinks';

type Request = Pick<AuditActor, 'requestId' | 'address'>;

export async function lockedRequest(id: number, transaction: Transaction) {
  const request = await CorrectiveAction.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!request) throw notFound('Corrective-action request');
  return request;
}

/** Whom the site tells about a request: the buyer who owns the supplier, whoever raised it, and every
 * active quality manager. */
export async function buyerAndQuality(request: CorrectiveAction, transaction: Transaction) {
  const rows = await sequelize.query<{ email: string }>(
    `SELECT DISTINCT u.email FROM users u
      WHERE u.active AND (u.id = :requestedBy OR u.id = (SELECT owner_id FROM suppliers WHERE id = :supplierId) OR 'quality' = ANY(u.roles))
      ORDER BY u.email`,
    { type: QueryTypes.SELECT, transaction, replacements: { requestedBy: request.requestedBy, supplierId: request.supplierId } },
  );
  return rows.map((r) => r.email);
}

async function subjectOf(request: CorrectiveAction, transaction: Transaction) {
  const [supplier, part] = await Promise.all([
    Supplier.findByPk(request.supplierId, { transaction, rejectOnEmpty: true }),
    Part.findByPk(request.partId, { transaction, rejectOnEmpty: true }),
  ]);
  return { supplier, part };
}

/** Mails the supplier's quality contact a link to answer (a first request, a returned answer, a new link). */
async function mailLink(request: CorrectiveAction, url: string, reason: 'request' | 'returned' | 'new-link', note: string | null, transaction: Transaction) {
  const { supplier, part } = await subjectOf(request, transaction);
  const ncrs = await sequelize.query<{ number: string; description: string; serials: string | null }>(
    `SELECT n.number, n.description, string_agg(p.serial, ', ' ORDER BY p.serial) AS serials
       FROM corrective_action_nonconformances c JOIN nonconformances n ON n.id = c.nonconformance_id
       LEFT JOIN nonconformance_pieces np ON np.nonconformance_id = n.id LEFT JOIN pieces p ON p.id = np.piece_id
      WHERE c.corrective_action_id = :id GROUP BY n.id ORDER BY n.number`,
    { type: QueryTypes.SELECT, transaction, replacements: { id: request.id } },
  );
  const opening = {
    request: `We ask ${supplier.name} for a corrective action on ${part.number} (${part.description}).`,
    returned: `Your answer to corrective-action request ${request.number} was reviewed and returned: it needs more before it can be accepted.`,
    'new-link': `Here is a new link to answer corrective-action request ${request.number}; any earlier link no longer works.`,
  }[reason];
  await queueMail(
    {
      to: [request.sentTo],
      subject: `${reason === 'returned' ? 'Answer returned' : 'Corrective action requested'}: ${request.number}, ${part.number} (${supplier.name})`,
      text: [
        opening,
        ...(note ? ['', `Note from quality: ${note}`] : []),
        '',
        'What is to be corrected:',
        request.problem,
        '',
        'Nonconformance reports:',
        ...ncrs.map((n) => `  ${n.number}: ${n.description}${n.serials ? ` (serials ${n.serials})` : ''}`),
        '',
        `Please answer by ${request.responseDueOn}: root cause, containment, corrective and preventive actions with their dates; PDF, PNG or JPEG files up to 10 MB may be attached.`,
        `Answer through this link (no account needed). It is valid for ${LINK_DAYS} days and takes one answer:`,
        url,
      ].join('\n'),
      related: { type: 'corrective-action', id: request.id },
    },
    transaction,
  );
}

export function raiseCorrectiveAction(actor: AuditActor, rawInput: CarRaiseInput) {
  const input = carRaiseSchema.parse(rawInput);
  const ids = [...new Set(input.nonconformanceIds)];
  return inTransaction(async (transaction) => {
    const ncrs = await Nonconformance.findAll({ where: { id: ids }, order: [['number', 'ASC']], transaction });
    const missing = ids.filter((id) => !ncrs.some((n) => n.id === id));
    if (missing.length) throw badRequest(`No NCR with id ${missing.join(', ')}`, [{ path: 'nonconformanceIds', message: 'Choose existing NCRs' }]);
    const pairs = new Set(ncrs.map((n) => `${n.supplierId}/${n.partId}`));
    if (pairs.size > 1)
      throw badRequest(
        `A corrective-action request covers one supplier's part: ${ncrs.map((n) => n.number).join(', ')} are not all of the same supplier and part`,
      );
    const [{ supplierId, partId }] = ncrs;
    const covered = await sequelize.query<{ ncr: string; car: string }>(
      `SELECT n.number AS ncr, ca.number AS car FROM corrective_action_nonconformances c
         JOIN corrective_actions ca ON ca.id = c.corrective_action_id JOIN nonconformances n ON n.id = c.nonconformance_id
        WHERE c.nonconformance_id IN (:ids) AND ca.status <> 'closed'`,
      { type: QueryTypes.SELECT, transaction, replacements: { ids } },
    );
    if (covered.length) throw conflict(`Already under an open corrective-action request: ${covered.map((c) => `${c.ncr} (${c.car})`).join(', ')}`);
    const supplier = await Supplier.findByPk(supplierId, { transaction, rejectOnEmpty: true });
    if (!supplier.qualityContactEmail) throw conflict(`${supplier.name} has no quality contact: add the address on the supplier's page first`);

    const request = await CorrectiveAction.create(
      {
        number: await nextYearlyNumber('CAR', transaction),
        supplierId,
        partId,
        problem: input.problem,
        responseDueOn: input.responseDueOn,
        sentTo: supplier.qualityContactEmail,
        requestedBy: actor.id!,
      },
      { transaction },
    );
    await sequelize.query(
      'INSERT INTO corrective_action_nonconformances (corrective_action_id, nonconformance_id) SELECT :id, unnest(ARRAY[:ids]::integer[])',
      {
        transaction,
        replacements: { id: request.id, ids },
      },
    );
    const { link, url } = await issueLink(request, actor.id, transaction);
    await mailLink(request, url, 'request', null, transaction);
    await recordAudit(
      actor,
      {
        action: 'corrective-action.raise',
        entityType: 'corrective-action',
        entityId: request.id,
        after: {
          number: request.number,
          ncrs: ncrs.map((n) => n.number),
          sentTo: request.sentTo,
          responseDueOn: request.responseDueOn,
          linkId: link.id,
          linkExpiresAt: link.expiresAt.toISOString(),
        },
      },
      transaction,
    );
    return request;
  });
}

async function liveLink(requestId: number, transaction: Transaction) {
  return CorrectiveActionLink.findOne({
    where: { correctiveActionId: requestId, revokedAt: { [Op.is]: null }, submittedAt: { [Op.is]: null } },
    transaction,
    lock: transaction.LOCK.UPDATE,
  });
}

/** The buyer withdraws the request's link: it answers nothing from now on. */
export function revokeLink(actor: AuditActor, id: number) {
  return inTransaction(async (transaction) => {
    const request = await lockedRequest(id, transaction);
    const link = await liveLink(id, transaction);
    if (!link) throw conflict(`${request.number} has no link to revoke`);
    link.set({ revokedAt: new Date(), revokedBy: actor.id });
    await link.save({ transaction });
    await recordAudit(
      actor,
      { action: 'corrective-action.link-revoke', entityType: 'corrective-action', entityId: id, after: { linkId: link.id } },
      transaction,
    );
    return request;
  });
}

/** A new link while the supplier's answer is awaited (the old one expired, was lost or revoked). */
export function sendNewLink(actor: AuditActor, id: number) {
  return inTransaction(async (transaction) => {
    const request = await lockedRequest(id, transaction);
    if (request.status !== 'awaiting-response') throw conflict(`${request.number} is not awaiting the supplier's answer`);
    const old = await liveLink(id, transaction);
    if (old) {
      old.set({ revokedAt: new Date(), revokedBy: actor.id });
      await old.save({ transaction });
    }
    const { link, url } = await issueLink(request, actor.id, transaction);
    await mailLink(request, url, 'new-link', null, transaction);
    await recordAudit(
      actor,
      {
        action: 'corrective-action.link-new',
        entityType: 'corrective-action',
        entityId: id,
        after: { linkId: link.id, revokedLinkId: old?.id ?? null, sentTo: request.sentTo },
      },
      transaction,
    );
    return request;
  });
}

/** Quality reviews the supplier's latest answer: accepted (signed) or returned with a note and a new link. */
export async function reviewResponse(signer: User, id: number, input: CarReviewInput, request: Request = {}) {
  const actor = { ...actorFromUser(signer), ...request };
  if (input.decision === 'accept') await verifySignature(signer, input.password, actor, undefined, { entityType: 'corrective-action', entityId: id });
  return inTransaction(async (transaction) => {
    const car = await lockedRequest(id, transaction);
    if (car.status !== 'responded') throw conflict(`${car.number} has no answer waiting for review`);
    const response = await CorrectiveActionResponse.findOne({
      where: { correctiveActionId: id, review: { [Op.is]: null } },
      order: [['submittedAt', 'DESC']],
      transaction,
      rejectOnEmpty: true,
    });
    response.set({
      review: input.decision === 'accept' ? 'accepted' : 'returned',
      reviewedBy: signer.id,
      reviewedAt: new Date(),
      reviewNote: input.note || null,
    });
    await response.save({ transaction });
    if (input.decision === 'accept') {
      car.set({ status: 'accepted', acceptedBy: signer.id, acceptedAt: new Date(), updatedAt: new Date() });
    } else {
      car.set({ status: 'awaiting-response', updatedAt: new Date() });
      const { url } = await issueLink(car, signer.id, transaction);
      await mailLink(car, url, 'returned', input.note, transaction);
    }
    await car.save({ transaction });
    await recordAudit(
      actor,
      {
        action: input.decision === 'accept' ? 'corrective-action.accept' : 'corrective-action.return',
        entityType: 'corrective-action',
        entityId: id,
        after: { responseId: response.id, note: input.note || null, ...(input.decision === 'accept' && { meaning: CAR_ACCEPT_MEANING }) },
      },
      transaction,
    );
    return car;
  });
}

/** Closes an accepted request once later lots of the supplier's part, received after the acceptance
 * and decided, show the action worked; the lots checked are recorded with it. */
export async function closeCorrectiveAction(signer: User, id: number, rawInput: CarCloseInput, request: Request = {}) {
  const input = carCloseSchema.parse(rawInput);
  const actor = { ...actorFromUser(signer), ...request };
  await verifySignature(signer, input.password, actor, undefined, { entityType: 'corrective-action', entityId: id });
  return inTransaction(async (transaction) => {
    const car = await lockedRequest(id, transaction);
    if (car.status !== 'accepted') throw conflict(`${car.number} can be closed once the supplier's answer is accepted`);
    const lotIds = [...new Set(input.lotIds)];
    const later = new Set((await laterLots(car, transaction)).filter((l) => l.decision !== null).map((l) => l.id));
    const outside = lotIds.filter((lotId) => !later.has(lotId));
    if (outside.length) {
      throw badRequest(
        `Only decided lots of this supplier's part received after the answer was accepted show whether it worked: ${outside.map(lotName).join(', ')} ${outside.length === 1 ? 'is' : 'are'} not one`,
        [{ path: 'lotIds', message: 'Choose later, decided lots' }],
      );
    }
    await sequelize.query('INSERT INTO corrective_action_checked_lots (corrective_action_id, lot_id) SELECT :id, unnest(ARRAY[:lotIds]::integer[])', {
      transaction,
      replacements: { id, lotIds },
    });
    car.set({ status: 'closed', closedBy: signer.id, closedAt: new Date(), effectivenessNote: input.note, updatedAt: new Date() });
    await car.save({ transaction });
    await recordAudit(
      actor,
      {
        action: 'corrective-action.close',
        entityType: 'corrective-action',
        entityId: id,
        after: { lots: lotIds, note: input.note, meaning: CAR_CLOSE_MEANING },
      },
      transaction,
    );
    return car;
  });
}

/** Lots of the request's supplier and part received since its answer was accepted, with their decision. */
export async function laterLots(car: CorrectiveAction, transaction?: Transaction) {
  if (!car.acceptedAt) return [];
  return sequelize.query<{ id: number; supplierLot: string; receivedAt: Date; decision: string | null }>(
    `SELECT l.id, l.supplier_lot AS "supplierLot", sh.received_at AS "receivedAt", d.decision
       FROM lots l JOIN shipments sh ON sh.id = l.shipment_id JOIN purchase_orders po ON po.id = sh.purchase_order_id
       LEFT JOIN dispositions d ON d.lot_id = l.id AND d.superseded_at IS NULL
      WHERE po.supplier_id = :supplierId AND l.part_id = :partId AND sh.received_at >= :since
      ORDER BY sh.received_at, l.id`,
    { type: QueryTypes.SELECT, transaction, replacements: { supplierId: car.supplierId, partId: car.partId, since: car.acceptedAt } },
  );
}

/** An accepted (or closed) request of the supplier's part, for a resumption of inspection to rest on. */
export async function acceptedRequestFor(id: number, supplierId: number, partId: number, transaction: Transaction) {
  const car = await CorrectiveAction.findByPk(id, { transaction });
  if (!car || car.supplierId !== supplierId || car.partId !== partId)
    throw badRequest('Choose a corrective-action request of this supplier and part', [
      { path: 'correctiveActionId', message: 'Not a request of this supplier and part' },
    ]);
  if (car.status !== 'accepted' && car.status !== 'closed')
    throw conflict(`${car.number} is not accepted: the supplier's answer must be accepted before inspection resumes on it`);
  return car;
}
