// The switching sequence of a supplier and part, and the state recomputed from it. A lot's decision
// is fed when it is signed, at the end of the sequence, whatever the state was when the lot was
// sampled; a superseding decision replaces the lot's result in its place; the quality manager's
// signed resumption and severity override join the sequence where they are signed. The state is
// then replayed from the whole sequence and stored, with one history event per change.
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { SwitchingEvent, type DispositionRecord, type User } from '../../db/models';
import { replaySwitching, switchingPhaseOf, type LotResult, type SwitchingEntry, type SwitchingState } from '../../shared/sampling';
import { OVERRIDE_MEANING, RESUME_MEANING, type ResumeInspectionInput, type SeverityOverrideInput } from '../../shared/schemas/switching';
import { actorFromUser, recordAudit, type AuditActor } from '../audit/record';
import { verifySignature } from '../auth/signature';
import { conflict, notFound } from '../http/errors';
import { readSiteSettings } from '../settings/siteSettings';
import type { LotEvaluation } from './evaluation';
import type { LotForInspection } from './lotAccess';
import { acceptedRequestFor } from '../supplierquality/correctiveActions';
import { drawWaitingPlans, switchingStateOf } from './sampling';
import { plural } from '../../shared/format';

const entityId = (supplierId: number, partId: number) => `${supplierId}/${partId}`;

function entryOf(event: Pick<SwitchingEvent, 'kind' | 'result' | 'reducedEnabled' | 'severity'>): SwitchingEntry {
  if (event.kind === 'lot') return { kind: 'lot', result: event.result!, settings: { reducedEnabled: event.reducedEnabled! } };
  if (event.kind === 'resume') return { kind: 'resume' };
  return { kind: 'override', severity: event.severity! };
}

type NewEvent = Pick<SwitchingEvent, 'kind'> &
  Partial<
    Pick<SwitchingEvent, 'lotId' | 'result' | 'reducedEnabled' | 'dispositionId' | 'severity' | 'reason' | 'reference' | 'correctiveActionId' | 'actorId'>
  >;

/**
 * Adds an event to the supplier-part's sequence (in place of `replacing`, when a lot's result is
 * superseded), replays the sequence from its start and stores the state. The caller holds the
 * state row for update; `before` is what it read.
 */
async function feedSequence(
  supplierId: number,
  partId: number,
  before: SwitchingState,
  event: NewEvent,
  actor: AuditActor,
  transaction: Transaction,
  replacing?: SwitchingEvent,
) {
  if (replacing) {
    replacing.supersededAt = new Date();
    await replacing.save({ transaction });
  }
  const current = await SwitchingEvent.findAll({ where: { supplierId, partId, supersededAt: { [Op.is]: null } }, order: [['position', 'ASC']], transaction });
  const [{ last }] = await sequelize.query<{ last: number | null }>(
    'SELECT max(position) AS last FROM switching_events WHERE supplier_id = :supplierId AND part_id = :partId',
    {
      type: QueryTypes.SELECT,
      transaction,
      replacements: { supplierId, partId },
    },
  );
  const position = replacing?.position ?? (last ?? 0) + 1;
  const sequence = [
    ...current.map((e) => ({ position: e.position, entry: entryOf(e) })),
    { position, entry: entryOf({ severity: null, result: null, reducedEnabled: null, ...event }) },
  ].sort((a, b) => a.position - b.position);
  const { state, outcomes } = replaySwitching(sequence.map((s) => s.entry));
  const index = sequence.findIndex((s) => s.position === position);
  const later = sequence.length - 1 - index;
  const explanation = replacing
    ? `the lot's result was replaced by a new decision (${resultText(replacing.result!)} → ${resultText(event.result!)}) and the sequence recomputed from its first lot: ${outcomes[index].explanation}` +
      (later ? `; after ${later} later ${later === 1 ? 'entry' : 'entries'}, the state is ${switchingPhaseOf(state)}` : '')
    : outcomes[index].explanation;
  const created = await SwitchingEvent.create(
    {
      supplierId,
      partId,
      position,
      before,
      after: state,
      explanation,
      lotId: null,
      result: null,
      reducedEnabled: null,
      dispositionId: null,
      severity: null,
      reason: null,
      reference: null,
      actorId: null,
      ...event,
    },
    { transaction },
  );
  await sequelize.query('UPDATE switching_states SET state = :state::jsonb, updated_at = now() WHERE supplier_id = :supplierId AND part_id = :partId', {
    transaction,
    replacements: { supplierId, partId, state: JSON.stringify(state) },
  });
  // A recomputation that lifts a discontinuation gives the lots waiting meanwhile their plans.
  const plansDrawn = await drawWaitingPlans(supplierId, partId, state, transaction);
  for (const plan of plansDrawn) {
    await recordAudit(
      actor,
      {
        action: 'lot.plan-drawn',
        entityType: 'lot',
        entityId: plan.lotId,
        after: { severity: plan.severity, sampleSize: plan.sampleSize, accept: plan.acceptNumber, reject: plan.rejectNumber, seed: plan.sampleSeed },
      },
      transaction,
    );
  }
  return { state, event: created, plansDrawn };
}

const resultText = (result: LotResult) => `${result.accepted ? 'accepted' : 'not accepted'}, ${plural(result.defectives, 'defective')}`;

/** Feeds a signed decision into the lot's supplier-part sequence: at its end for a first decision,
 * in place of the earlier result when the decision supersedes one. Only an acceptance counts as
 * accepted; a rejection, a sort and a use under deviation are lots not accepted. */
export async function recordLotInSwitching(
  lot: LotForInspection,
  evaluation: LotEvaluation,
  disposition: DispositionRecord,
  actor: AuditActor,
  transaction: Transaction,
) {
  const supplierId = lot.supplier.id;
  const partId = lot.part.id;
  const before = await switchingStateOf(supplierId, partId, transaction, 'update');
  const { plan, verdict } = evaluation;
  const result: LotResult = {
    accepted: disposition.decision === 'accept',
    defectives: verdict.defectives,
    plan: {
      planLetter: plan.planLetter,
      sampleSize: plan.sampleSize,
      accept: plan.acceptNumber,
      reject: plan.rejectNumber,
      severity: plan.severity,
      aql: plan.aql,
      level: plan.inspectionLevel,
    },
  };
  const replacing = await SwitchingEvent.findOne({ where: { lotId: lot.id, kind: 'lot', supersededAt: { [Op.is]: null } }, transaction });
  const settings = await readSiteSettings(transaction);
  const fed = await feedSequence(
    supplierId,
    partId,
    before,
    { kind: 'lot', lotId: lot.id, result, reducedEnabled: settings.reducedInspectionEnabled, dispositionId: disposition.id, actorId: disposition.signerId },
    actor,
    transaction,
    replacing ?? undefined,
  );
  if (switchingPhaseOf(before) !== switchingPhaseOf(fed.state)) {
    await recordAudit(
      actor,
      {
        action: 'switching.change',
        entityType: 'switching',
        entityId: entityId(supplierId, partId),
        before,
        after: { state: fed.state, lotId: lot.id, explanation: fed.event.explanation },
      },
      transaction,
    );
  }
  return fed;
}

/** The supplier's name and the part's number and description; 404 when either does not exist. */
export async function supplierAndPart(supplierId: number, partId: number, transaction?: Transaction) {
  const [pair] = await sequelize.query<{ supplier: string | null; part: string | null; description: string | null }>(
    `SELECT (SELECT name FROM suppliers WHERE id = :supplierId) AS supplier, (SELECT number FROM parts WHERE id = :partId) AS part,
            (SELECT description FROM parts WHERE id = :partId) AS description`,
    { type: QueryTypes.SELECT, transaction, replacements: { supplierId, partId } },
  );
  if (!pair.supplier) throw notFound('Supplier');
  if (!pair.part) throw notFound('Part');
  return { supplier: pair.supplier, part: pair.part, description: pair.description ?? '' };
}

type Request = Pick<AuditActor, 'requestId' | 'address'>;

/** ISO 2859-1, 9.4: once the supplier has acted, inspection resumes on tightened; the lots that
 * waited in quarantine get their plans on tightened inspection. */
export async function resumeInspection(signer: User, supplierId: number, partId: number, input: ResumeInspectionInput, request: Request = {}) {
  const actor = { ...actorFromUser(signer), ...request };
  await verifySignature(signer, input.password, actor, undefined, { entityType: 'switching', entityId: entityId(supplierId, partId) });
  return inTransaction(async (transaction) => {
    const names = await supplierAndPart(supplierId, partId, transaction);
    const before = await switchingStateOf(supplierId, partId, transaction, 'update');
    if (!before.stopped)
      throw conflict(`Acceptance inspection of ${names.part} from ${names.supplier} is not discontinued; it is on ${before.severity} inspection`);
    // An accepted corrective-action request of the supplier's part names itself; a free-text reference is for actions recorded elsewhere.
    const request = input.correctiveActionId ? await acceptedRequestFor(input.correctiveActionId, supplierId, partId, transaction) : null;
    const reference = request?.number ?? input.reference!;
    const fed = await feedSequence(
      supplierId,
      partId,
      before,
      { kind: 'resume', reason: input.correctiveAction, reference, correctiveActionId: request?.id ?? null, actorId: signer.id },
      actor,
      transaction,
    );
    const lots = fed.plansDrawn.map((p) => p.lotId);
    await recordAudit(
      actor,
      {
        action: 'switching.resume',
        entityType: 'switching',
        entityId: entityId(supplierId, partId),
        before,
        after: {
          state: fed.state,
          meaning: RESUME_MEANING,
          correctiveAction: input.correctiveAction,
          reference,
          correctiveActionId: request?.id ?? null,
          plansDrawnFor: lots,
        },
      },
      transaction,
    );
    return { state: fed.state, eventId: fed.event.id, plansDrawnFor: lots };
  });
}

/** The quality manager puts the supplier and part on a severity, for a reason. A discontinuation is
 * lifted only by a resumption, which records the supplier's corrective action. */
export async function overrideSeverity(signer: User, supplierId: number, partId: number, input: SeverityOverrideInput, request: Request = {}) {
  const actor = { ...actorFromUser(signer), ...request };
  await verifySignature(signer, input.password, actor, undefined, { entityType: 'switching', entityId: entityId(supplierId, partId) });
  return inTransaction(async (transaction) => {
    const names = await supplierAndPart(supplierId, partId, transaction);
    const before = await switchingStateOf(supplierId, partId, transaction, 'update');
    if (before.stopped)
      throw conflict(`Acceptance inspection of ${names.part} from ${names.supplier} is discontinued: resume it, recording the supplier’s corrective action`);
    if (before.severity === input.severity) throw conflict(`${names.part} from ${names.supplier} is already on ${input.severity} inspection`);
    const fed = await feedSequence(
      supplierId,
      partId,
      before,
      { kind: 'override', severity: input.severity, reason: input.reason, actorId: signer.id },
      actor,
      transaction,
    );
    await recordAudit(
      actor,
      {
        action: 'switching.override',
        entityType: 'switching',
        entityId: entityId(supplierId, partId),
        before,
        after: { state: fed.state, meaning: OVERRIDE_MEANING, severity: input.severity, reason: input.reason },
      },
      transaction,
    );
    return { state: fed.state, eventId: fed.event.id };
  });
}
