// One lot's whole inspection as its page shows it (the queue is a list, server/inspection/queue.ts).
import { ocCurve } from '../../../shared/sampling';
import type { PieceResult } from '../../../shared/optics';
import type { LotInspectionView } from '../../../shared/schemas/inspection';
import type { LotState } from '../../../shared/schemas/stock';
import type { LotInspectionRecord } from '../../inspection/lotInspection';
import { piecesLeftToSort } from '../../inspection/sort';

export function presentLotInspection({
  lot,
  evaluation,
  files,
  dispositions,
  documents,
  switching,
  people,
  instruments,
}: LotInspectionRecord): LotInspectionView {
  const { plan } = evaluation;
  const inSample = new Set(evaluation.samplePieces.map((p) => p.pieceId));
  const current = dispositions.find((d) => !d.supersededAt) ?? null;
  // A sort puts every piece still on site up for measurement, not only the sample.
  const sorting = lot.state === 'sorting';
  return {
    lot: {
      id: lot.id,
      state: lot.state as LotState,
      supplierLot: lot.supplierLot,
      quantity: lot.quantity,
      receivedAt: lot.receivedAt,
      poNumber: lot.poNumber,
      lineNumber: lot.lineNumber,
      part: lot.part,
      supplier: lot.supplier,
    },
    spec: lot.spec,
    plan: {
      codeLetter: plan.codeLetter,
      planLetter: plan.planLetter,
      sampleSize: plan.sampleSize,
      accept: plan.acceptNumber,
      reject: plan.rejectNumber,
      severity: plan.severity,
      level: plan.inspectionLevel,
      aql: plan.aql,
      hundredPercent: plan.hundredPercent,
      seed: plan.sampleSeed,
      summary: evaluation.planSummary,
      // The lot is accepted below Re, which a reduced plan's gap puts above Ac + 1.
      oc: ocCurve({ sampleSize: plan.sampleSize, accept: plan.rejectNumber - 1 }, 41),
    },
    switching,
    verdict: evaluation.verdict,
    sort: sorting ? { remaining: piecesLeftToSort(lot, evaluation).length } : null,
    pieces: lot.pieces.map((p) => ({
      id: p.id,
      serial: p.serial,
      state: p.state,
      inSample: inSample.has(p.id),
      toMeasure: sorting ? p.state !== 'issued' : inSample.has(p.id),
      verdict: evaluation.pieceVerdicts.get(p.id) ?? 'unmeasured',
      // The stored JSON is the engine's whole result of the piece (its wavelength and verdict too) as its file was committed.
      results: (evaluation.allResults.get(p.id) ?? []).map((r) => ({
        id: r.id,
        fileId: r.fileId,
        ...(r.result as unknown as PieceResult),
        createdAt: r.createdAt.toISOString(),
      })),
    })),
    files: files.map((f) => ({
      id: f.id,
      name: f.originalName,
      sha256: f.sha256,
      sizeBytes: f.sizeBytes,
      method: f.method,
      rows: f.rowCount,
      instrument: instruments.get(f.instrumentId) ?? null,
      metadata: f.metadata,
      uploadedBy: people.get(f.uploadedBy) ?? null,
      uploadedAt: f.uploadedAt.toISOString(),
    })),
    disposition: current ? { id: current.id, decision: current.decision } : null,
    dispositions: dispositions.map((d) => ({
      id: d.id,
      decision: d.decision,
      meaning: d.meaning,
      deviationNumber: d.deviationNumber,
      justification: d.justification,
      signer: people.get(d.signerId) ?? null,
      signedAt: d.signedAt.toISOString(),
      supersededAt: d.supersededAt?.toISOString() ?? null,
    })),
    documents: documents.map((d) => ({
      id: d.id,
      kind: d.kind,
      number: d.number,
      dataHash: d.dataHash,
      issuedAt: d.issuedAt.toISOString(),
      revokedAt: d.revokedAt?.toISOString() ?? null,
    })),
  };
}
