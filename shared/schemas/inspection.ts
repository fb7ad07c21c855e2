import { z } from 'zod';
import type { Disposition, LotVerdict, PieceVerdict } from '../inspection/lotVerdict';
import type { FileMetadata, LineMessage, Method, PieceResult } from '../optics/types';
import type { OcPoint } from '../sampling/oc';
import type { SwitchingState } from '../sampling/switching';
import type { PartSpec } from './spec';
import type { LotState } from './stock';

export const measurementUploadSchema = z.object({
  instrumentId: z.coerce.number().int().positive().optional(),
});

export const lotIdParams = z.object({ id: z.coerce.number().int().positive() });

// What the inspection endpoints answer: the server's presenters are typed with these, the client reads them.

/** A stored result of one piece at one wavelength: the engine's result as committed, and its row's keys. */
export type ResultView = Pick<
  PieceResult,
  | 'wavelengthNm' | 'verdict' | 'reasons' | 'retardanceWaves' | 'retardanceNm' | 'retardanceErrorWaves' | 'retardanceErrorNm'
  | 'fastAxisDeg' | 'axisErrorDeg' | 'judged' | 'axisAmbiguous' | 'diattenuation' | 'depolarizationIndex' | 'estimatedOrder' | 'thicknessMm'
> & { id: number; fileId: number; createdAt: string };

/** A row of the inspection queue. */
export type QueueRow = {
  lotId: number;
  state: LotState;
  part: { id: number; number: string; description: string };
  supplier: string;
  supplierId: number;
  supplierLot: string;
  quantity: number;
  receivedAt: string;
  daysInQuarantine: number;
  /** Received while acceptance is discontinued: no plan, no sample, no proposal until inspection resumes. */
  acceptanceDiscontinued: boolean;
  plan: { codeLetter: string; planLetter: string; sampleSize: number; accept: number; reject: number; severity: string } | null;
  sampleSerials: string[];
  measured: number;
  /** While a 100 % sort runs: the pieces still without a verdict. */
  sortRemaining: number | null;
  proposal: LotVerdict['proposal'] | null;
};

/** One lot's whole inspection record. */
export type LotInspectionView = {
  lot: {
    id: number; state: LotState; supplierLot: string; quantity: number; receivedAt: string; poNumber: string; lineNumber: number;
    part: { id: number; number: string; description: string }; supplier: { id: number; name: string };
  };
  spec: PartSpec;
  plan: {
    codeLetter: string; planLetter: string; sampleSize: number; accept: number; reject: number; severity: string; level: string; aql: number;
    hundredPercent: boolean; seed: string; summary: string; oc: OcPoint[];
  };
  switching: SwitchingState;
  verdict: LotVerdict;
  /** While a 100 % sort runs: the pieces still without a verdict. */
  sort: { remaining: number } | null;
  /** toMeasure: in the sample, or any piece on site while the lot is sorted 100 %. */
  pieces: { id: number; serial: string; state: string; inSample: boolean; toMeasure: boolean; verdict: PieceVerdict | 'unmeasured'; results: ResultView[] }[];
  files: {
    id: number; name: string; sha256: string; sizeBytes: number; method: string; rows: number; instrument: string | null;
    metadata: Record<string, string>; uploadedBy: string | null; uploadedAt: string;
  }[];
  disposition: { id: number; decision: Disposition } | null;
  dispositions: {
    id: number; decision: Disposition; meaning: string; deviationNumber: string | null; justification: string | null; signer: string | null;
    signedAt: string; supersededAt: string | null;
  }[];
  documents: { id: number; kind: 'certificate' | 'inspection-report'; number: string; dataHash: string; issuedAt: string; revokedAt: string | null }[];
};

/** A bench file run through the engine for the lot, nothing saved: what a commit of it would store, or why it cannot. */
export type FilePreview = {
  name: string;
  sha256: string;
  sizeBytes: number;
  method: Method | null;
  metadata: FileMetadata;
  /** The instrument the file was judged with (the one its `# instrument:` line names, else the one chosen). */
  instrument: { id: number; code: string } | null;
  /** The lot's pieces in the file; rows of serials not in the lot are among the errors. */
  pieces: PieceResult[];
  warnings: LineMessage[];
  errors: LineMessage[];
  fatal?: string;
};
