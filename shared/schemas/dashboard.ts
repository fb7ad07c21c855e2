// What GET /api/dashboard answers: one section per role the user holds (and may read all of), each
// with its lists cut to a few rows and the full count beside them.
import type { InstrumentView } from './instruments';
import type { LotState } from './stock';

/** The first rows of a list and how many there are in all. */
export type Listed<Row> = { total: number; rows: Row[] };

/** A labelled count, drawn as a bar beside the others of its chart. */
export type Bar = { label: string; value: number; link?: string };

export type DashboardLotRow = {
  lotId: number;
  state: LotState;
  partNumber: string;
  supplier: string;
  quantity: number;
  receivedOn: string;
  /** Whole days since the shipment arrived (in quarantine or waiting since). */
  days: number;
};

export type ReceivingSection = {
  /** PO lines still owed pieces, due within the next two weeks or late. */
  due: Listed<{
    purchaseOrderId: number;
    purchaseOrder: string;
    line: number;
    partNumber: string;
    supplier: string;
    dueOn: string;
    outstanding: number;
    /** Days past the due date; negative while it is still ahead. */
    daysLate: number;
  }> & { late: number };
  /** Everything still owed on open POs: lines and pieces, and the pieces awaited from each supplier. */
  awaited: { lines: number; pieces: number; bySupplier: Bar[] };
};

export type InspectionSection = {
  /** Lots to measure (quarantine, under inspection, sorting), oldest first. */
  toMeasure: Listed<DashboardLotRow>;
  /** Those lots by days waiting. */
  ages: Bar[];
};

export type QualitySection = {
  awaitingSignature: Listed<DashboardLotRow>;
  openNcrs: Listed<{ id: number; number: string; status: 'open' | 'dispositioned'; supplier: string; partNumber: string; openedOn: string; days: number }>;
  /** Open NCRs by age. */
  ncrAges: Bar[];
  /** Active instruments whose calibration falls due within 30 days or has lapsed. */
  calibrations: Listed<{ instrumentId: number; code: string; kind: InstrumentView['kind']; dueOn: string; daysLeft: number }> & { lapsed: number };
};

export type PurchasingSection = {
  /** Lots whose current decision rejects them (reject, or reject with a 100 % sort), in the last 90 days. */
  rejected: Listed<{
    lotId: number;
    decision: 'reject' | 'sort';
    partNumber: string;
    supplier: string;
    purchaseOrder: string;
    signedOn: string;
    yours: boolean;
  }>;
  rejectedBySupplier: Bar[];
  openCorrective: Listed<{
    id: number;
    number: string;
    status: 'awaiting-response' | 'responded' | 'accepted';
    supplier: string;
    partNumber: string;
    responseDueOn: string;
    days: number;
    late: boolean;
  }> & { late: number };
};

export type AuditSection = {
  /** Certificates and inspection reports, newest first; the total counts the last 30 days. */
  documents: Listed<{ id: number; number: string; kind: 'certificate' | 'inspection-report'; lotId: number; issuedAt: string; revoked: boolean }>;
  /** Documents issued per day over the last 14 days. */
  perDay: Bar[];
  chain: { length: string; lastEntryAt: string | null; tailChecked: number; tailIntact: boolean };
};

export type DashboardView = {
  receiving?: ReceivingSection;
  inspection?: InspectionSection;
  quality?: QualitySection;
  purchasing?: PurchasingSection;
  audit?: AuditSection;
};

export type DashboardSectionName = keyof DashboardView;
