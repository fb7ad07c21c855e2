// From measured pieces to what the supplier's page draws and the drift check judges, per
// characteristic (retardance error, fast-axis error): mean and spread of the pieces, Cp and Cpk
// against the ordered tolerance, the lot means in the order the lots arrived with their individuals
// limits, and an EWMA of the lot means around the ordered value (error 0). A drift is judged only on
// enough lots, with σ of a lot mean taken from the moving ranges of the lot means, which a slow
// drift barely widens.
import { capability, ewmaChart, individualsChart, summarize } from '../../shared/statistics';
import { MIN_LOTS_FOR_DRIFT, type CharacteristicView, type DriftCharacteristic, type LotMeanPoint } from '../../shared/schemas/supplierPerformance';
import { lotName } from '../../shared/schemas/stock';

/** EWMA weight and limit width (a weight of 0.2 with three-sigma limits: common practice). */
export const EWMA_LAMBDA = 0.2;
export const EWMA_WIDTH = 3;
const CONFIDENCE = 0.95;

/** One piece measured at the design wavelength, with the tolerances its PO line ordered. */
export type MeasuredPiece = {
  lotId: number;
  supplierLot: string;
  receivedAt: Date;
  retardanceErrorWaves: number;
  axisErrorDeg: number;
  retardanceTolWaves: number;
  axisTolDeg: number;
  failing: boolean;
};

const valueOf = (piece: MeasuredPiece, characteristic: DriftCharacteristic) =>
  characteristic === 'retardance' ? piece.retardanceErrorWaves : piece.axisErrorDeg;
const toleranceOf = (piece: MeasuredPiece, characteristic: DriftCharacteristic) =>
  characteristic === 'retardance' ? piece.retardanceTolWaves : piece.axisTolDeg;

/** The pieces grouped by lot, in the order given (the lots' arrival). */
function byLot(pieces: readonly MeasuredPiece[]) {
  const lots = new Map<number, MeasuredPiece[]>();
  for (const piece of pieces) {
    // Appended in place: copying the lot's list for each piece made a 20,000-piece lot cost gigabytes.
    const lot = lots.get(piece.lotId);
    if (lot) lot.push(piece);
    else lots.set(piece.lotId, [piece]);
  }
  return [...lots.values()];
}

/** Cp and Cpk against ±tolerance; when lines ordered different tolerances, each piece is judged
 * against its own (errors as fractions of their tolerance, limits ±1), which is the same when they agree. */
function capabilityOf(pieces: readonly MeasuredPiece[], characteristic: DriftCharacteristic, tolerancesDiffer: boolean) {
  const values = pieces.map((p) => (tolerancesDiffer ? valueOf(p, characteristic) / toleranceOf(p, characteristic) : valueOf(p, characteristic)));
  const limit = tolerancesDiffer ? 1 : toleranceOf(pieces[0], characteristic);
  const result = capability(summarize(values), { lower: -limit, upper: limit }, CONFIDENCE);
  if (!result) return null;
  return {
    cp: result.cp,
    cpk: result.cpk,
    cpLow: result.cpInterval!.low,
    cpHigh: result.cpInterval!.high,
    cpkLow: result.cpkInterval!.low,
    cpkHigh: result.cpkInterval!.high,
    confidence: CONFIDENCE,
  };
}

export function characteristicView(characteristic: DriftCharacteristic, pieces: readonly MeasuredPiece[]): CharacteristicView {
  const tolerances = new Set(pieces.map((p) => toleranceOf(p, characteristic)));
  const tolerancesDiffer = tolerances.size > 1;
  const summary = summarize(pieces.map((p) => valueOf(p, characteristic)));
  const lots = byLot(pieces);
  const means = lots.map((lot) => lot.reduce((sum, p) => sum + valueOf(p, characteristic), 0) / lot.length);
  const individuals = individualsChart(means);
  const sigma = individuals?.sigma ?? 0;
  const ewma = means.length >= MIN_LOTS_FOR_DRIFT && sigma > 0 ? ewmaChart(means, { target: 0, sigma, lambda: EWMA_LAMBDA, width: EWMA_WIDTH }) : null;
  const points: LotMeanPoint[] = lots.map((lot, i) => ({
    lot: { id: lot[0].lotId, name: lotName(lot[0].lotId), supplierLot: lot[0].supplierLot },
    receivedAt: lot[0].receivedAt.toISOString(),
    pieces: lot.length,
    outside: lot.filter((p) => Math.abs(valueOf(p, characteristic)) > toleranceOf(p, characteristic)).length,
    failing: lot.filter((p) => p.failing).length,
    mean: means[i],
    movingRange: individuals?.points[i].movingRange ?? null,
    ewma: ewma?.[i].ewma ?? null,
    ewmaUpper: ewma?.[i].upper ?? null,
    ewmaLower: ewma?.[i].lower ?? null,
    signal: ewma?.[i].signal ?? null,
  }));
  return {
    characteristic,
    tolerance: pieces.length ? toleranceOf(pieces[pieces.length - 1], characteristic) : 0,
    tolerancesDiffer,
    pieces: { n: summary.n, mean: Number.isNaN(summary.mean) ? null : summary.mean, sd: Number.isNaN(summary.sd) ? null : summary.sd },
    capability: pieces.length ? capabilityOf(pieces, characteristic, tolerancesDiffer) : null,
    individuals: individuals && {
      center: individuals.center,
      upper: individuals.upper,
      lower: individuals.lower,
      sigma: individuals.sigma,
      movingRangeUpper: individuals.movingRangeUpper,
    },
    ewma: ewma && { target: 0, lambda: EWMA_LAMBDA, width: EWMA_WIDTH, sigma },
    lots: points,
  };
}

/** The drift the newest lot shows: its EWMA beyond a limit, with the lots of that excursion (since
 * the EWMA was last on the ordered value's other side: as σ is re-estimated with each lot, a drift
 * may dip inside its limits and out again, and is still the same drift). Null when the newest lot
 * is within its limits. */
export function currentDrift(view: CharacteristicView) {
  const last = view.lots[view.lots.length - 1];
  if (!last?.signal || !view.ewma) return null;
  const side = Math.sign(last.ewma! - view.ewma.target);
  let start = view.lots.length - 1;
  while (start > 0 && Math.sign(view.lots[start - 1].ewma! - view.ewma.target) === side) start--;
  return {
    lot: last,
    direction: last.signal,
    limit: last.signal === 'high' ? last.ewmaUpper! : last.ewmaLower!,
    excursion: view.lots.slice(start).map((p) => p.lot.id),
  };
}
