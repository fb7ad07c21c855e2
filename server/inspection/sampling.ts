// The lot's sampling plan: ISO 2859-1 single sampling at the PO line's inspection level and AQL,
// at the severity the supplier and part have reached under the switching rules, and a random
// sample whose seed is stored so the same sample can be drawn again.
import type { Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { LotInspection, SamplePiece, SwitchingEvent, SwitchingStateRecord } from '../../db/models';
import { drawSample, initialSwitchingState, newSampleSeed, nextSwitchingState, planFor, type SwitchingState } from '../../shared/sampling';
import { readSiteSettings } from '../routes/settings/operations';
import { AppError } from '../http/errors';
import type { LotEvaluation } from './evaluation';
import type { LotForInspection } from './lotAccess';

export async function switchingStateOf(supplierId: number, partId: number, transaction?: Transaction): Promise<SwitchingState> {
  const row = await SwitchingStateRecord.findOne({ where: { supplierId, partId }, transaction });
  return (row?.state as SwitchingState | undefined) ?? initialSwitchingState();
}

export function describePlan(plan: LotInspection) {
  const inspection = plan.hundredPercent ? '100 % inspection' : `${plan.severity} inspection, level ${plan.inspectionLevel}, AQL ${plan.aql}`;
  return `ISO 2859-1 single sampling, ${inspection}: code letter ${plan.codeLetter}, n = ${plan.sampleSize}, Ac ${plan.acceptNumber}, Re ${plan.rejectNumber}`;
}

/** The lot's plan and sample, drawn on first need and fixed from then on. Drawing locks the lot, so
 * two first looks at the same lot draw one sample, not two. */
export async function ensureInspectionPlan(lot: LotForInspection, transaction?: Transaction): Promise<LotInspection> {
  const existing = await LotInspection.findOne({ where: { lotId: lot.id }, transaction });
  if (existing) return existing;
  if (!transaction) return inTransaction((t) => ensureInspectionPlan(lot, t));
  await sequelize.query('SELECT id FROM lots WHERE id = :id FOR UPDATE', { transaction, replacements: { id: lot.id } });
  const drawnMeanwhile = await LotInspection.findOne({ where: { lotId: lot.id }, transaction });
  if (drawnMeanwhile) return drawnMeanwhile;
  const state = await switchingStateOf(lot.supplier.id, lot.part.id, transaction);
  if (state.stopped) {
    throw new AppError(409, 'acceptance_discontinued', `Acceptance inspection of ${lot.part.number} from ${lot.supplier.name} is discontinued after 5 lots not accepted on tightened inspection (ISO 2859-1, 9.4); the supplier must act first`);
  }
  const plan = planFor({ lotSize: lot.quantity, level: lot.inspectionLevel, aql: lot.aql, severity: state.severity });
  const hundredPercent = lot.hundredPercent || plan.hundredPercent;
  const sampleSize = hundredPercent ? lot.pieces.length : plan.sampleSize;
  const seed = newSampleSeed();
  const inspection = await LotInspection.create(
    {
      lotId: lot.id,
      severity: state.severity,
      inspectionLevel: lot.inspectionLevel,
      aql: lot.aql,
      codeLetter: plan.codeLetter,
      sampleSize,
      // 100 % inspection keeps the plan's Ac/Re: the lot is judged on every piece instead of a sample.
      acceptNumber: plan.accept,
      rejectNumber: plan.reject,
      hundredPercent,
      sampleSeed: seed,
    },
    { transaction },
  );
  const chosen = new Set(hundredPercent ? lot.pieces.map((p) => p.serial) : drawSample(lot.pieces.map((p) => p.serial), sampleSize, seed));
  await SamplePiece.bulkCreate(lot.pieces.filter((p) => chosen.has(p.serial)).map((p) => ({ inspectionId: inspection.id, pieceId: p.id })), { transaction });
  return inspection;
}

/** Feeds the first decision on a lot into the switching rules of its supplier and part. */
export async function recordLotInSwitching(lot: LotForInspection, evaluation: LotEvaluation, transaction: Transaction) {
  const before = await switchingStateOf(lot.supplier.id, lot.part.id, transaction);
  const settings = await readSiteSettings(transaction);
  const { plan, verdict } = evaluation;
  const next = nextSwitchingState(
    before,
    { accepted: verdict.proposal === 'accept', defectives: verdict.defectives, plan: { codeLetter: plan.codeLetter, sampleSize: plan.sampleSize, accept: plan.acceptNumber, reject: plan.rejectNumber, severity: plan.severity, aql: plan.aql, level: plan.inspectionLevel } },
    { reducedEnabled: settings.reducedInspectionEnabled },
  );
  await SwitchingStateRecord.upsert({ supplierId: lot.supplier.id, partId: lot.part.id, state: next.state }, { transaction });
  await SwitchingEvent.create({ supplierId: lot.supplier.id, partId: lot.part.id, lotId: lot.id, before, after: next.state, explanation: next.explanation }, { transaction });
  return next;
}
