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

// What the inspection endpoints answer: the server's presenters are typed with these, the client reads them.

/** A stored result of one piece at one wavelength: the engine's result as committed, and its row's keys. */
export type ResultView = Pick<
  PieceResult,
  | 'wavelengthNm'
  | 'verdict'
  | 'reasons'
  | 'retardanceWaves'
  | 'retardanceNm'
  | 'retardanceErrorWaves'
  | 'retardanceErrorNm'
  | 'fastAxisDeg'
  | 'axisErrorDeg'
  | 'judged'
  | 'axisAmbiguous'
  | 'diattenuation'
  | 'depolarizationIndex'
  | 'estimatedOrder'
  | 'thicknessMm'
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
    id: number;
    state: LotState;
    supplierLot: string;
    quantity: number;
    receivedAt: string;
    poNumber: string;
    lineNumber: number;
    part: { id: number; number: string; description: string };
    supplier: { id: number; name: string };
  };
  spec: PartSpec;
  plan: {
    codeLetter: string;
    planLetter: string;
    sampleSize: number;
    accept: number;
    reject: number;
    severity: string;
    level: string;
    aql: number;
    hundredPercent: boolean;
    seed: string;
    summary: string;
    oc: OcPoint[];
  };
  switching: SwitchingState;
  verdict: LotVerdict;
  /** While a 100 % sort runs: the pieces still without a verdict. */
  sort: { remaining: number } | null;
  /** toMeasure: in the sample, or any piece on site while the lot is sorted 100 %. */
  pieces: { id: number; serial: string; state: string; inSample: boolean; toMeasure: boolean; verdict: PieceVerdict | 'unmeasured'; results: ResultView[] }[];
  files: {
    id: number;
    name: string;
    sha256: string;
    sizeBytes: number;
    method: string;
    rows: number;
    instrument: string | null;
    metadata: Record<string, string>;
    uploadedBy: string | null;
    uploadedAt: string;
  }[];
  disposition: { id: number; decision: Disposition } | null;
  dispositions: {
    id: number;
    decision: Disposition;
    meaning: string;
    deviationNumber: string | null;
    justification: string | null;
    signer: string | null;
    signedAt: string;
    supersededAt: string | null;
  }[];
  documents: { id: number; kind: 'certificate' | 'inspection-report'; number: string; dataHash: string; issuedAt: string; revokedAt: string | null }[];
};

/** Entries of each list of a preview per page: the first page comes with the preview. */
export const PREVIEW_PAGE_SIZE = 50;

/** The lists of a file's preview that come a page at a time. */
export const PREVIEW_LISTS = ['pieces', 'errors', 'warnings'] as const;
export type PreviewList = (typeof PREVIEW_LISTS)[number];

/** A page of a checked file's list: the lot, the file's SHA-256 and the list; the instrument chosen for the upload (when the file names none). */
export const previewPageParams = z.object({
  id: z.coerce.number().int().positive().max(2_147_483_647),
  sha256: z.string().regex(/^[0-9a-f]{64}$/, 'A SHA-256 in hexadecimal'),
  list: z.enum(PREVIEW_LISTS),
});
export const previewPageQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(PREVIEW_PAGE_SIZE),
  instrumentId: z.coerce.number().int().positive().max(2_147_483_647).optional(),
  /** Pieces only: those with this verdict. */
  verdict: z.enum(['pass', 'fail', 'incomplete']).optional(),
});

/** A piece's result as a preview lists it: what the inspector checks before saving. */
export type PreviewPiece = Pick<
  PieceResult,
  'serial' | 'wavelengthNm' | 'retardanceWaves' | 'retardanceErrorWaves' | 'axisErrorDeg' | 'verdict' | 'reasons' | 'judged' | 'lines'
>;

/** A bench file run through the engine for the lot, nothing saved: what a commit of it would store, or why it cannot. */
export type FilePreview = {
  name: string;
  sha256: string;
  sizeBytes: number;
  method: Method | null;
  metadata: FileMetadata;
  /** The instrument the file was judged with (the one its `# instrument:` line names, else the one chosen). */
  instrument: { id: number; code: string } | null;
  /** The lot's piece results in the file by verdict, and how many errors and warnings it has in all. */
  counts: { pieces: number; pass: number; fail: number; incomplete: number; errors: number; warnings: number };
  /** The first page of each list (PREVIEW_PAGE_SIZE entries); the others from the file's preview pages.
   * Pieces: the lot's pieces in the file, in file order; rows of serials not in the lot are among the errors. */
  pieces: PreviewPiece[];
  warnings: LineMessage[];
  errors: LineMessage[];
  fatal?: string;
};

/** The sample's standing: how many sample pieces have a verdict, how many failed, and the proposal. */
export type SampleStanding = Pick<LotVerdict, 'measured' | 'defectives' | 'proposal' | 'explanation'>;

/** What saving the checked files would do to the lot's decision under its sampling plan. */
export type PlanEffect = {
  plan: { sampleSize: number; accept: number; reject: number };
  now: SampleStanding;
  afterSaving: SampleStanding;
  /** Pieces the files measure, in the sample and outside it (those do not count for the proposal). */
  samplePieces: number;
  otherPieces: number;
  /** Results of the files that replace a current result of the same piece and wavelength. */
  replacing: number;
  /** While a 100 % sort runs: pieces still without a verdict, now and once the files are saved. */
  sortRemaining: { now: number; afterSaving: number } | null;
};

/** The answer of a preview: each file, and the plan effect when every file could be saved (and the lot has a plan). */
export type MeasurementPreview = { files: FilePreview[]; planEffect: PlanEffect | null };
