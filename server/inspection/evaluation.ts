// The state of a lot's inspection: its plan, each sample piece's current results and the proposed
// verdict. Pieces outside the sample may be measured too (e.g. to sort a lot); they do not count.
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import { PieceResult, SamplePiece, type LotInspection } from '../../db/models';
import { pieceVerdict, proposeLotVerdict, type LotVerdict, type PieceVerdict } from '../../shared/inspection/lotVerdict';
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
  const rows = await PieceResult.findAll({
    where: { pieceId: pieceIds, supersededByFileId: { [Op.is]: null } },
    order: [['wavelengthNm', 'ASC']],
    transaction,
  });
  const byPiece = new Map<number, PieceResult[]>();
  for (const row of rows) byPiece.set(row.pieceId, [...(byPiece.get(row.pieceId) ?? []), row]);
  return byPiece;
}

/** What a result counts for: its piece, wavelength and verdict, and whether its wavelength is judged. */
export type ResultVerdict = { pieceId: number; wavelengthNm: number; verdict: PieceVerdict; judged: boolean };

/** The verdicts that count for each piece: those of its results at judged wavelengths. */
function judgedVerdicts(results: Iterable<ResultVerdict>) {
  const byPiece = new Map<number, PieceVerdict[]>();
  for (const r of results) {
    if (!r.judged) continue;
    const own = byPiece.get(r.pieceId);
    if (own) own.push(r.verdict);
    else byPiece.set(r.pieceId, [r.verdict]);
  }
  return byPiece;
}

/** The sample's proposal under the plan, and every piece's own verdict (what a decision routes it by). */
function judgeLot(lot: LotForInspection, plan: LotInspection, sampleIds: Set<number>, verdicts: Map<number, PieceVerdict[]>) {
  const verdict: LotVerdict = proposeLotVerdict(
    lot.pieces.filter((p) => sampleIds.has(p.id)).map((p) => ({ serial: p.serial, verdicts: verdicts.get(p.id) ?? [] })),
    { accept: plan.acceptNumber, reject: plan.rejectNumber },
  );
  const pieceVerdicts = new Map(lot.pieces.map((p) => [p.id, pieceVerdict(verdicts.get(p.id) ?? [])]));
  return { verdict, pieceVerdicts };
}

async function planAndSample(lot: LotForInspection, transaction?: Transaction) {
  const plan = await inspectionPlanOf(lot.id, transaction);
  if (!plan) throw discontinuedError(lot);
  const sampleIds = new Set((await SamplePiece.findAll({ where: { inspectionId: plan.id }, transaction })).map((s) => s.pieceId));
  return { plan, sampleIds };
}

export async function evaluateLot(lot: LotForInspection, transaction?: Transaction) {
  const { plan, sampleIds } = await planAndSample(lot, transaction);
  const results = await currentResults(
    lot.pieces.map((p) => p.id),
    transaction,
  );
  const judged = (rows: PieceResult[]) => rows.filter((r) => r.result.judged !== false);
  const samplePieces: SamplePieceState[] = lot.pieces
    .filter((p) => sampleIds.has(p.id))
    .map((p) => {
      const counted = judged(results.get(p.id) ?? []);
      return {
        pieceId: p.id,
        serial: p.serial,
        verdict: pieceVerdict(counted.map((r) => r.verdict)),
        reasons: [...new Set(counted.flatMap((r) => r.result.reasons.map((reason) => (counted.length > 1 ? `${reason} at ${r.wavelengthNm} nm` : reason))))],
        results: results.get(p.id) ?? [],
      };
    });
  const { verdict, pieceVerdicts } = judgeLot(
    lot,
    plan,
    sampleIds,
    judgedVerdicts(
      [...results.values()].flat().map((r) => ({ pieceId: r.pieceId, wavelengthNm: r.wavelengthNm, verdict: r.verdict, judged: r.result.judged !== false })),
    ),
  );
  return { plan, planSummary: describePlan(plan), samplePieces, allResults: results, pieceVerdicts, verdict };
}

export type LotEvaluation = Awaited<ReturnType<typeof evaluateLot>>;

/** The key of a result among a piece's current ones: the wavelength as the table stores it (0.001 nm). */
const resultKey = (pieceId: number, wavelengthNm: number) => `${pieceId}@${Math.round(wavelengthNm * 1000)}`;

/**
 * The lot's proposal and each piece's verdict from the verdicts of its current results alone (not
 * the results themselves: cheap on lots of thousands of pieces); with `incoming`, as they would be
 * once these results replace the current ones of the same piece and wavelength (`replaced` counts
 * those), and as they are now (`now`).
 */
export async function lotProposal(lot: LotForInspection, transaction?: Transaction, incoming: ResultVerdict[] = []) {
  const { plan, sampleIds } = await planAndSample(lot, transaction);
  const current = await sequelize.query<ResultVerdict>(
    // Each piece's current results looked up in their index by the piece, whatever the size of the
    // table (OFFSET 0 keeps the planner from turning the lookups into a scan of every result).
    `SELECT p.id AS "pieceId", r.wavelength_nm::float8 AS "wavelengthNm", r.verdict, coalesce((r.result->>'judged')::boolean, true) AS judged
       FROM pieces p
       CROSS JOIN LATERAL (SELECT wavelength_nm, verdict, result FROM piece_results WHERE piece_id = p.id AND superseded_by_file_id IS NULL OFFSET 0) r
      WHERE p.lot_id = :lotId`,
    { type: QueryTypes.SELECT, transaction, replacements: { lotId: lot.id } },
  );
  const results = new Map(current.map((r) => [resultKey(r.pieceId, r.wavelengthNm), r]));
  const now = judgeLot(lot, plan, sampleIds, judgedVerdicts(current));
  const currentKeys = new Set(results.keys());
  const replacing = new Set<string>();
  for (const r of incoming) {
    const key = resultKey(r.pieceId, r.wavelengthNm);
    if (currentKeys.has(key)) replacing.add(key);
    results.set(key, r);
  }
  const replaced = replacing.size;
  return { plan, sampleIds, replaced, now, ...(incoming.length ? judgeLot(lot, plan, sampleIds, judgedVerdicts(results.values())) : now) };
}
