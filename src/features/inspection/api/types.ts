// The shapes the inspection endpoints answer with (server/routes/inspection/presenter.ts).
import type { LotVerdict, Disposition, PieceVerdict } from '@shared/inspection/lotVerdict';
import type { LotState } from '@shared/schemas/stock';

export type ResultView = {
  id: number;
  fileId: number;
  wavelengthNm: number;
  verdict: 'pass' | 'fail' | 'incomplete';
  reasons: string[];
  retardanceWaves: number | null;
  retardanceNm: number | null;
  retardanceErrorWaves: number | null;
  retardanceErrorNm: number | null;
  fastAxisDeg: number | null;
  axisErrorDeg: number | null;
  judged: boolean;
  axisAmbiguous: boolean;
  diattenuation?: number;
  depolarizationIndex?: number;
  estimatedOrder?: number;
  thicknessMm?: number;
  createdAt: string;
};

export type LotInspectionView = {
  lot: { id: number; state: LotState; supplierLot: string; quantity: number; receivedAt: string; poNumber: string; lineNumber: number; part: { id: number; number: string; description: string }; supplier: { id: number; name: string } };
  spec: { nominalWaves: number; designWavelengthNm: number; retardanceTolWaves: number; axisTolDeg: number; decisionRule: 'simple' | 'guarded'; construction: string; material: string; multiOrder?: number; bandNm?: [number, number] };
  plan: { codeLetter: string; planLetter: string; sampleSize: number; accept: number; reject: number; severity: string; level: string; aql: number; hundredPercent: boolean; seed: string; summary: string; oc: { percentDefective: number; pa: number }[] };
  switching: { severity: string; stopped?: boolean };
  verdict: LotVerdict;
  /** While a 100 % sort runs: the pieces still without a verdict. */
  sort: { remaining: number } | null;
  /** toMeasure: in the sample, or any piece on site while the lot is sorted 100 %. */
  pieces: { id: number; serial: string; state: string; inSample: boolean; toMeasure: boolean; verdict: PieceVerdict | 'unmeasured'; results: ResultView[] }[];
  files: { id: number; name: string; sha256: string; sizeBytes: number; method: string; rows: number; instrument: string | null; uploadedBy: string | null; uploadedAt: string }[];
  disposition: { id: number; decision: Disposition } | null;
  dispositions: { id: number; decision: Disposition; meaning: string; deviationNumber: string | null; justification: string | null; signer: string | null; signedAt: string; supersededAt: string | null }[];
  documents: { id: number; kind: 'certificate' | 'inspection-report'; number: string; dataHash: string; issuedAt: string; revokedAt: string | null }[];
};

export type QueueRow = {
  lotId: number;
  state: LotState;
  part: { id: number; number: string; description: string };
  supplier: string;
  supplierLot: string;
  quantity: number;
  receivedAt: string;
  daysInQuarantine: number;
  supplierId: number;
  /** Received while acceptance is discontinued: no plan, no sample, no proposal until inspection resumes. */
  acceptanceDiscontinued: boolean;
  plan: { codeLetter: string; planLetter: string; sampleSize: number; accept: number; reject: number; severity: string } | null;
  sampleSerials: string[];
  measured: number;
  /** While a 100 % sort runs: the pieces still without a verdict. */
  sortRemaining: number | null;
  proposal: LotVerdict['proposal'] | null;
};

export type LineMessage = { line: number; message: string };

export type FilePreview = {
  name: string;
  sha256: string;
  sizeBytes: number;
  method: string | null;
  metadata: Record<string, string>;
  instrument: { id: number; code: string } | null;
  pieces: (Omit<ResultView, 'id' | 'fileId' | 'createdAt'> & { serial: string; lines: number[] })[];
  warnings: LineMessage[];
  errors: LineMessage[];
  fatal?: string;
};

export type InstrumentOption = { id: number; code: string; kind: string; active: boolean; calibrationCurrent: boolean; calibrationDueOn: string };
