// The state of a lot's inspection: its plan, each sample piece's current results and the proposed
// verdict. Pieces outside the sample may be measured too (e.g. to sort a lot); they do not count.
import { Op, type Transaction } from 'sequelize';
import { PieceResult, SamplePiece } from '../../db/models';
import { pieceVerdict, proposeLotVerdict, type LotVerdict } from '../../shared/inspection/lotVerdict';
import type { LotForInspection } from './lotAccess';
import { describePlan, discontinuedError, inspectionPlanOf } from './sampling';

export type SamplePieceState = {
  pieceId: number;
  serial: string;
  verdict: ReturnType<typeof pieceVerdict>;
  reasons: string[];
  results: PieceResult[];
};

export async function currentResults(pieceIds: number[], transaction?: Transaction) {
  const rows = await PieceResult.findAll({ where: { pieceId: pieceIds, supersededByFileId: { [Op.is]: null } }, order: [['wavelengthNm', 'ASC']], transaction });
  const byPiece = new Map<number, PieceResult[]>();
  for (const row of rows) byPiece.set(row.pieceId, [...(byPiece.get(row.pieceId) ?? []), row]);
  return byPiece;
}

const judgedOnly = (rows: PieceResult[]) => rows.filter((r) => r.result.judged !== false);

export async function evaluateLot(lot: LotForInspection, transaction?: Transaction) {
  const plan = await inspectionPlanOf(lot.id, transaction);
  if (!plan) throw discontinuedError(lot);
  const sampleIds = (await SamplePiece.findAll({ where: { inspectionId: plan.id }, transaction })).map((s) => s.pieceId);
  const results = await currentResults(lot.pieces.map((p) => p.id), transaction);
  const inSample = new Set(sampleIds);
  const samplePieces: SamplePieceState[] = lot.pieces
    .filter((p) => inSample.has(p.id))
    .map((p) => {
      const judged = judgedOnly(results.get(p.id) ?? []);
      return {
        pieceId: p.id,
        serial: p.serial,
        verdict: pieceVerdict(judged.map((r) => r.verdict)),
        reasons: [...new Set(judged.flatMap((r) => r.result.reasons.map((reason) => (judged.length > 1 ? `${reason} at ${r.wavelengthNm} nm` : reason))))],
        results: results.get(p.id) ?? [],
      };
    });
  const verdict: LotVerdict = proposeLotVerdict(
    samplePieces.map((p) => ({ serial: p.serial, verdicts: p.results.filter((r) => r.result.judged !== false).map((r) => r.verdict) })),
    { accept: plan.acceptNumber, reject: plan.rejectNumber },
  );
  // Every piece's own verdict, in the sample or not: what a decision routes each piece by.
  const pieceVerdicts = new Map(lot.pieces.map((p) => [p.id, pieceVerdict(judgedOnly(results.get(p.id) ?? []).map((r) => r.verdict))]));
  return { plan, planSummary: describePlan(plan), samplePieces, allResults: results, pieceVerdicts, verdict };
}

export type LotEvaluation = Awaited<ReturnType<typeof evaluateLot>>;
