import jstat from 'jstat';
import { describe, expect, it } from 'vitest';
import { MIN_LOTS_FOR_DRIFT } from '../../shared/schemas/supplierPerformance';
import { characteristicView, currentDrift, type MeasuredPiece } from './series';
import { addCounts, figuresOf, type FigureCounts } from './figures';

const { jStat } = jstat;

const piece = (lotId: number, retardanceErrorWaves: number, axisErrorDeg = 0, tolerances = { retardanceTolWaves: 0.003, axisTolDeg: 0.5 }): MeasuredPiece => ({
  lotId,
  supplierLot: `S-${lotId}`,
  receivedAt: new Date(Date.UTC(2026, 5, lotId)),
  retardanceErrorWaves,
  axisErrorDeg,
  ...tolerances,
  failing: Math.abs(retardanceErrorWaves) > tolerances.retardanceTolWaves,
});

describe('a characteristic of a supplier-part', () => {
  const pieces = [
    ...[-0.001, 0, 0.001, 0.0005, -0.0005].map((e) => piece(1, e)),
    ...[0.0012, 0.0004, 0.0008].map((e) => piece(2, e)),
    ...[0.002, 0.001].map((e) => piece(3, e)),
  ];
  const view = characteristicView('retardance', pieces);

  it('gives the mean and sample spread of every piece, as jstat computes them', () => {
    const values = pieces.map((p) => p.retardanceErrorWaves);
    expect(view.pieces.n).toBe(10);
    expect(view.pieces.mean).toBeCloseTo(jStat.mean(values), 15);
    expect(view.pieces.sd).toBeCloseTo(jStat.stdev(values, true), 15);
  });

  it('judges Cp and Cpk against the ordered ±0.003 λ', () => {
    // Definitions (NIST/SEMATECH e-Handbook 6.1.6): Cp = (USL − LSL)/6s, Cpk = min(USL − x̄, x̄ − LSL)/3s,
    // with x̄ and s from jstat.
    const values = pieces.map((p) => p.retardanceErrorWaves);
    const s = jStat.stdev(values, true);
    const mean = jStat.mean(values);
    expect(view.capability!.cp).toBeCloseTo(0.006 / (6 * s), 10);
    expect(view.capability!.cpk).toBeCloseTo((0.003 - mean) / (3 * s), 10);
    expect(view.capability!.cpkLow).toBeLessThan(view.capability!.cpk);
    expect(view.capability!.confidence).toBe(0.95);
    expect(view.tolerance).toBe(0.003);
    expect(view.tolerancesDiffer).toBe(false);
  });

  it('charts one mean per lot in arrival order with its moving range', () => {
    // By hand: lot means 0, 0.0008, 0.0015; moving ranges 0.0008, 0.0007.
    expect(view.lots.map((l) => l.lot.name)).toEqual(['L-1', 'L-2', 'L-3']);
    expect(view.lots.map((l) => l.mean)).toEqual([expect.closeTo(0, 12), expect.closeTo(0.0008, 12), expect.closeTo(0.0015, 12)]);
    expect(view.lots.map((l) => l.movingRange)).toEqual([null, expect.closeTo(0.0008, 12), expect.closeTo(0.0007, 12)]);
    expect(view.lots.map((l) => [l.pieces, l.outside, l.failing])).toEqual([
      [5, 0, 0],
      [3, 0, 0],
      [2, 0, 0],
    ]);
    // x̄ = 0.00076667, MR̄ = 0.00075, σ̂ = MR̄/1.128 (d₂ for ranges of two, R's qcc exp.R.unscaled).
    expect(view.individuals!.sigma).toBeCloseTo(0.00075 / 1.128, 12);
    expect(view.individuals!.center).toBeCloseTo(0.0023 / 3, 12);
  });

  it(`judges no drift below ${MIN_LOTS_FOR_DRIFT} lots`, () => {
    expect(view.ewma).toBeNull();
    expect(view.lots.every((l) => l.ewma === null && l.signal === null)).toBe(true);
    expect(currentDrift(view)).toBeNull();
  });

  it('judges each piece against its own tolerance when the lines ordered different ones', () => {
    // Errors as fractions of their tolerance: 0.5, −0.5, 0.25, −0.25 against ±1: s of those is the
    // spread, Cp = 2/(6s) (definition, as above).
    const mixed = [
      piece(1, 0.0015),
      piece(1, -0.0015),
      piece(2, 0.0005, 0, { retardanceTolWaves: 0.002, axisTolDeg: 0.5 }),
      piece(2, -0.0005, 0, { retardanceTolWaves: 0.002, axisTolDeg: 0.5 }),
    ];
    const mixedView = characteristicView('retardance', mixed);
    expect(mixedView.tolerancesDiffer).toBe(true);
    expect(mixedView.tolerance).toBe(0.002);
    expect(mixedView.capability!.cp).toBeCloseTo(2 / (6 * jStat.stdev([0.5, -0.5, 0.25, -0.25], true)), 10);
  });
});

describe('pieces outside the tolerance', () => {
  it('are counted per characteristic, against the tolerance of their own line', () => {
    // A plate 0.6° off its mark (±0.5° ordered) with its retardance in tolerance, and one 0.0035 λ long.
    const pieces = [piece(1, 0, 0.6), piece(1, 0.0035, 0), piece(1, 0.001, 0.1)];
    expect(characteristicView('axis', pieces).lots[0]).toMatchObject({ pieces: 3, outside: 1 });
    expect(characteristicView('retardance', pieces).lots[0]).toMatchObject({ pieces: 3, outside: 1, failing: 1 });
  });
});

describe('drift of the lot means', () => {
  // Six steady lots around zero, then the mean axis error walks away (a marking jig that moved).
  const levels = [0.01, -0.01, 0.02, -0.02, 0.0, 0.01, 0.06, 0.1, 0.15];
  const pieces = levels.flatMap((level, lot) => [-0.01, 0, 0.01].map((e) => piece(lot + 1, 0, level + e)));

  it('signals on the side the mean walks, and names the lots of the excursion', () => {
    const view = characteristicView('axis', pieces);
    expect(view.ewma).toMatchObject({ target: 0, lambda: 0.2, width: 3 });
    const drift = currentDrift(view)!;
    expect(drift.direction).toBe('high');
    expect(drift.lot.lot.id).toBe(9);
    expect(drift.limit).toBe(drift.lot.ewmaUpper);
    expect(drift.excursion[drift.excursion.length - 1]).toBe(9);
    // The excursion runs back to where the EWMA was last below the ordered value (0).
    const first = view.lots.findIndex((l) => l.lot.id === drift.excursion[0]);
    expect(view.lots.slice(first).every((l) => l.ewma! > 0)).toBe(true);
    expect(view.lots[first - 1].ewma!).toBeLessThanOrEqual(0);
  });

  it('is quiet while the newest lot is back within its limits', () => {
    const view = characteristicView('axis', [...pieces, ...[0, 0, 0].map(() => piece(10, 0, -0.2))]);
    expect(view.lots.at(-1)!.signal).toBeNull();
    expect(currentDrift(view)).toBeNull();
  });
});

describe('scorecard figures from counts', () => {
  const zero: FigureCounts = {
    lotsReceived: 0,
    lotsDecided: 0,
    lotsAccepted: 0,
    piecesInspected: 0,
    piecesNonconforming: 0,
    lotsWithDueDate: 0,
    lotsOnTime: 0,
    ncrOpen: 0,
    ncrOpenDays: 0,
    ncrOldestDays: null,
    ncrOpened: 0,
    carOpen: 0,
    carOpenDays: 0,
    carOldestDays: null,
    carOverdue: 0,
    carRequested: 0,
  };

  it('has no rates without anything to divide by', () => {
    const figures = figuresOf(zero);
    expect([figures.acceptanceRate, figures.ppm, figures.onTimeRate, figures.ncrs.oldestOpenDays, figures.ncrs.meanOpenDays]).toEqual([
      null,
      null,
      null,
      null,
      null,
    ]);
  });

  it("adds parts' counts into the supplier's and forms its rates from the sums", () => {
    // By hand: 3 of 4 lots accepted; 2 nonconforming of 250 inspected = 8000 ppm; 1 of 2 on time;
    // NCRs open 10 + 4 days → mean 7, oldest 10.
    const a = {
      ...zero,
      lotsReceived: 3,
      lotsDecided: 3,
      lotsAccepted: 3,
      piecesInspected: 150,
      lotsWithDueDate: 2,
      lotsOnTime: 1,
      ncrOpen: 1,
      ncrOpenDays: 10,
      ncrOldestDays: 10,
    };
    const b = {
      ...zero,
      lotsReceived: 2,
      lotsDecided: 1,
      piecesInspected: 100,
      piecesNonconforming: 2,
      ncrOpen: 1,
      ncrOpenDays: 4,
      ncrOldestDays: 4,
      ncrOpened: 1,
    };
    const figures = figuresOf(addCounts([a, b]));
    expect(figures).toMatchObject({
      lotsReceived: 5,
      lotsDecided: 4,
      lotsAccepted: 3,
      acceptanceRate: 0.75,
      piecesInspected: 250,
      piecesNonconforming: 2,
      ppm: 8000,
      onTimeRate: 0.5,
    });
    expect(figures.ncrs).toEqual({ open: 2, oldestOpenDays: 10, meanOpenDays: 7, openedInPeriod: 1 });
  });
});
