// Supplier performance: the scorecard of a supplier (or one of its parts) over a period, the ranked
// list of suppliers, the capability and drift charts of a supplier-part, and the drift alarms.
import { z } from 'zod';
import { listQuerySchema } from './paging';
import type { SwitchingPhase } from '../sampling';

/** A period with no dates given: the year up to today. */
export const DEFAULT_PERIOD_DAYS = 365;
const MAX_PERIOD_DAYS = 10 * 366;
const DAY_MS = 86_400_000;

const optionalDate = (label: string) => z.preprocess((v) => (v === '' || v === null ? undefined : v), z.iso.date(`Give the ${label} as a date`).optional());
const optionalId = z.preprocess((v) => (v === '' || v === null ? undefined : v), z.coerce.number().int().positive().max(2_147_483_647).optional());

const periodFields = { from: optionalDate('first day'), to: optionalDate('last day') };

function checkPeriod(period: { from?: string; to?: string }, context: z.RefinementCtx) {
  if (period.from && period.to && period.from > period.to) context.addIssue({ code: 'custom', path: ['from'], message: 'The first day comes after the last' });
  else if (period.from && period.to && (Date.parse(period.to) - Date.parse(period.from)) / DAY_MS > MAX_PERIOD_DAYS) {
    context.addIssue({ code: 'custom', path: ['from'], message: 'A period of at most ten years' });
  }
}

export const scorecardQuerySchema = z.object({ partId: optionalId, ...periodFields }).superRefine(checkPeriod);
export type ScorecardQuery = z.infer<typeof scorecardQuerySchema>;

export const capabilityQuerySchema = z
  .object({ partId: z.coerce.number({ error: 'Choose a part' }).int().positive().max(2_147_483_647), ...periodFields })
  .superRefine(checkPeriod);
export type CapabilityQuery = z.infer<typeof capabilityQuerySchema>;

export const supplierRankingQuerySchema = listQuerySchema.extend(periodFields).superRefine(checkPeriod);
export type SupplierRankingQuery = z.infer<typeof supplierRankingQuerySchema>;

export type Period = { from: string; to: string };

const isoDay = (time: number) => new Date(time).toISOString().slice(0, 10);

/** The dates a query names, the missing ones filled in: up to `today`, DEFAULT_PERIOD_DAYS long. */
export function resolvePeriod(query: { from?: string; to?: string }, today: Date = new Date()): Period {
  const to = query.to ?? (query.from ? isoDay(Math.max(Date.parse(query.from), Date.parse(isoDay(today.getTime())))) : isoDay(today.getTime()));
  const from = query.from ?? isoDay(Date.parse(to) - (DEFAULT_PERIOD_DAYS - 1) * DAY_MS);
  return { from, to };
}

/** Open records of one kind (NCRs, corrective actions) and how long they have been open. */
export type OpenRecords = { open: number; oldestOpenDays: number | null; meanOpenDays: number | null };

export type ScorecardFigures = {
  /** Lots whose shipment arrived in the period. */
  lotsReceived: number;
  /** Of those, lots with a signed decision, and those accepted (a sort or a use as is is not an acceptance). */
  lotsDecided: number;
  lotsAccepted: number;
  acceptanceRate: number | null;
  /** Pieces of those lots with a pass or fail verdict, and those failing. */
  piecesInspected: number;
  piecesNonconforming: number;
  /** Nonconforming pieces per million pieces inspected. */
  ppm: number | null;
  /** Lots whose PO line has a due date, and those received on or before it. */
  lotsWithDueDate: number;
  lotsOnTime: number;
  onTimeRate: number | null;
  /** NCRs and corrective actions open now, with their age; those opened in the period. */
  ncrs: OpenRecords & { openedInPeriod: number };
  correctiveActions: OpenRecords & { overdue: number; requestedInPeriod: number };
};

export type SwitchingStanding = { phase: SwitchingPhase; consecutiveAccepted: number };

export type ScorecardPartRow = {
  part: { id: number; number: string; description: string };
  figures: ScorecardFigures;
  /** The switching state now; null when no lot of the part has been decided yet. */
  switching: SwitchingStanding | null;
};

export type DriftAlarmView = {
  id: number;
  part: { id: number; number: string };
  characteristic: DriftCharacteristic;
  direction: 'high' | 'low';
  lot: { id: number; name: string; supplierLot: string };
  lotMean: number;
  ewma: number;
  limit: number;
  failingPieces: number;
  raisedAt: string;
};

export type SupplierScorecardView = {
  supplier: { id: number; name: string; owner: { id: number; name: string } | null; active: boolean };
  part: { id: number; number: string; description: string } | null;
  period: Period;
  figures: ScorecardFigures;
  parts: ScorecardPartRow[];
  alarms: DriftAlarmView[];
};

export type SupplierRankingRow = {
  rank: number | null;
  supplier: { id: number; name: string; active: boolean };
  lotsReceived: number;
  lotsDecided: number;
  acceptanceRate: number | null;
  ppm: number | null;
  onTimeRate: number | null;
  openNcrs: number;
  openCorrectiveActions: number;
  alarms: number;
  period: Period;
};

export const DRIFT_CHARACTERISTICS = ['retardance', 'axis'] as const;
/** Fewer lot means than this say nothing about a drift. */
export const MIN_LOTS_FOR_DRIFT = 5;
export type DriftCharacteristic = (typeof DRIFT_CHARACTERISTICS)[number];

export const CHARACTERISTIC_LABELS: Record<DriftCharacteristic, { name: string; unit: string }> = {
  retardance: { name: 'Retardance error', unit: 'λ' },
  axis: { name: 'Fast-axis error', unit: '°' },
};

export type LotMeanPoint = {
  lot: { id: number; name: string; supplierLot: string };
  receivedAt: string;
  /** Pieces measured at the design wavelength, those with this error beyond the ordered tolerance,
   * and those failing (for any reason). */
  pieces: number;
  outside: number;
  failing: number;
  mean: number;
  movingRange: number | null;
  ewma: number | null;
  ewmaUpper: number | null;
  ewmaLower: number | null;
  signal: 'high' | 'low' | null;
};

export type CharacteristicView = {
  characteristic: DriftCharacteristic;
  /** The ordered tolerance (± this), of the latest lot's PO line. */
  tolerance: number;
  /** Lines of the period ordered different tolerances: Cp and Cpk then judge each piece against its own. */
  tolerancesDiffer: boolean;
  pieces: { n: number; mean: number | null; sd: number | null };
  capability: { cp: number; cpk: number; cpLow: number; cpHigh: number; cpkLow: number; cpkHigh: number; confidence: number } | null;
  /** Individuals chart of the lot means; null below two lots. */
  individuals: { center: number; upper: number; lower: number; sigma: number; movingRangeUpper: number } | null;
  /** The EWMA's settings; null when there are too few lots (or no spread) to judge drift. */
  ewma: { target: number; lambda: number; width: number; sigma: number } | null;
  lots: LotMeanPoint[];
};

export type CapabilityView = {
  supplier: { id: number; name: string };
  part: { id: number; number: string; description: string };
  period: Period;
  /** Pieces left out of the statistics because their mark is on the slow axis (a gross marking error). */
  markOnSlowAxis: number;
  characteristics: CharacteristicView[];
  alarms: DriftAlarmView[];
};
