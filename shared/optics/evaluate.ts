/**
 * Grouped readings to per-piece results and verdicts (readings.md, "From readings to a verdict").
 */
import { estimateOrder, type FractionAtWavelength } from './dispersion.js';
import { describeAlongMark, judge, measuredFromAlongMark, type AlongMark, type MeasuredRetarder } from './judge.js';
import { coherencyViolation, depolarizationIndex, muellerFromMeasurements } from './mueller.js';
import { polarDecomposition } from './polar.js';
import type { DirectReading, Group } from './readings.js';
import { fitScan, type ScanReading } from './scan.js';
import { nominalFraction, type PieceSpec } from './spec.js';
import type { Stokes } from './stokes.js';
import type { LineMessage, Method, PieceResult, SerialResult } from './types.js';
import { modulo, radToDeg, radToWaves, wrapDeg, wrapWaves } from './units.js';
import { plural } from '../format.js';

/** Readings within this distance of the design wavelength are at the design wavelength. */
export const DESIGN_WAVELENGTH_WINDOW_NM = 0.5;
/** A coherency eigenvalue below -this·m00 is more than measurement noise explains. */
export const MAX_NEGATIVE_COHERENCY = 0.02;

type Extras = Partial<Pick<PieceResult, 'diattenuation' | 'depolarization' | 'depolarizationIndex' | 'circularRetardanceDeg' | 'mueller' | 'fitResidual'>>;

type Measurement =
  | { ok: true; measured: MeasuredRetarder; along: AlongMark; axisAmbiguous: boolean; extras: Extras; notes: string[] }
  | { ok: false; reason: string; error?: string };

const linesText = (lines: readonly number[]) => (lines.length === 1 ? `line ${lines[0]}` : `lines ${lines[0]}-${lines[lines.length - 1]}`);

function countDistinctInputs(inputs: readonly Stokes[]): number {
  let distinct = 0;
  for (let i = 0; i < inputs.length; i++) {
    const a = inputs[i];
    let seen = false;
    for (let j = 0; j < i && !seen; j++) {
      const b = inputs[j];
      seen = a === b || (a[1] === b[1] && a[2] === b[2] && a[3] === b[3]);
    }
    if (!seen) distinct++;
  }
  return distinct;
}

/** m / m00, by a loop rather than a closure per piece. */
function normalized(m: readonly number[], m00: number): number[] {
  const out = new Array<number>(m.length);
  for (let i = 0; i < m.length; i++) out[i] = m[i] / m00;
  return out;
}

function measureStokes(group: Group<'stokes'>): Measurement {
  const distinct = countDistinctInputs(group.readings);
  if (distinct < 4) {
    return { ok: false, reason: `too few inputs: ${plural(distinct, 'input state')}, at least 4 that span the Stokes space are needed` };
  }
  const fit = muellerFromMeasurements(group.readings, group.outputs);
  if (!fit.ok) return { ok: false, reason: fit.reason };
  const m00 = fit.mueller[0];
  if (!(m00 > 0)) {
    const message = `the Mueller matrix from ${linesText(group.lines)} transmits no light (m00 = ${m00.toPrecision(3)})`;
    return { ok: false, reason: message, error: message };
  }
  const lowest = coherencyViolation(fit.mueller, MAX_NEGATIVE_COHERENCY);
  if (lowest !== null) {
    const message = `the Mueller matrix from ${linesText(group.lines)} is not physical (coherency eigenvalue ${lowest.toFixed(3)} m00, limit -${MAX_NEGATIVE_COHERENCY})`;
    return { ok: false, reason: message, error: message };
  }
  const polar = polarDecomposition(fit.mueller);
  if (!polar.ok) return { ok: false, reason: polar.reason, error: `${polar.reason} (${linesText(group.lines)})` };
  const { retardance, retarderAxis, diattenuation, depolarization } = polar.value;
  const measured = {
    waves: radToWaves(retardance),
    fastAxisDeg: wrapDeg(radToDeg(Math.atan2(retarderAxis[1], retarderAxis[0]) / 2), 90),
  };
  return {
    ok: true,
    measured,
    along: describeAlongMark(measured, group.mountDeg),
    axisAmbiguous: false,
    extras: {
      diattenuation,
      depolarization,
      depolarizationIndex: depolarizationIndex(fit.mueller),
      circularRetardanceDeg: radToDeg(retardance * retarderAxis[2]),
      mueller: normalized(fit.mueller, m00),
      fitResidual: fit.residualRms / m00,
    },
    notes: [],
  };
}

/** Below this fitted sin²(d/2) the modulation ratio says nothing. */
const MIN_SIN_SQUARED_FOR_MODULATION = 0.05;
const MAX_MODULATION_DEVIATION = 0.1;

function measureScan(group: Group<'scan'>): Measurement {
  const fit = fitScan(group.readings as ScanReading[]);
  if (!fit.ok) return { ok: false, reason: fit.reason };
  const { retardance, axisError, modulationRatio, sinSquaredHalf, residualRms } = fit.value;
  const measured = { waves: radToWaves(retardance), fastAxisDeg: radToDeg(axisError) };
  const notes = ['the scan cannot tell the fast axis from the slow axis: retardance within 0-0.5 waves, axis judged modulo 90°'];
  if (sinSquaredHalf > MIN_SIN_SQUARED_FOR_MODULATION && Math.abs(modulationRatio - 1) > MAX_MODULATION_DEVIATION) {
    notes.push(`modulation ratio ${modulationRatio.toFixed(2)} (ideal 1): polarisers misaligned or the plate depolarises`);
  }
  return {
    ok: true,
    measured,
    along: { waves: measured.waves, axisErrorDeg: measured.fastAxisDeg },
    axisAmbiguous: true,
    extras: { fitResidual: residualRms },
    notes,
  };
}

function measureDirect(group: Group<'direct'>): Measurement {
  // Each reading in the form of step 1 (fraction, above half a wave as 1 - w with the axis turned by
  // 90°), then along the mark, where several readings of one piece can be averaged without wrapping.
  const along = group.readings.map((r: DirectReading) => {
    const fraction = modulo(r.waves, 1);
    const measured = fraction <= 0.5 ? { waves: fraction, fastAxisDeg: r.fastAxisDeg } : { waves: 1 - fraction, fastAxisDeg: r.fastAxisDeg + 90 };
    return describeAlongMark(measured, group.mountDeg);
  });
  const first = along[0].waves;
  const mean: AlongMark = {
    waves: modulo(first + along.reduce((sum, a) => sum + wrapWaves(a.waves - first), 0) / along.length, 1),
    axisErrorDeg: along.reduce((sum, a) => sum + a.axisErrorDeg, 0) / along.length,
  };
  const notes: string[] = [];
  const whole = group.readings.find((r) => Math.abs(r.waves) >= 1);
  if (whole) notes.push(`line ${whole.line} reports ${whole.waves.toFixed(4)} waves; only the fractional part is measurable and judged`);
  if (along.length > 1) notes.push(`mean of ${along.length} readings`);
  return { ok: true, measured: measuredFromAlongMark(mean, group.mountDeg), along: mean, axisAmbiguous: false, extras: {}, notes };
}

function measure(method: Method, group: Group): Measurement {
  switch (method) {
    case 'stokes':
      return measureStokes(group as Group<'stokes'>);
    case 'scan':
      return measureScan(group as Group<'scan'>);
    case 'direct':
      return measureDirect(group as Group<'direct'>);
  }
}

function isJudgedWavelength(wavelengthNm: number, spec: PieceSpec): boolean {
  if (spec.bandNm) return wavelengthNm >= spec.bandNm[0] && wavelengthNm <= spec.bandNm[1];
  return Math.abs(wavelengthNm - spec.designWavelengthNm) <= DESIGN_WAVELENGTH_WINDOW_NM;
}

function notJudgedReason(wavelengthNm: number, spec: PieceSpec): string {
  return spec.bandNm
    ? `${wavelengthNm} nm is outside the band ${spec.bandNm[0]}-${spec.bandNm[1]} nm: not judged`
    : `no reading at the design wavelength ${spec.designWavelengthNm} nm (±${DESIGN_WAVELENGTH_WINDOW_NM} nm): this one is at ${wavelengthNm} nm`;
}

function pieceResult(method: Method, group: Group, spec: PieceSpec, errors: LineMessage[]): PieceResult {
  const judged = isJudgedWavelength(group.wavelengthNm, spec);
  const reasons: string[] = [];
  if (group.errorLines.length > 0) {
    reasons.push(`readings with errors on ${group.errorLines.length === 1 ? 'line' : 'lines'} ${group.errorLines.join(', ')}`);
  }
  const measurement: Measurement = group.readings.length > 0 ? measure(method, group) : { ok: false, reason: '' };
  if (!measurement.ok && measurement.error) {
    errors.push({ line: group.lines[0], message: `${group.serial} at ${group.wavelengthNm} nm: ${measurement.error}` });
  }
  if (!measurement.ok && measurement.reason) reasons.push(measurement.reason);
  const judgement = measurement.ok
    ? judge(
        {
          along: measurement.along,
          axisAmbiguous: measurement.axisAmbiguous,
          diattenuation: measurement.extras.diattenuation,
          depolarization: measurement.extras.depolarization,
        },
        spec,
      )
    : null;
  let verdict: PieceResult['verdict'] = 'incomplete';
  if (judgement && reasons.length === 0) {
    if (!judged) reasons.push(notJudgedReason(group.wavelengthNm, spec));
    else {
      verdict = judgement.failures.length > 0 ? 'fail' : 'pass';
      reasons.push(...judgement.failures);
    }
  }
  const error = judgement?.retardanceErrorWaves ?? null;
  const extras = measurement.ok ? measurement.extras : undefined;
  const lines = group.errorLines.length > 0 ? [...group.lines, ...group.errorLines].sort((a, b) => a - b) : group.lines;
  // Built in one go: this runs once per piece of files with tens of thousands of pieces.
  return {
    serial: group.serial,
    wavelengthNm: group.wavelengthNm,
    retardanceWaves: judgement ? judgement.waves : null,
    retardanceNm: judgement ? judgement.waves * group.wavelengthNm : null,
    retardanceErrorWaves: error,
    fastAxisDeg: measurement.ok ? measurement.measured.fastAxisDeg : null,
    axisErrorDeg: judgement ? judgement.axisErrorDeg : null,
    verdict,
    reasons,
    method,
    retardanceErrorNm: error === null ? null : error * group.wavelengthNm,
    retardanceErrorDeg: error === null ? null : error * 360,
    mountDeg: group.mountDeg,
    judged,
    axisAmbiguous: method === 'scan',
    diattenuation: extras?.diattenuation,
    depolarization: extras?.depolarization,
    depolarizationIndex: extras?.depolarizationIndex,
    circularRetardanceDeg: extras?.circularRetardanceDeg,
    mueller: extras?.mueller,
    fitResidual: extras?.fitResidual,
    lines,
    notes: measurement.ok ? measurement.notes : [],
  };
}

/**
 * Order and thickness of one serial from its readings at several wavelengths, when the material's
 * dispersion is known; sets the estimate on its pieces and fails them when the order differs from
 * the ordered construction.
 */
function applyOrderEstimate(pieces: PieceResult[], spec: PieceSpec): void {
  if (!spec.material || spec.bandNm) return;
  const measured = pieces.filter((p) => p.retardanceWaves !== null && p.reasons.every((r) => !r.startsWith('readings with errors')));
  if (new Set(measured.map((p) => p.wavelengthNm)).size < 2) return;
  const points: FractionAtWavelength[] = measured.map((p) => ({
    wavelengthNm: p.wavelengthNm,
    waves: p.retardanceWaves!,
    folded: p.axisAmbiguous,
  }));
  const estimate = estimateOrder(points, spec.material, spec.designWavelengthNm, nominalFraction(spec));
  if (!estimate.ok) {
    for (const p of pieces) p.notes.push(`order not estimated: ${estimate.reason}`);
    return;
  }
  const { order, thicknessMm, totalWaves, ambiguous, material } = estimate.value;
  for (const p of pieces) {
    Object.assign(p, { estimatedOrder: order, thicknessMm, totalRetardanceWaves: totalWaves, orderAmbiguous: ambiguous });
    if (ambiguous) {
      p.notes.push(`order ${order} from the dispersion of ${material} is ambiguous: measure at more wavelengths`);
    } else if (spec.multiOrder !== undefined && order !== spec.multiOrder && p.judged && p.verdict !== 'incomplete') {
      const ordered = spec.multiOrder === 0 ? 'zero-order (m = 0)' : `multi-order m = ${spec.multiOrder}`;
      p.verdict = 'fail';
      p.reasons.push(`order ${order} (thickness ${thicknessMm.toFixed(4)} mm) estimated from the birefringence dispersion of ${material}; ordered: ${ordered}`);
    }
  }
}

function serialResult(serial: string, pieces: PieceResult[], spec: PieceSpec): SerialResult {
  // One pass, no closures: this runs once per serial.
  let judged = 0;
  let failing = false;
  let incomplete = false;
  for (const p of pieces) {
    if (!p.judged) continue;
    judged++;
    if (p.verdict === 'fail') failing = true;
    else if (p.verdict === 'incomplete') incomplete = true;
  }
  const verdict: SerialResult['verdict'] = judged === 0 || (!failing && incomplete) ? 'incomplete' : failing ? 'fail' : 'pass';
  const reasons: string[] = [];
  if (judged === 0) {
    reasons.push(
      spec.bandNm
        ? `no reading inside the band ${spec.bandNm[0]}-${spec.bandNm[1]} nm`
        : `no reading at the design wavelength ${spec.designWavelengthNm} nm (±${DESIGN_WAVELENGTH_WINDOW_NM} nm)`,
    );
  } else if (verdict !== 'pass') {
    for (const p of pieces) {
      if (!p.judged || p.verdict !== verdict) continue;
      for (const r of p.reasons) {
        const reason = spec.bandNm ? `${p.wavelengthNm} nm: ${r}` : r;
        if (!reasons.includes(reason)) reasons.push(reason);
      }
    }
  }
  const first = pieces[0];
  const wavelengthsNm = new Array<number>(pieces.length);
  for (let i = 0; i < pieces.length; i++) wavelengthsNm[i] = pieces[i].wavelengthNm;
  const result: SerialResult = { serial, verdict, reasons, wavelengthsNm };
  if (first.estimatedOrder !== undefined) {
    result.estimatedOrder = first.estimatedOrder;
    result.thicknessMm = first.thicknessMm;
    result.orderAmbiguous = first.orderAmbiguous;
  }
  return result;
}

/** `groupsBySerial` holds the same groups as `groups`, by serial (as the collector found them, so they are not looked up again). */
export function evaluate(
  method: Method,
  groups: readonly Group[],
  groupsBySerial: readonly (readonly Group[])[],
  spec: PieceSpec,
  errors: LineMessage[],
): { pieces: PieceResult[]; serials: SerialResult[] } {
  const pieces = groups.map((g) => pieceResult(method, g, spec, errors));
  const serials: SerialResult[] = [];
  for (const serialGroups of groupsBySerial) {
    const own = new Array<PieceResult>(serialGroups.length);
    for (let i = 0; i < serialGroups.length; i++) own[i] = pieces[serialGroups[i].order];
    applyOrderEstimate(own, spec);
    serials.push(serialResult(serialGroups[0].serial, own, spec));
  }
  errors.sort((a, b) => a.line - b.line);
  return { pieces, serials };
}
