// The two distributions capability intervals need: the standard normal and chi-square quantiles,
// both from the regularized incomplete gamma function (the normal through P(1/2, x²/2)), inverted
// by bisection. Pure arithmetic, so the browser and the server give the same digits.

// Lanczos approximation of ln Γ (g = 7, 9 terms), good to about 15 digits for x > 0.
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905, -0.13857109526572012,
  9.9843695780195716e-6, 1.5056327351493116e-7,
];

export function logGamma(x: number): number {
  if (!(x > 0)) throw new RangeError(`ln Γ needs a positive argument, got ${x}`);
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - logGamma(1 - x);
  const z = x - 1;
  let sum = LANCZOS[0];
  for (let i = 1; i < LANCZOS.length; i++) sum += LANCZOS[i] / (z + i);
  const t = z + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

const EPSILON = 1e-15;
const TINY = 1e-300;

/** Regularized lower incomplete gamma P(a, x): its series below a + 1, its continued fraction above. */
export function gammaP(a: number, x: number): number {
  if (!(a > 0)) throw new RangeError(`P(a, x) needs a > 0, got ${a}`);
  if (x <= 0) return 0;
  const front = Math.exp(-x + a * Math.log(x) - logGamma(a));
  if (x < a + 1) {
    let term = 1 / a;
    let sum = term;
    for (let n = 1; n < 1000 && Math.abs(term) > Math.abs(sum) * EPSILON; n++) {
      term *= x / (a + n);
      sum += term;
    }
    return Math.min(1, sum * front);
  }
  // Q(a, x) by the continued fraction, evaluated with the modified Lentz method.
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 1000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const step = d * c;
    h *= step;
    if (Math.abs(step - 1) < EPSILON) break;
  }
  return Math.max(0, 1 - front * h);
}

export const chiSquareCdf = (x: number, degrees: number) => gammaP(degrees / 2, x / 2);

export const normalCdf = (x: number) => 0.5 * (1 + Math.sign(x) * gammaP(0.5, (x * x) / 2));

function checkProbability(p: number) {
  if (!(p > 0 && p < 1)) throw new RangeError(`a probability strictly between 0 and 1 is needed, got ${p}`);
}

/** The x in [low, high] where the increasing `cdf` reaches p, halving the bracket to machine precision. */
function invert(cdf: (x: number) => number, p: number, low: number, high: number) {
  for (let i = 0; i < 200; i++) {
    const middle = (low + high) / 2;
    if (middle === low || middle === high) break;
    if (cdf(middle) < p) low = middle;
    else high = middle;
  }
  return (low + high) / 2;
}

/** z with Φ(z) = p. */
export function normalQuantile(p: number): number {
  checkProbability(p);
  if (p === 0.5) return 0;
  // Φ is symmetric; the upper half is solved where P(1/2, ·) keeps its digits.
  if (p < 0.5) return -normalQuantile(1 - p);
  return invert(normalCdf, p, 0, 40);
}

/** x with P(χ²_ν ≤ x) = p. */
export function chiSquareQuantile(p: number, degrees: number): number {
  checkProbability(p);
  if (!(degrees > 0)) throw new RangeError(`degrees of freedom must be positive, got ${degrees}`);
  let high = Math.max(1, degrees);
  while (chiSquareCdf(high, degrees) < p) high *= 2;
  return invert((x) => chiSquareCdf(x, degrees), p, 0, high);
}
