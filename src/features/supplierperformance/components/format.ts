// How the supplier-performance pages write their figures.
import { CHARACTERISTIC_LABELS, type DriftCharacteristic } from '@shared/schemas/supplierPerformance';
import { plural } from '@shared/format';

export const percent = (rate: number | null) => (rate === null ? '—' : `${(rate * 100).toFixed(rate === 1 || rate === 0 ? 0 : 1)} %`);

export const whole = (n: number | null) => (n === null ? '—' : n.toLocaleString('en-GB'));

export const days = (n: number | null) => (n === null ? '—' : `${plural(n, 'day')}`);

const DIGITS: Record<DriftCharacteristic, number> = { retardance: 4, axis: 3 };

/** An error with its unit: "+0.0012 λ", "−0.085°", "0°"; a spread without a sign; `finer` digits
 * more for the EWMA, whose limits are much narrower than the tolerance. */
export function signedError(characteristic: DriftCharacteristic, value: number | null, { signed = true, finer = 0 } = {}) {
  if (value === null) return '—';
  const unit = CHARACTERISTIC_LABELS[characteristic].unit;
  const suffix = unit === '°' ? '°' : ` ${unit}`;
  const text = Math.abs(value).toFixed(DIGITS[characteristic] + finer);
  if (Number(text) === 0) return `0${suffix}`;
  return `${signed ? (value < 0 ? '−' : '+') : ''}${text}${suffix}`;
}
