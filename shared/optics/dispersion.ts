/**
 * Birefringence dispersion of crystal plate materials, and the order and physical thickness of a
 * plate estimated from its fractional retardance at several wavelengths.
 */
import { modulo, wrapWaves } from './units.js';

export type Material = 'quartz' | 'mgf2' | 'polymer' | 'mica' | 'other';

export interface BirefringentMaterial {
  name: string;
  /** n_e - n_o at a vacuum wavelength in nm. */
  birefringence(wavelengthNm: number): number;
  validNm: readonly [number, number];
}

/**
 * Crystal quartz: G. Ghosh, "Dispersion-equation coefficients for the refractive index and
 * birefringence of calcite and quartz crystals", Opt. Commun. 163, 95 (1999):
 * n² = A + B λ²/(λ² - C) + D λ²/(λ² - E), λ in µm, valid 0.198 to 2.05 µm.
 */
const GHOSH_QUARTZ = {
  ordinary: { a: 1.28604141, b: 1.07044083, c: 1.00585997e-2, d: 1.10202242, e: 100 },
  extraordinary: { a: 1.28851804, b: 1.09509924, c: 1.02101864e-2, d: 1.15662475, e: 100 },
};

function ghoshIndex(k: (typeof GHOSH_QUARTZ)['ordinary'], wavelengthNm: number): number {
  const l2 = (wavelengthNm / 1000) ** 2;
  return Math.sqrt(k.a + (k.b * l2) / (l2 - k.c) + (k.d * l2) / (l2 - k.e));
}

/**
 * Magnesium fluoride: M. J. Dodge, "Refractive properties of magnesium fluoride",
 * Appl. Opt. 23, 1980 (1984): n² - 1 = Σ Bᵢ λ²/(λ² - Cᵢ²), λ and Cᵢ in µm, valid 0.2 to 7 µm.
 */
const DODGE_MGF2 = {
  ordinary: [
    [0.48755108, 0.04338408],
    [0.39875031, 0.09461442],
    [2.3120353, 23.793604],
  ],
  extraordinary: [
    [0.41344023, 0.03684262],
    [0.50497499, 0.09076162],
    [2.4904862, 23.771995],
  ],
} as const;

function sellmeierIndex(terms: readonly (readonly [number, number])[], wavelengthNm: number): number {
  const l2 = (wavelengthNm / 1000) ** 2;
  return Math.sqrt(1 + terms.reduce((sum, [b, c]) => sum + (b * l2) / (l2 - c * c), 0));
}

export const MATERIALS: Partial<Record<Material, BirefringentMaterial>> = {
  quartz: {
    name: 'crystal quartz (Ghosh 1999)',
    birefringence: (nm) => ghoshIndex(GHOSH_QUARTZ.extraordinary, nm) - ghoshIndex(GHOSH_QUARTZ.ordinary, nm),
    validNm: [198, 2050],
  },
  mgf2: {
    name: 'MgF2 (Dodge 1984)',
    birefringence: (nm) => sellmeierIndex(DODGE_MGF2.extraordinary, nm) - sellmeierIndex(DODGE_MGF2.ordinary, nm),
    validNm: [200, 7000],
  },
};

export interface FractionAtWavelength {
  wavelengthNm: number;
  /**
   * The measured fractional retardance in waves, [0, 1), along one fixed axis of the plate; with
   * `folded` only min(w, 1 - w) is known (fast and slow axis not told apart).
   */
  waves: number;
  folded: boolean;
}

export interface OrderEstimate {
  /** Whole waves of retardance at the design wavelength beyond the nominal fraction. */
  order: number;
  thicknessMm: number;
  /** Total retardance at the design wavelength, in waves. */
  totalWaves: number;
  /** Rms misfit of the fractional retardances, in waves. */
  residualWaves: number;
  /** Rms misfit of the best thickness with another order: close to residualWaves means ambiguous. */
  nextResidualWaves: number;
  ambiguous: boolean;
  material: string;
}

export type OrderResult = { ok: true; value: OrderEstimate } | { ok: false; reason: string };

/** Thickest plate considered. */
const MAX_THICKNESS_MM = 5;
/**
 * Misfit, in waves, above which the readings are not one plate of the material: a few times the
 * retardance noise of a bench polarimeter, and tight enough that the many candidate orders rarely
 * fit unrelated readings by chance.
 */
const MAX_RESIDUAL_WAVES = 0.005;
/** Another order fitting within this much (waves), or within 3x the best misfit, makes the estimate ambiguous. */
const MIN_SEPARATION_WAVES = 0.01;

/**
 * Estimates the order of a single-material plate from fractional retardances at two or more
 * wavelengths. The total retardance is Γ(λ) = L Δn(λ)/λ; each whole order m at the first listed wavelength
 * fixes a candidate thickness, refined by least squares over all wavelengths, and the candidate that
 * best reproduces every measured fraction is kept. The fractions may be measured along the slow axis
 * instead (1 - w everywhere); both readings of the axis are tried.
 */
export function estimateOrder(points: readonly FractionAtWavelength[], material: Material, designWavelengthNm: number, nominalFraction: number): OrderResult {
  const model = MATERIALS[material];
  if (!model) return { ok: false, reason: `no birefringence dispersion is known for ${material}` };
  const distinct = new Set(points.map((p) => p.wavelengthNm));
  if (distinct.size < 2) return { ok: false, reason: 'the order needs readings at two or more wavelengths' };
  const [low, high] = model.validNm;
  const outside = points.find((p) => p.wavelengthNm < low || p.wavelengthNm > high);
  if (outside) {
    return { ok: false, reason: `${outside.wavelengthNm} nm is outside the range of the ${model.name} formula` };
  }

  // Waves of retardance per mm of thickness at each wavelength.
  const perMm = points.map((p) => model.birefringence(p.wavelengthNm) / (p.wavelengthNm * 1e-6));
  const maxOrder = Math.ceil(MAX_THICKNESS_MM * perMm[0]);
  const candidates: { thicknessMm: number; residual: number }[] = [];
  for (const orientation of [1, -1]) {
    const flip = (w: number) => (orientation === 1 ? w : modulo(1 - w, 1));
    const observed = points.map((p) => (p.folded ? p.waves : flip(p.waves)));
    const startFraction = flip(points[0].waves);
    for (let m = 0; m <= maxOrder; m++) {
      candidates.push(refine((m + startFraction) / perMm[0], perMm, observed, points));
    }
  }
  candidates.sort((a, b) => a.residual - b.residual);
  const best = candidates[0];
  const designPerMm = model.birefringence(designWavelengthNm) / (designWavelengthNm * 1e-6);
  // The order is the whole waves on top of the nominal fraction, so a plate a hair under its
  // nominal (6.249 waves for 6.25) still counts as order 6.
  // `+ 0` turns a rounded -0 into 0.
  const orderOf = (thicknessMm: number) => Math.round(thicknessMm * designPerMm - nominalFraction) + 0;
  const totalWaves = best.thicknessMm * designPerMm;
  const order = orderOf(best.thicknessMm);
  const rival = candidates.find((c) => orderOf(c.thicknessMm) !== order);
  const nextResidualWaves = rival ? rival.residual : Infinity;
  if (best.residual > MAX_RESIDUAL_WAVES) {
    return {
      ok: false,
      reason: `the retardances do not fit one plate of ${model.name}: misfit ${best.residual.toFixed(3)} waves`,
    };
  }
  return {
    ok: true,
    value: {
      order,
      thicknessMm: best.thicknessMm,
      totalWaves,
      residualWaves: best.residual,
      nextResidualWaves,
      ambiguous: nextResidualWaves < Math.max(3 * best.residual, MIN_SEPARATION_WAVES),
      material: model.name,
    },
  };
}

/** Least-squares thickness with the whole orders that `start` implies, and its rms misfit. */
function refine(
  start: number,
  perMm: readonly number[],
  observed: readonly number[],
  points: readonly FractionAtWavelength[],
): { thicknessMm: number; residual: number } {
  let numerator = 0;
  let denominator = 0;
  for (let i = 0; i < points.length; i++) {
    const target = nearestTotal(start * perMm[i], observed[i], points[i].folded);
    numerator += perMm[i] * target;
    denominator += perMm[i] * perMm[i];
  }
  const thicknessMm = Math.max(0, numerator / denominator);
  let squares = 0;
  for (let i = 0; i < points.length; i++) {
    squares += (thicknessMm * perMm[i] - nearestTotal(thicknessMm * perMm[i], observed[i], points[i].folded)) ** 2;
  }
  return { thicknessMm, residual: Math.sqrt(squares / points.length) };
}

/** The total retardance nearest to `predicted` whose fraction is `waves` (or 1 - waves when folded). */
function nearestTotal(predicted: number, waves: number, folded: boolean): number {
  const direct = predicted + wrapWaves(waves - predicted);
  if (!folded) return direct;
  const mirrored = predicted + wrapWaves(1 - waves - predicted);
  return Math.abs(mirrored - predicted) < Math.abs(direct - predicted) ? mirrored : direct;
}
