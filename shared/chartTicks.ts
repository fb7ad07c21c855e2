// Axis ticks for charts of errors against a symmetric tolerance: the reader looks for 0 (on target)
// and the two limits, so those are the ticks, written with as many digits as the tolerance has.
import { fixed } from './format';

/** Digits after the decimal point that write the limit exactly (0.005 → 3, 0.25 → 2, 2 → 0), at most 6. */
export function digitsOf(limit: number): number {
  for (let digits = 0; digits < 6; digits++) {
    if (Math.abs(Number(limit.toFixed(digits)) - limit) <= Math.abs(limit) * 1e-9) return digits;
  }
  return 6;
}

/** Half the width of an axis centred on 0 that shows the tolerance band with room around it and every value. */
export function symmetricExtent(values: readonly number[], limit: number): number {
  if (!(limit > 0)) throw new RangeError(`a tolerance limit must be positive, got ${limit}`);
  return Math.max(limit * 1.6, ...values.filter(Number.isFinite).map((v) => Math.abs(v) * 1.15));
}

/** The largest of 1, 2, 5 × 10^k that is at most value. */
function niceBelow(value: number): number {
  const decade = 10 ** Math.floor(Math.log10(value));
  const step = [10, 5, 2, 1].find((m) => m * decade <= value * (1 + 1e-12)) ?? 1;
  return step * decade;
}

/**
 * Ticks of an axis centred on 0 with a tolerance of ±limit: −limit, 0, +limit; and, where values lie
 * far outside (a round number at least twice the limit fits on the axis), that round number on each side.
 */
export function toleranceTicks(limit: number, extent: number): number[] {
  if (!(limit > 0)) throw new RangeError(`a tolerance limit must be positive, got ${limit}`);
  const outer = extent > 0 ? niceBelow(extent) : 0;
  return outer >= 2 * limit ? [-outer, -limit, 0, limit, outer] : [-limit, 0, limit];
}

/** A tick's text: 0 as "0", the others with the tolerance's digits and no negative zero. */
export function tickText(value: number, digits: number): string {
  const text = fixed(value, digits);
  return Number(text) === 0 ? '0' : text;
}

/**
 * Round ticks from 0 to at least max, about five of them, stepping by 1, 2, 2.5 or 5 × 10^k; with
 * the digits their texts need (a step of 0.25 needs 2).
 */
export function roundTicks(max: number, count = 5): { ticks: number[]; digits: number } {
  if (!(max > 0)) throw new RangeError(`an axis must reach past 0, got ${max}`);
  const raw = max / count;
  const decade = 10 ** Math.floor(Math.log10(raw));
  const step = ([1, 2, 2.5, 5, 10].find((m) => m * decade >= raw * (1 - 1e-12)) ?? 10) * decade;
  const ticks: number[] = [];
  for (let i = 0; ; i++) {
    const tick = Number((i * step).toPrecision(12));
    ticks.push(tick);
    if (tick >= max * (1 - 1e-12)) break;
  }
  return { ticks, digits: Math.max(0, ...ticks.map(digitsOf)) };
}

/** Ticks for items at places 1..count: the first, the last and about `most` in all, evenly spread. */
export function positionTicks(count: number, most = 6): number[] {
  if (!Number.isInteger(count) || count < 1) throw new RangeError(`a count of places must be a whole number from 1, got ${count}`);
  const step = Math.max(1, Math.ceil((count - 1) / (most - 1)));
  const ticks: number[] = [];
  for (let at = 1; at < count; at += step) ticks.push(at);
  return [...ticks, count];
}
