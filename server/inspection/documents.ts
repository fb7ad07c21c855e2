// Issues the documents of a disposition: an inspection report always, a certificate of conformance
// when the lot is accepted. Each carries the SHA-256 of its certified data (canonical JSON,
// RFC 8785), which the public verification checks.
import canonicalize from 'canonicalize';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import { Instrument, LotDocument, MeasurementFile, type DispositionRecord, type User } from '../../db/models';
import { DISPOSITION_LABELS } from '../../shared/inspection/lotVerdict';
import { config } from '../config';
import { renderLotReport, type LotReportData, type ReportPiece } from '../documents/lotReport';
import { readSiteSettings } from '../routes/settings/operations';
import { sha256, storeBlob } from '../storage/blobs';
import type { LotEvaluation } from './evaluation';
import type { LotForInspection } from './lotAccess';
import { specLines } from './specText';

const utc = (date: Date) => `${date.toISOString().slice(0, 16).replace('T', ' ')} UTC`;

export const verifyUrl = (number: string, hash: string) => `${config.PUBLIC_URL}/verify?number=${encodeURIComponent(number)}&hash=${hash}`;

/** The data a document certifies, without its own hash and address. */
export function certifiedDataHash(data: Omit<LotReportData, 'dataHash' | 'verifyUrl'>) {
  return sha256(canonicalize(data)!);
}

function reportPieces(evaluation: LotEvaluation): ReportPiece[] {
  return evaluation.samplePieces.flatMap((piece): ReportPiece[] => {
    if (piece.results.length === 0) {
      return [{ serial: piece.serial, wavelengthNm: null, retardanceWaves: null, retardanceNm: null, retardanceErrorWaves: null, axisErrorDeg: null, verdict: 'not sampled', reasons: ['not measured'] }];
    }
    return piece.results.map((r) => ({
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

async function instrumentsUsed(evaluation: LotEvaluation, transaction: Transaction) {
  const fileIds = [...new Set(evaluation.samplePieces.flatMap((p) => p.results.map((r) => r.fileId)))];
  const files = await MeasurementFile.findAll({ where: { id: fileIds }, transaction });
  const instruments = await Instrument.findAll({ where: { id: [...new Set(files.map((f) => f.instrumentId))] }, order: [['code', 'ASC']], transaction });
  return instruments.map((i) => ({
    code: i.code,
    calibratedOn: i.calibratedOn,
    calibrationDueOn: i.calibrationDueOn,
    uncertainty: `±${i.uncertaintyWaves.toFixed(4)} λ, ±${i.uncertaintyDeg.toFixed(2)}° (k = 2)`,
  }));
}

type Issue = { lot: LotForInspection; evaluation: LotEvaluation; disposition: DispositionRecord; signer: User };

export async function issueLotDocuments({ lot, evaluation, disposition, signer }: Issue, transaction: Transaction) {
  const [{ n }] = await sequelize.query<{ n: string }>("SELECT nextval('certificate_numbers') AS n", { type: QueryTypes.SELECT, transaction });
  const serial = `${disposition.signedAt.getUTCFullYear()}-${String(n).padStart(5, '0')}`;
  const site = await readSiteSettings(transaction);
  const kinds: LotReportData['kind'][] = disposition.decision === 'accept' ? ['certificate', 'inspection-report'] : ['inspection-report'];
  const { verdict } = evaluation;
  const common = {
    issuedAt: utc(disposition.signedAt),
    siteName: site.siteName,
    supplier: lot.supplier.name,
    purchaseOrder: `${lot.poNumber} line ${lot.lineNumber}`,
    part: { number: lot.part.number, description: lot.part.description },
    specLines: specLines(lot.spec),
    lot: { id: lot.id, supplierLot: lot.supplierLot, quantity: lot.quantity, receivedAt: lot.receivedAt },
    sampling: { summary: evaluation.planSummary, defectives: verdict.defectives, result: `${verdict.proposal}: ${verdict.explanation}` },
    instruments: await instrumentsUsed(evaluation, transaction),
    decisionRule: lot.spec.decisionRule === 'guarded' ? 'guarded acceptance: |error| + U ≤ tolerance (ILAC-G8:09/2019, ISO 14253-1:2017)' : 'simple acceptance: |error| ≤ tolerance (ILAC-G8:09/2019)',
    disposition: {
      decision: DISPOSITION_LABELS[disposition.decision],
      signer: `${signer.name} (${signer.email})`,
      signedAt: utc(disposition.signedAt),
      meaning: disposition.meaning,
      deviation: disposition.deviationNumber ? `${disposition.deviationNumber}: ${disposition.justification}` : undefined,
    },
    pieces: reportPieces(evaluation),
  };
  const issued = [];
  for (const kind of kinds) {
    const number = `${kind === 'certificate' ? 'PLC' : 'PLR'}-${serial}`;
    const certified = { ...common, kind, number };
    const dataHash = certifiedDataHash(certified);
    const pdf = await renderLotReport({ ...certified, dataHash, verifyUrl: verifyUrl(number, dataHash) });
    const document = await LotDocument.create(
      { lotId: lot.id, dispositionId: disposition.id, kind, number, dataHash, pdfSha256: sha256(pdf), storageKey: storeBlob(pdf) },
      { transaction },
    );
    issued.push({ id: document.id, kind, number, dataHash, pdf });
  }
  return issued;
}
