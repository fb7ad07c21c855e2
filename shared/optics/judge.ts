/**
 * From a measured retarder to a verdict against the ordered specification (readings.md, steps 2-5).
 */
import { nominalFraction, type PieceSpec } from './spec.js';
import { modulo, wrapDeg, wrapWaves } from './units.js';

/** The element as measured: retardance d in [0, π] given in waves (0 to 0.5), fast axis f in the lab frame. */
export interface MeasuredRetarder {
  waves: number;
  fastAxisDeg: number;
}

/** The same element described along the mark: retardance in [0, 1) waves, axis error in [-45°, 45°]. */
export interface AlongMark {
  waves: number;
  axisErrorDeg: number;
}

/**
 * Of the two descriptions of one element, (w, f - mount) and (1 - w, f - mount ∓ 90°), the one whose
 * axis error is within ±45°.
 */
export function describeAlongMark(measured: MeasuredRetarder, mountDeg: number): AlongMark {
  const error = wrapDeg(measured.fastAxisDeg - mountDeg, 90);
  if (Math.abs(error) <= 45) return { waves: measured.waves, axisErrorDeg: error };
  return { waves: modulo(1 - measured.waves, 1), axisErrorDeg: wrapDeg(error - 90, 90) };
}

/** The inverse of describeAlongMark: back to retardance in [0, 0.5] waves and the lab fast axis. */
export function measuredFromAlongMark(along: AlongMark, mountDeg: number): MeasuredRetarder {
  const waves = modulo(along.waves, 1);
  return waves <= 0.5
    ? { waves, fastAxisDeg: wrapDeg(mountDeg + along.axisErrorDeg, 90) }
    : { waves: 1 - waves, fastAxisDeg: wrapDeg(mountDeg + along.axisErrorDeg + 90, 90) };
}

/**
 * Simple acceptance |error| <= tolerance, or guarded acceptance |error| + U <= tolerance
 * (ILAC-G8:09/2019; ISO 14253-1:2017). A hair of slack keeps values printed at the limit accepted.
 */
export function accepts(error: number, tolerance: number, rule: PieceSpec['decisionRule'], uncertainty: number): boolean {
  const guard = rule === 'guarded' ? uncertainty : 0;
  return Math.abs(error) + guard <= tolerance + 1e-12;
}

export const MARK_ON_SLOW_AXIS = 'fast-axis mark on the slow axis';

export interface Judgement extends AlongMark {
  retardanceErrorWaves: number;
  failures: string[];
}

export interface JudgeInput {
  along: AlongMark;
  /** The scan method cannot tell fast from slow: retardance taken as w or 1 - w, axis modulo 90°. */
  axisAmbiguous: boolean;
  diattenuation?: number;
  depolarization?: number;
}

const waves4 = (x: number) => x.toFixed(4);
const deg2 = (x: number) => x.toFixed(2);

function ruleText(spec: PieceSpec, uncertainty: string): string {
  return spec.decisionRule === 'guarded' ? ` with uncertainty ${uncertainty} (guarded acceptance)` : '';
}

/** Retardance error, axis error and every failing reason of one piece at one wavelength. */
export function judge(input: JudgeInput, spec: PieceSpec): Judgement {
  const nominal = nominalFraction(spec);
  const failures: string[] = [];
  let { waves, axisErrorDeg } = input.along;
  if (input.axisAmbiguous) {
    axisErrorDeg = wrapDeg(axisErrorDeg, 45);
    const other = modulo(1 - waves, 1);
    if (Math.abs(wrapWaves(other - nominal)) < Math.abs(wrapWaves(waves - nominal))) waves = other;
  }
  const retardanceErrorWaves = wrapWaves(waves - nominal);
  const retardanceOk = accepts(retardanceErrorWaves, spec.retardanceTolWaves, spec.decisionRule, spec.uncertaintyWaves);
  const otherDescriptionOk = accepts(wrapWaves(1 - waves - nominal), spec.retardanceTolWaves, spec.decisionRule, spec.uncertaintyWaves);
  if (!retardanceOk && otherDescriptionOk && !input.axisAmbiguous) {
    failures.push(MARK_ON_SLOW_AXIS);
  } else if (!retardanceOk) {
    failures.push(
      `retardance error ${waves4(retardanceErrorWaves)} waves${ruleText(spec, `${spec.uncertaintyWaves} waves`)} ` +
        `is outside ±${spec.retardanceTolWaves} waves`,
    );
  }
  if (!accepts(axisErrorDeg, spec.axisTolDeg, spec.decisionRule, spec.uncertaintyDeg)) {
    failures.push(`fast-axis error ${deg2(axisErrorDeg)}°${ruleText(spec, `${spec.uncertaintyDeg}°`)} is outside ±${spec.axisTolDeg}°`);
  }
  if (spec.maxDiattenuation !== undefined && input.diattenuation !== undefined && input.diattenuation > spec.maxDiattenuation) {
    failures.push(`diattenuation ${input.diattenuation.toFixed(4)} is above the limit ${spec.maxDiattenuation}`);
  }
  if (spec.maxDepolarization !== undefined && input.depolarization !== undefined && input.depolarization > spec.maxDepolarization) {
    failures.push(`depolarisation ${input.depolarization.toFixed(4)} is above the limit ${spec.maxDepolarization}`);
  }
  return { waves, axisErrorDeg, retardanceErrorWaves, failures };
}
