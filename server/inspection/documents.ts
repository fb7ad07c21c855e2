// Issues the documents of a disposition: an inspection report always, a certificate of conformance
// when pieces are released as conforming (an accepted lot, or a sorted one once every piece is
// measured). The certificate lists every serial it releases. Each document carries the SHA-256 of
// its certified data (canonical JSON, RFC 8785), which the public verification checks.
import canonicalize from 'canonicalize';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import { LotDocument, type DispositionRecord, type User } from '../../db/models';
import { fixed, formatDateTime } from '../../shared/format';
import { DISPOSITION_LABELS } from '../../shared/inspection/lotVerdict';
import { config } from '../config';
import { renderLotReport, type LotReportData, type ReportPiece } from '../documents/lotReport';
import { calibrationsOfFiles } from '../instruments/calibrations';
import { readSiteSettings } from '../settings/siteSettings';
import { sha256, storeBlob } from '../storage/blobs';
import type { LotEvaluation } from './evaluation';
import type { LotForInspection } from './lotAccess';
import { specLines } from './specText';

export const verifyUrl = (number: string, hash: string) => `${config.PUBLIC_URL}/verify?number=${encodeURIComponent(number)}&hash=${hash}`;

/** The data a document certifies, without its own hash and address. */
export function certifiedDataHash(data: Omit<LotReportData, 'dataHash' | 'verifyUrl'>) {
  return sha256(canonicalize(data)!);
}

/** One row per current result of each piece; a piece without one gets a row saying why. */
function pieceRows(pieces: { id: number; serial: string }[], evaluation: LotEvaluation, unmeasured: ReportPiece['verdict']): ReportPiece[] {
  return pieces.flatMap((piece): ReportPiece[] => {
    const results = evaluation.allResults.get(piece.id) ?? [];
    if (results.length === 0) {
      return [
        {
          serial: piece.serial,
          wavelengthNm: null,
          retardanceWaves: null,
          retardanceNm: null,
          retardanceErrorWaves: null,
          axisErrorDeg: null,
          verdict: unmeasured,
          reasons: [],
        },
      ];
    }
    return results.map((r) => ({
      serial: piece.serial,
      wavelengthNm: r.wavelengthNm,
      retardanceWaves: (r.result.retardanceWaves as number | null) ?? null,
      retardanceNm: (r.result.retardanceNm as number | null) ?? null,
      retardanceErrorWaves: (r.result.retardanceErrorWaves as number | null) ?? null,
      axisErrorDeg: (r.result.axisErrorDeg as number | null) ?? null,
      verdict: r.verdict,
      reasons: r.result.reasons,
    }));
  });
}

/** The report shows the sample and any other piece measured (every piece, once a lot is sorted). */
function reportedPieces(lot: LotForInspection, evaluation: LotEvaluation) {
  const inSample = new Set(evaluation.samplePieces.map((p) => p.pieceId));
  return lot.pieces.filter((p) => inSample.has(p.id) || evaluation.allResults.has(p.id));
}

async function instrumentsUsed(evaluation: LotEvaluation, transaction: Transaction) {
  const fileIds = [...new Set([...evaluation.allResults.values()].flatMap((rows) => rows.map((r) => r.fileId)))];
  // Each instrument with the calibration its readings were taken under (an older record for older files).
  const used = await calibrationsOfFiles(fileIds, transaction);
  return used.map((c) => ({
    code: c.code,
    calibratedOn: c.calibratedOn,
    calibrationDueOn: c.dueOn,
    uncertainty: `±${fixed(c.uncertaintyWaves, 4)} λ, ±${fixed(c.uncertaintyDeg, 2)}° (k = 2)`,
  }));
}

type Issue = {
  lot: LotForInspection;
  evaluation: LotEvaluation;
  disposition: DispositionRecord;
  signer: User;
  /** The pieces the decision releases to stock: with them, a certificate is issued that lists each one. */
  released: number[];
  /** Where the decision sent the lot's pieces, in words. */
  outcome: string;
  /** When the documents are issued: at the signature, or when the sort it ordered is complete. */
  issuedAt?: Date;
};

export async function issueLotDocuments(
  { lot, evaluation, disposition, signer, released, outcome, issuedAt = disposition.signedAt }: Issue,
  transaction: Transaction,
) {
  const [{ n }] = await sequelize.query<{ n: string }>("SELECT nextval('certificate_numbers') AS n", { type: QueryTypes.SELECT, transaction });
  const serial = `${issuedAt.getUTCFullYear()}-${String(n).padStart(5, '0')}`;
  const site = await readSiteSettings(transaction);
  const certifies = released.length > 0 && (disposition.decision === 'accept' || disposition.decision === 'sort');
  const kinds: LotReportData['kind'][] = certifies ? ['certificate', 'inspection-report'] : ['inspection-report'];
  const releasedIds = new Set(released);
  const { verdict } = evaluation;
  const common = {
    issuedAt: formatDateTime(issuedAt),
    siteName: site.siteName,
    supplier: lot.supplier.name,
    purchaseOrder: `${lot.poNumber} line ${lot.lineNumber}`,
    part: { number: lot.part.number, description: lot.part.description },
    specLines: specLines(lot.spec),
    lot: { id: lot.id, supplierLot: lot.supplierLot, quantity: lot.quantity, receivedAt: lot.receivedAt },
    sampling: { summary: evaluation.planSummary, defectives: verdict.defectives, result: `${verdict.proposal}: ${verdict.explanation}` },
    instruments: await instrumentsUsed(evaluation, transaction),
    decisionRule:
      lot.spec.decisionRule === 'guarded'
        ? 'guarded acceptance: |error| + U ≤ tolerance (ILAC-G8:09/2019, ISO 14253-1:2017)'
        : 'simple acceptance: |error| ≤ tolerance (ILAC-G8:09/2019)',
    disposition: {
      decision: DISPOSITION_LABELS[disposition.decision],
      signer: `${signer.name} (${signer.email})`,
      signedAt: formatDateTime(disposition.signedAt),
      meaning: disposition.meaning,
      deviation: disposition.deviationNumber ?? undefined,
      note: disposition.justification ?? undefined,
      outcome,
    },
  };
  const issued = [];
  for (const kind of kinds) {
    const number = `${kind === 'certificate' ? 'PLC' : 'PLR'}-${serial}`;
    const pieces =
      kind === 'certificate'
        ? pieceRows(
            lot.pieces.filter((p) => releasedIds.has(p.id)),
            evaluation,
            'released under the sampling plan',
          )
        : pieceRows(reportedPieces(lot, evaluation), evaluation, 'not measured');
    const certified = { ...common, kind, number, pieces };
    const dataHash = certifiedDataHash(certified);
    const pdf = await renderLotReport({ ...certified, dataHash, verifyUrl: verifyUrl(number, dataHash) });
    const document = await LotDocument.create(
      { lotId: lot.id, dispositionId: disposition.id, kind, number, dataHash, pdfSha256: sha256(pdf), storageKey: await storeBlob(pdf, transaction) },
      { transaction },
    );
    issued.push({ id: document.id, kind, number, dataHash, pdf });
  }
  return issued;
}
